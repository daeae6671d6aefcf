// Whether an engineer and the chosen gear are free: one read of the bookings of a window, then
// any number of questions about times inside it. The overlap rule is the one of the exclusion
// constraints (drizzle/0001_booking_exclusions.sql): existing start < new busy-until and existing
// busy-until > new start.
import { and, asc, eq, gt, inArray, lt, sql } from 'drizzle-orm';
import { db } from '../db';
import { booking, bookingGear, gearItem, member, user } from '../db/schema';
import { occupying } from './occupancy';

/** What a booking needs besides its room. */
export interface BookingNeeds {
	engineer?: boolean;
	gearIds?: readonly string[];
	/** A booking of the artist's own to leave out (one whose hold ran out). */
	exceptBookingId?: string;
}

export type Taken = 'room' | 'engineer' | 'gear';
export type GearRow = typeof gearItem.$inferSelect;

/** The pieces of a studio's gear among `ids` that can be hired now. */
export async function hireableGear(studioId: string, ids: readonly string[]): Promise<GearRow[]> {
	if (!ids.length) return [];
	return db
		.select()
		.from(gearItem)
		.where(
			and(eq(gearItem.studioId, studioId), inArray(gearItem.id, [...ids]), eq(gearItem.active, true), eq(gearItem.hireable, true))
		);
}

export interface ResourceCalendar {
	/** An engineer free over [start, busyUntil): the one with the studio longest first; null if none. */
	freeEngineer(start: number, busyUntil: number): string | null;
	/** What of the needs is not free over [start, busyUntil), or null when all of it is. */
	taken(start: number, busyUntil: number): Exclude<Taken, 'room'> | null;
}

const overlaps = (r: { start: Date; end: Date }, start: number, busyUntil: number) =>
	r.start.getTime() < busyUntil && r.end.getTime() > start;

/** A studio's engineers' and gear's bookings over [from, to), read once. */
export async function resourceCalendar(
	studioId: string,
	needs: BookingNeeds,
	from: Date,
	to: Date,
	now: Date
): Promise<ResourceCalendar> {
	const except = needs.exceptBookingId ? sql`${booking.id} <> ${needs.exceptBookingId}` : undefined;
	// The studio's engineers, the longest in its team first. Their sessions at other studios are
	// not this studio's to see, and do not block it.
	const engineers = needs.engineer
		? await db
				.select({ id: member.userId })
				.from(member)
				.innerJoin(user, eq(user.id, member.userId))
				.where(and(eq(member.organizationId, studioId), eq(member.role, 'engineer')))
				.orderBy(asc(member.createdAt), asc(user.createdAt))
		: [];
	const [engineerRows, gearRows] = await Promise.all([
		engineers.length
			? db
					.select({ id: booking.engineerId, start: booking.startsAt, end: booking.busyUntil })
					.from(booking)
					.where(
						and(
							eq(booking.studioId, studioId),
							inArray(
								booking.engineerId,
								engineers.map((e) => e.id)
							),
							occupying(now),
							lt(booking.startsAt, to),
							gt(booking.busyUntil, from),
							except
						)
					)
			: [],
		needs.gearIds?.length
			? db
					.select({ start: bookingGear.startsAt, end: bookingGear.busyUntil })
					.from(bookingGear)
					.innerJoin(booking, eq(booking.id, bookingGear.bookingId))
					.where(
						and(
							eq(bookingGear.studioId, studioId),
							inArray(bookingGear.gearItemId, [...needs.gearIds]),
							occupying(now),
							lt(bookingGear.startsAt, to),
							gt(bookingGear.busyUntil, from),
							except
						)
					)
			: []
	]);
	const freeEngineer = (start: number, busyUntil: number) =>
		engineers.find((e) => !engineerRows.some((r) => r.id === e.id && overlaps(r, start, busyUntil)))?.id ?? null;
	return {
		freeEngineer,
		taken(start, busyUntil) {
			if (needs.engineer && !freeEngineer(start, busyUntil)) return 'engineer';
			if (gearRows.some((r) => overlaps(r, start, busyUntil))) return 'gear';
			return null;
		}
	};
}

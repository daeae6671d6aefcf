// The engineer's day plan: each room's sessions, the gear each needs (and any piece booked in two
// rooms at overlapping times), the recall sheet carried over from the artist's last session, and
// the files the artist uploaded for it.
import { and, asc, desc, eq, gt, inArray, lt, ne } from 'drizzle-orm';
import { db } from './db';
import { booking, bookingGear, gearItem, recallSheet, room, user, type RecallChannel } from './db/schema';
import { getStudio } from './studio';
import type { Actor } from './actor';
import { isoInZone, localDateOf, localDayBounds } from '$lib/domain/time';
import { summariesFor } from './uploads';
import { isStudioDate } from '$lib/schemas/input';

/**
 * The sessions a day plan shows: those ahead, those held, and a no-show too, so that the plan of a
 * past day says what happened in each room (its tag reads "Nobody came").
 */
export const PLAN_STATUSES = ['pending', 'confirmed', 'completed', 'no_show'] as const;

/** A day the plan can show: a real calendar date (2027-02-30 is not one) within the calendar's years. */
export function isPlanDate(date: string): boolean {
	return isStudioDate(date);
}

export async function todayInStudio(studioId: string): Promise<string> {
	const studio = await getStudio(studioId);
	return localDateOf(new Date(), studio.timeZone);
}

export interface PlanSession {
	id: string;
	reference: string;
	status: string;
	start: string;
	end: string;
	project: string;
	notes: string;
	artist: { id: string; name: string };
	engineer: string | null;
	gear: { id: string; name: string; category: string; caution: string; conflict: boolean }[];
	recall: { fromBooking: string; fromDate: string; channels: RecallChannel[]; notes: string } | null;
	ownRecall: { channels: RecallChannel[]; notes: string } | null;
	uploads: { id: string; name: string; typeLabel: string; sizeBytes: number; href: string }[];
}

export interface DayPlan {
	date: string;
	timeZone: string;
	rooms: { slug: string; name: string; sessions: PlanSession[] }[];
	conflicts: { gear: string; bookings: string[] }[];
}

/** A studio's day: its rooms, the sessions in them, their gear, recall sheets and files. */
export async function dayPlan(studioId: string, date: string): Promise<DayPlan> {
	const studio = await getStudio(studioId);
	const tz = studio.timeZone;
	const { start: dayStart, end: dayEnd } = localDayBounds(date, tz);
	const engineer = user;

	const [rooms, sessions] = await Promise.all([
		db
			.select()
			.from(room)
			.where(and(eq(room.studioId, studioId), eq(room.active, true)))
			.orderBy(asc(room.sortOrder)),
		db
			.select({
				id: booking.id,
				reference: booking.reference,
				status: booking.status,
				startsAt: booking.startsAt,
				endsAt: booking.endsAt,
				busyUntil: booking.busyUntil,
				project: booking.project,
				notes: booking.notes,
				roomId: booking.roomId,
				artistId: booking.artistId,
				artistName: user.name,
				engineerId: booking.engineerId
			})
			.from(booking)
			.innerJoin(user, eq(user.id, booking.artistId))
			.where(
				and(
					eq(booking.studioId, studioId),
					lt(booking.startsAt, dayEnd),
					gt(booking.endsAt, dayStart),
					inArray(booking.status, [...PLAN_STATUSES])
				)
			)
			.orderBy(asc(booking.startsAt))
	]);
	const ids = sessions.map((s) => s.id);
	const engineerIds = [...new Set(sessions.map((s) => s.engineerId).filter((x): x is string => !!x))];
	const [gearRows, engineers, ownSheets, files] = await Promise.all([
		ids.length
			? db
					.select({
						bookingId: bookingGear.bookingId,
						id: gearItem.id,
						name: gearItem.name,
						category: gearItem.category,
						caution: gearItem.caution
					})
					.from(bookingGear)
					.innerJoin(gearItem, eq(gearItem.id, bookingGear.gearItemId))
					.where(inArray(bookingGear.bookingId, ids))
			: [],
		engineerIds.length
			? db.select({ id: engineer.id, name: engineer.name }).from(engineer).where(inArray(engineer.id, engineerIds))
			: [],
		ids.length ? db.select().from(recallSheet).where(inArray(recallSheet.bookingId, ids)) : [],
		summariesFor(ids)
	]);

	// A piece of gear in two sessions whose times (turnaround included) overlap. The database
	// refuses this for new bookings; the plan still shows it, should it ever arise.
	const conflictKeys = new Set<string>();
	const conflicts: DayPlan['conflicts'] = [];
	for (let i = 0; i < sessions.length; i++) {
		for (let j = i + 1; j < sessions.length; j++) {
			const a = sessions[i]!;
			const b = sessions[j]!;
			if (!(a.startsAt < b.busyUntil && b.startsAt < a.busyUntil)) continue;
			const aGear = gearRows.filter((g) => g.bookingId === a.id);
			for (const g of gearRows.filter((x) => x.bookingId === b.id)) {
				if (!aGear.some((x) => x.id === g.id)) continue;
				conflictKeys.add(`${a.id}:${g.id}`).add(`${b.id}:${g.id}`);
				conflicts.push({ gear: g.name, bookings: [a.reference, b.reference] });
			}
		}
	}

	const previous = await Promise.all(sessions.map((s) => previousRecall(studioId, s.artistId, s.id, s.startsAt)));

	const planSessions = sessions.map((s, i): PlanSession & { roomId: string } => {
		const own = ownSheets.find((r) => r.bookingId === s.id);
		const prev = previous[i];
		return {
			id: s.id,
			roomId: s.roomId,
			reference: s.reference,
			status: s.status,
			start: isoInZone(s.startsAt, tz),
			end: isoInZone(s.endsAt, tz),
			project: s.project,
			notes: s.notes,
			artist: { id: s.artistId, name: s.artistName },
			engineer: engineers.find((e) => e.id === s.engineerId)?.name ?? null,
			gear: gearRows
				.filter((g) => g.bookingId === s.id)
				.map((g) => ({
					id: g.id,
					name: g.name,
					category: g.category,
					caution: g.caution,
					conflict: conflictKeys.has(`${s.id}:${g.id}`)
				})),
			recall: prev
				? { fromBooking: prev.reference, fromDate: isoInZone(prev.startsAt, tz), channels: prev.channels, notes: prev.notes }
				: null,
			ownRecall: own ? { channels: own.channels, notes: own.notes } : null,
			uploads: files
				.filter((f) => f.bookingId === s.id)
				.map((f) => ({ id: f.id, name: f.name, typeLabel: f.typeLabel, sizeBytes: f.sizeBytes, href: f.href }))
		};
	});

	return {
		date,
		timeZone: tz,
		rooms: rooms.map((r) => ({
			slug: r.slug,
			name: r.name,
			sessions: planSessions.filter((s) => s.roomId === r.id).map(({ roomId: _roomId, ...s }) => s)
		})),
		conflicts
	};
}

/**
 * The recall sheet of the artist's most recent earlier session at this studio, to rebuild the
 * sound. Another studio's notes are that studio's work, and stay there.
 */
async function previousRecall(studioId: string, artistId: string, bookingId: string, before: Date) {
	const [row] = await db
		.select({
			reference: booking.reference,
			startsAt: booking.startsAt,
			channels: recallSheet.channels,
			notes: recallSheet.notes
		})
		.from(recallSheet)
		.innerJoin(booking, eq(booking.id, recallSheet.bookingId))
		.where(
			and(
				eq(recallSheet.studioId, studioId),
				eq(recallSheet.artistId, artistId),
				ne(recallSheet.bookingId, bookingId),
				lt(booking.startsAt, before)
			)
		)
		.orderBy(desc(booking.startsAt))
		.limit(1);
	return row;
}

/**
 * Writes (or rewrites) the recall sheet of a session of the actor's studio (its engineers and
 * owner; the route checks the role). A session of another studio is unknown here: false.
 */
export async function saveRecall(actor: Actor, bookingId: string, channels: RecallChannel[], notes: string) {
	const [b] = await db
		.select({ artistId: booking.artistId })
		.from(booking)
		.where(and(eq(booking.studioId, actor.studioId), eq(booking.id, bookingId)));
	if (!b) return false;
	const authorId = actor.user.id;
	await db
		.insert(recallSheet)
		.values({ studioId: actor.studioId, bookingId, artistId: b.artistId, authorId, channels, notes })
		.onConflictDoUpdate({ target: recallSheet.bookingId, set: { channels, notes, authorId, updatedAt: new Date() } });
	return true;
}

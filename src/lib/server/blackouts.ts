// Blackout days: local dates the studio is closed (one day or a range, both ends included). A new
// blackout never cancels a booking by itself: the owner is shown the confirmed bookings on those
// days and deals with each one.
import { and, asc, eq, gte, inArray, sql } from 'drizzle-orm';
import { db } from './db';
import type { Actor } from './actor';
import { blackout, booking, room, user } from './db/schema';
import { audit } from './audit';

export type BlackoutRow = typeof blackout.$inferSelect;

/** Blackouts that end today or later, soonest first. */
export async function listUpcoming(studioId: string, today: string): Promise<BlackoutRow[]> {
	return db
		.select()
		.from(blackout)
		.where(and(eq(blackout.studioId, studioId), gte(blackout.endsOn, today)))
		.orderBy(asc(blackout.startsOn));
}

/** Confirmed bookings that start on a local date from `from` to `to` in the studio's zone. */
export async function confirmedBookingsOn(studioId: string, from: string, to: string, timeZone: string) {
	const localDay = sql`(${booking.startsAt} at time zone ${timeZone})::date`;
	return db
		.select({
			id: booking.id,
			reference: booking.reference,
			startsAt: booking.startsAt,
			endsAt: booking.endsAt,
			room: room.name,
			artist: user.name
		})
		.from(booking)
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(
			and(
				eq(booking.studioId, studioId),
				inArray(booking.status, ['confirmed']),
				sql`${localDay} between ${from}::date and ${to}::date`
			)
		)
		.orderBy(asc(booking.startsAt));
}

export async function addBlackout(
	actor: Actor,
	values: { startsOn: string; endsOn: string; reason: string }
): Promise<BlackoutRow> {
	const [row] = await db
		.insert(blackout)
		.values({ ...values, studioId: actor.studioId, createdBy: actor.user.id })
		.returning();
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'blackout.added',
		entity: 'blackout',
		entityId: row!.id,
		data: values,
		ip: actor.ip
	});
	return row!;
}

export async function removeBlackout(actor: Actor, id: string): Promise<BlackoutRow | null> {
	const [row] = await db
		.delete(blackout)
		.where(and(eq(blackout.studioId, actor.studioId), eq(blackout.id, id)))
		.returning();
	if (!row) return null;
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'blackout.removed',
		entity: 'blackout',
		entityId: id,
		data: { startsOn: row.startsOn, endsOn: row.endsOn, reason: row.reason },
		ip: actor.ip
	});
	return row;
}

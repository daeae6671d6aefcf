// Which bookings keep a room, an engineer or gear from others: the lifecycle's occupying
// statuses, less the holds that ran out (src/lib/domain/lifecycle.ts, holdLapsed), as SQL.
import { and, eq, inArray, isNotNull, lte, not } from 'drizzle-orm';
import { db } from '../db';
import { booking } from '../db/schema';
import { OCCUPYING_STATUSES } from '$lib/domain/lifecycle';

/** holdLapsed as SQL: held, with an expiry now or past. */
export function holdLapsedSql(now: Date) {
	return and(eq(booking.status, 'held'), isNotNull(booking.holdExpiresAt), lte(booking.holdExpiresAt, now))!;
}

/** A booking that keeps its time: occupying, and not a hold that ran out. */
export function occupying(now: Date) {
	return and(inArray(booking.status, OCCUPYING_STATUSES), not(holdLapsedSql(now)));
}

/**
 * Marks the holds that ran out as expired: every studio's for the periodic job, one studio's for a
 * new hold there (another studio's holds never stand in its way).
 */
export async function expireLapsedHolds(now = new Date(), studioId?: string): Promise<number> {
	const rows = await db
		.update(booking)
		.set({ status: 'expired' })
		.where(and(holdLapsedSql(now), studioId === undefined ? undefined : eq(booking.studioId, studioId)))
		.returning({ id: booking.id });
	return rows.length;
}

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

/** Marks the holds that ran out as expired; the periodic job and every new hold call it. */
export async function expireLapsedHolds(now = new Date()): Promise<number> {
	const rows = await db.update(booking).set({ status: 'expired' }).where(holdLapsedSql(now)).returning({ id: booking.id });
	return rows.length;
}

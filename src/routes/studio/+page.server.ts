import { and, eq, gte, inArray, lt, sql } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { booking, room, user } from '$lib/server/db/schema';
import { requireRole } from '$lib/server/guard';
import { outstandingBalances, unresolvedFailedRefunds } from '$lib/server/invoices/month';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireRole(locals, 'owner');
	const now = new Date();
	const weekAhead = new Date(now.getTime() + 7 * 24 * 3600 * 1000);
	const [upcoming, counts, owed, failedRefunds, toClose] = await Promise.all([
		db
			.select({
				id: booking.id,
				reference: booking.reference,
				startsAt: booking.startsAt,
				endsAt: booking.endsAt,
				status: booking.status,
				room: room.name,
				artist: user.name,
				total: booking.total,
				currency: booking.currency
			})
			.from(booking)
			.innerJoin(room, eq(room.id, booking.roomId))
			.innerJoin(user, eq(user.id, booking.artistId))
			.where(
				and(
					gte(booking.startsAt, now),
					lt(booking.startsAt, weekAhead),
					inArray(booking.status, ['held', 'pending', 'confirmed'])
				)
			)
			.orderBy(booking.startsAt)
			.limit(20),
		db
			.select({ status: booking.status, n: sql<number>`count(*)::int` })
			.from(booking)
			.where(gte(booking.endsAt, now))
			.groupBy(booking.status),
		// What is owed and which refunds failed, whatever their month (the month report lists both too).
		outstandingBalances(now),
		unresolvedFailedRefunds(),
		// Sessions over but not closed: their end and any overtime are not recorded, so no final invoice yet.
		db
			.select({
				id: booking.id,
				reference: booking.reference,
				startsAt: booking.startsAt,
				endsAt: booking.endsAt,
				artist: user.name
			})
			.from(booking)
			.innerJoin(user, eq(user.id, booking.artistId))
			.where(and(eq(booking.status, 'confirmed'), lt(booking.endsAt, now)))
			.orderBy(booking.endsAt)
			.limit(20)
	]);
	return {
		upcoming: upcoming.map((b) => ({ ...b, startsAt: b.startsAt.toISOString(), endsAt: b.endsAt.toISOString() })),
		counts: Object.fromEntries(counts.map((c) => [c.status, c.n])) as Record<string, number>,
		attention: {
			owed,
			failedRefunds,
			toClose: toClose.map((b) => ({ ...b, startsAt: b.startsAt.toISOString(), endsAt: b.endsAt.toISOString() }))
		}
	};
};

import { and, desc, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { booking, room } from '$lib/server/db/schema';
import { requireRole } from '$lib/server/guard';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	// An accountant books nothing, so has no bookings of their own; they open bookings from the accounts.
	const me = requireRole(locals, 'artist', 'owner', 'engineer');
	const rows = await db
		.select({
			id: booking.id,
			reference: booking.reference,
			startsAt: booking.startsAt,
			endsAt: booking.endsAt,
			status: booking.status,
			room: room.name,
			total: booking.total,
			currency: booking.currency
		})
		.from(booking)
		.innerJoin(room, eq(room.id, booking.roomId))
		.where(and(eq(booking.artistId, me.id)))
		.orderBy(desc(booking.startsAt));
	const now = Date.now();
	const view = rows.map((b) => ({ ...b, startsAt: b.startsAt.toISOString(), endsAt: b.endsAt.toISOString() }));
	return {
		upcoming: view.filter((b) => new Date(b.endsAt).getTime() >= now && !['cancelled', 'expired'].includes(b.status)).reverse(),
		past: view.filter((b) => new Date(b.endsAt).getTime() < now && !['cancelled', 'expired'].includes(b.status)),
		cancelled: view.filter((b) => ['cancelled', 'expired'].includes(b.status))
	};
};

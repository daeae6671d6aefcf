import * as bookings from '$lib/server/bookings';
import { requireRole } from '$lib/server/guard';
import { hasEnded } from '$lib/domain/lifecycle';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	// An accountant books nothing, so has no bookings of their own; they open bookings from the accounts.
	const me = requireRole(locals, 'artist', 'owner', 'engineer');
	// The person's own sessions at every studio, each shown in its studio's zone and currency.
	const rows = await bookings.listOwn(me);
	const now = Date.now();
	const view = rows.map((b) => ({
		id: b.id,
		reference: b.reference,
		status: b.status,
		startsAt: b.startsAt.toISOString(),
		endsAt: b.endsAt.toISOString(),
		room: b.roomName,
		total: b.total,
		currency: b.currency,
		studio: { name: b.studioName, timeZone: b.studioTimeZone }
	}));
	return {
		upcoming: view.filter((b) => new Date(b.endsAt).getTime() >= now && !hasEnded(b.status)).reverse(),
		past: view.filter((b) => new Date(b.endsAt).getTime() < now && !hasEnded(b.status)),
		cancelled: view.filter((b) => hasEnded(b.status))
	};
};

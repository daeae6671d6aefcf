import { error } from '@sveltejs/kit';
import { getForViewer, rebookable } from '$lib/server/bookings';
import { getStudio } from '$lib/server/studio';
import { bookPath, wallClock, type BookingKind } from '$lib/components/booking/choices';
import { requireUser } from '$lib/server/guard';
import { loadMoneyPanel } from '$lib/server/payments';
import type { QuoteView } from '$lib/components/booking/PriceBreakdown.svelte';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const me = requireUser(locals);
	const b = await getForViewer(me, params.id);
	// Another artist's booking is a 404, not a 403: its existence is not theirs to know.
	if (!b) error(404, { error: 'not_found', message: 'There is no booking at this address, or it is not yours to see.' });
	// The booking itself matters more than its payment panel: if payments cannot be read, the
	// page still shows the booking and says so.
	let moneyUnavailable = false;
	const money = await loadMoneyPanel(me, b).catch((e: unknown) => {
		console.error('[booking page] could not load the payment panel', b.id, e);
		moneyUnavailable = true;
		return null;
	});
	const q = b.quote;

	// A hold that ran out (swept or not yet): say so, and offer the same time again if it is free.
	const now = new Date();
	let rebook: { free: boolean; taken: 'room' | 'engineer' | 'gear' | null; bookHref: string; calendarHref: string } | null = null;
	if (b.status === 'expired' || (b.status === 'held' && b.holdExpiresAt && b.holdExpiresAt.getTime() <= now.getTime())) {
		const [studio, outcome] = await Promise.all([getStudio(), rebookable(b, now)]);
		const at = wallClock(b.startsAt, studio.timeZone);
		const minutes = q.durationMinutes;
		const kind: BookingKind = minutes === studio.halfDayMinutes ? 'half' : minutes === studio.fullDayMinutes ? 'full' : 'hourly';
		rebook = {
			free: outcome.free,
			taken: outcome.free ? null : outcome.taken,
			bookHref: bookPath({
				room: b.roomSlug,
				date: at.date,
				start: at.time,
				kind,
				hours: minutes / 60,
				engineer: !!b.engineerId,
				gear: b.gear.map((g) => g.id),
				project: b.project
			}),
			calendarHref: `/calendar?room=${encodeURIComponent(b.roomSlug)}&date=${at.date}`
		};
	}
	const quote: QuoteView = {
		currency: q.currency,
		pricesIncludeVat: q.pricesIncludeVat,
		lines: q.lines.map((l) => ({ key: l.key, label: l.label, amount: l.amount })),
		vat: q.vat.map((v) => ({ ratePercent: v.ratePercent, base: v.base, amount: v.amount })),
		rounding: q.rounding,
		total: q.total,
		deposit: q.deposit,
		balance: q.balance
	};
	return {
		booking: {
			id: b.id,
			reference: b.reference,
			status: b.status,
			startsAt: b.startsAt,
			endsAt: b.endsAt,
			holdExpiresAt: b.holdExpiresAt,
			roomName: b.roomName,
			roomSlug: b.roomSlug,
			engineerName: b.engineerName,
			engineerBooked: !!b.engineerId,
			artistName: b.artistName,
			project: b.project,
			notes: b.notes,
			cancelledAt: b.cancelledAt,
			cancelReason: b.cancelReason,
			durationMinutes: q.durationMinutes,
			gear: b.gear.map((g) => ({ id: g.id, name: g.name, category: g.category, hireFee: g.hireFee, caution: g.caution }))
		},
		quote,
		rebook,
		money,
		moneyUnavailable,
		viewerIsArtist: me.role === 'artist'
	};
};

import { error } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { requireRole } from '$lib/server/guard';
import { outstandingBalances, unresolvedFailedRefunds } from '$lib/server/invoices/month';
import { staffActor } from '$lib/server/actor';
import { setupState } from '$lib/server/studio-setup';
import { payoutState } from '$lib/server/payouts';
import { SETUP_STEPS } from '$lib/domain/setup';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const owner = requireRole(locals, 'owner');
	const { studioId } = staffActor(locals, null);
	const now = new Date();
	const [desk, owed, failedRefunds, setup, payout] = await Promise.all([
		bookings.ownerDesk({ studioId, role: owner.role }, now),
		// What is owed and which refunds failed, whatever their month (the month report lists both too).
		outstandingBalances(studioId, now),
		unresolvedFailedRefunds(studioId),
		setupState(studioId),
		payoutState(studioId)
	]);
	if (!desk) error(403, { error: 'forbidden', message: 'Your role does not give access to this.' });
	const iso = <T extends { startsAt: Date; endsAt: Date }>(b: T) => ({
		...b,
		startsAt: b.startsAt.toISOString(),
		endsAt: b.endsAt.toISOString()
	});
	return {
		upcoming: desk.upcoming.map(iso),
		counts: desk.counts,
		// Until the studio is published, the desk leads back into its set-up.
		setup: setup.published ? null : { done: setup.done.length, of: SETUP_STEPS.length },
		// A studio whose account cannot take charges takes no bookings: the desk says what is missing.
		payout: payout.status.state === 'ready' ? null : payout.status,
		attention: { owed, failedRefunds, toClose: desk.toClose.map(iso) }
	};
};

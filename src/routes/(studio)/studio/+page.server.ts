import { error } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { requireRole } from '$lib/server/guard';
import { outstandingBalances, unresolvedFailedRefunds } from '$lib/server/invoices/month';
import { staffActor } from '$lib/server/actor';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const owner = requireRole(locals, 'owner');
	const { studioId } = staffActor(locals, null);
	const now = new Date();
	const [desk, owed, failedRefunds] = await Promise.all([
		bookings.ownerDesk({ studioId, role: owner.role }, now),
		// What is owed and which refunds failed, whatever their month (the month report lists both too).
		outstandingBalances(studioId, now),
		unresolvedFailedRefunds(studioId)
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
		attention: { owed, failedRefunds, toClose: desk.toClose.map(iso) }
	};
};

// GET: what cancelling now would refund, by the studio's ladder, before anyone commits.
import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError } from '$lib/server/api';
import { cancelAccess, previewCancellation } from '$lib/server/payments';
import { unauthenticated } from '$lib/server/payments/http';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, params }) => {
	if (!locals.user) return unauthenticated();
	const found = await bookings.getRow(locals.user, params.id);
	const access = found ? cancelAccess(found.as, found.booking) : 'not_found';
	// Another artist's booking, or another studio's, is a 404: its existence is not theirs to know.
	if (!found || access === 'not_found') return apiError(404, 'not_found', 'No such booking.');
	if (access === 'forbidden') return apiError(403, 'forbidden', 'Only the artist or the owner may cancel.');
	const p = await previewCancellation(found.booking);
	return json(
		{
			refund: p.refund,
			currency: p.currency,
			noticeHours: p.noticeHours,
			rule: p.rule,
			paid: p.paid,
			onArrival: p.onArrival,
			cancellable: p.cancellable,
			status: p.status
		},
		{ headers: { 'cache-control': 'no-store' } }
	);
};

// POST (owner, engineer): records that nobody came to a confirmed session whose start has passed.
// The deposit is kept by the cancellation terms at zero notice (a refund only if their last rung
// gives one), no final invoice is issued, the slot stays taken and the artist gets a note. No
// body. A second request answers with what the first did (`alreadyRecorded`).
import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError } from '$lib/server/api';
import { recordNoShow } from '$lib/server/payments';
import { readInput, unauthenticated } from '$lib/server/payments/http';
import { isoInZone } from '$lib/domain/time';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ locals, params, request }) => {
	if (!locals.user) return unauthenticated();
	const read = await readInput(request);
	if (!read.ok) return read.response;
	const outcome = await recordNoShow(locals.user, params.id);
	if (!outcome.ok) return apiError(outcome.status, outcome.code, outcome.message);
	const b = await bookings.getForViewer(locals.user, params.id);
	if (!b) return apiError(404, 'not_found', 'No such booking.');
	const { timeZone } = b.studio;
	return json({
		...bookings.bookingJson(b, b.studio),
		noShow: {
			alreadyRecorded: outcome.already,
			recordedAt: outcome.booking.noShowAt ? isoInZone(outcome.booking.noShowAt, timeZone) : null,
			refund: outcome.refund,
			retained: outcome.retained,
			rule: outcome.rule,
			refunds: outcome.refunds.map((r) => ({ id: r.id, amount: r.amount, status: r.status }))
		}
	});
};

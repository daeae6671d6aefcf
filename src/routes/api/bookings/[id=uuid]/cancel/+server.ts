// POST: cancels the booking, frees its slot and refunds what the policy gives. A second click
// answers with what the first one did.
import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import * as payments from '$lib/server/payments';
import { readInput, unauthenticated } from '$lib/server/payments/http';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ locals, params, request, getClientAddress }) => {
	if (!locals.user) return unauthenticated();
	const read = await readInput(request);
	if (!read.ok) return read.response;
	const outcome = await payments.cancel(locals.user, params.id, read.body.reason, getClientAddress());
	if (!outcome.ok) return apiError(outcome.status, outcome.code, outcome.message);
	const p = outcome.preview;
	return json({
		id: params.id,
		status: 'cancelled',
		alreadyCancelled: outcome.already,
		refund: p.refund,
		currency: p.currency,
		noticeHours: p.noticeHours,
		rule: p.rule,
		paid: p.paid,
		onArrival: p.onArrival,
		refunds: outcome.refunds.map((r) => ({ id: r.id, amount: r.amount, status: r.status, failureReason: r.failureReason }))
	});
};

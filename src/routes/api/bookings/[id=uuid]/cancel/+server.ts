// POST: cancels the booking, frees its slot and refunds what the policy gives. A second click
// answers with what the first one did.
import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { audit } from '$lib/server/audit';
import { cancelBooking } from '$lib/server/payments';
import { backToBooking, readInput, unauthenticated } from '$lib/server/payments/http';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ locals, params, request, getClientAddress }) => {
	if (!locals.user) return unauthenticated();
	const read = await readInput(request);
	if (!read.ok) return read.response;
	const reason = typeof read.input.body.reason === 'string' ? read.input.body.reason.slice(0, 500) : undefined;
	const outcome = await cancelBooking(locals.user, params.id, { reason });
	if (!outcome.ok) {
		if (read.input.isForm && outcome.status === 409) backToBooking(params.id, 'cancel-refused');
		return apiError(outcome.status, outcome.code, outcome.message);
	}
	if (!outcome.already) {
		await audit({
			actorId: locals.user.id,
			action: 'booking.cancel',
			entity: 'booking',
			entityId: params.id,
			ip: getClientAddress()
		});
	}
	if (read.input.isForm) backToBooking(params.id, 'cancelled');
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

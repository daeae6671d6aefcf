// POST: a Checkout page for the booking's deposit (while held) or balance (once closed), made or
// reused; JSON `{ checkoutUrl }`, or a 303 to it for a plain form. Amounts come from the booking
// and its final invoice, never from the request (OWASP ASVS 15.3.3).
import { json, redirect } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError } from '$lib/server/api';
import { CheckoutError, startCheckout, type CheckoutKind } from '$lib/server/payments';
import { backToBooking, readInput, unauthenticated } from '$lib/server/payments/http';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ locals, params, request, url }) => {
	if (!locals.user) return unauthenticated();
	const actor = locals.user;
	const b = await bookings.getRow(actor, params.id);
	if (!b) return apiError(404, 'not_found', 'No such booking.');
	if (actor.role !== 'artist' && actor.role !== 'owner')
		return apiError(403, 'forbidden', 'Only the artist or the owner starts a payment.');
	const read = await readInput(request);
	if (!read.ok) return read.response;
	const asked = read.input.body.kind;
	if (asked !== undefined && asked !== 'deposit' && asked !== 'balance') {
		return apiError(422, 'invalid', 'kind is deposit or balance.', { fields: { kind: ['Choose deposit or balance.'] } });
	}
	const kind: CheckoutKind = asked ?? (b.status === 'completed' ? 'balance' : 'deposit');
	try {
		const checkout = await startCheckout(b.id, kind, url.origin);
		if (read.input.isForm) redirect(303, checkout.url);
		return json({ checkoutUrl: checkout.url, sessionId: checkout.sessionId, kind });
	} catch (e) {
		if (!(e instanceof CheckoutError)) throw e;
		if (read.input.isForm) backToBooking(b.id, e.code === 'stripe_unavailable' ? 'pay-unavailable' : 'pay-refused');
		const status = e.code === 'not_found' ? 404 : e.code === 'stripe_unavailable' ? 503 : 409;
		return apiError(status, e.code, e.message);
	}
};

// Stripe's webhook endpoint: signed events only (Stripe docs, "Verify webhook signatures"). The
// signature is checked on the raw bytes of the body with the SDK's constructEvent (HMAC-SHA256,
// 300 s tolerance); anything unsigned, badly signed or stale gets 400 and changes nothing.
import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { DATABASE_UNAVAILABLE, isDatabaseDown } from '$lib/server/db/health';
import { processStripeEvent } from '$lib/server/payments';
import { stripe, webhookSecret, Stripe } from '$lib/server/payments/stripe';
import type { RequestHandler } from './$types';

const MAX_EVENT_BYTES = 512 * 1024;

export const POST: RequestHandler = async ({ request }) => {
	const signature = request.headers.get('stripe-signature');
	if (!signature) return apiError(400, 'no_signature', 'Stripe-Signature is missing.');
	const payload = Buffer.from(await request.arrayBuffer());
	if (payload.length > MAX_EVENT_BYTES) return apiError(413, 'too_large', 'The event is too large.');
	let event: Stripe.Event;
	try {
		event = stripe().webhooks.constructEvent(payload, signature, webhookSecret());
	} catch (e) {
		if (e instanceof Stripe.errors.StripeSignatureVerificationError) {
			return apiError(400, 'bad_signature', 'The signature does not match this endpoint, or it is too old.');
		}
		throw e;
	}
	try {
		const result = await processStripeEvent(event);
		return json({ received: true, ...result });
	} catch (e) {
		// Nothing was committed: Stripe retries the delivery and the retry processes it.
		console.error(`[stripe webhook] ${event.type} ${event.id} failed:`, (e as Error).message);
		if (isDatabaseDown(e)) return apiError(503, 'unavailable', DATABASE_UNAVAILABLE);
		return apiError(500, 'retry_later', 'The event could not be processed now.');
	}
};

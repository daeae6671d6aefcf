// Stripe's webhook endpoints: signed events only (Stripe docs, "Verify webhook signatures"). The
// signature is checked on the raw bytes of the body with the SDK's constructEvent (HMAC-SHA256,
// 300 s tolerance) and the endpoint's own secret; anything unsigned, badly signed, stale or
// stamped more than the same 300 s ahead of our clock gets 400 and changes nothing, and so does a
// signed body that is not an event. The platform's endpoint (/api/stripe/webhook) and the Connect
// endpoint (/api/stripe/connect-webhook, the connected accounts' events) differ only in their secret
// and in what an event without an account may change (webhook.ts).
import { json } from '@sveltejs/kit';
import { apiError } from '../api';
import { DATABASE_UNAVAILABLE, isDatabaseDown } from '../db/health';
import { eventShapeProblem, processStripeEvent } from './webhook';
import { stripe, webhookSecret, Stripe, type WebhookEndpoint } from './stripe';

const MAX_EVENT_BYTES = 512 * 1024;
/** Stripe's default tolerance for a signature's time, in seconds, applied both ways. */
const SIGNATURE_TOLERANCE_S = 300;

/** The `t=` of a Stripe-Signature header (the last one, as the SDK reads it), in Unix seconds. */
function signatureTimestamp(header: string): number | null {
	let found: number | null = null;
	for (const item of header.split(',')) {
		const [key, value] = item.split('=');
		if (key === 't') found = value && /^\d{1,12}$/.test(value) ? Number(value) : null;
	}
	return found;
}

/** Receives one delivery at an endpoint and answers Stripe. */
export async function receiveWebhook(request: Request, endpoint: WebhookEndpoint): Promise<Response> {
	const signature = request.headers.get('stripe-signature');
	if (!signature) return apiError(400, 'no_signature', 'Stripe-Signature is missing.');
	const payload = Buffer.from(await request.arrayBuffer());
	if (payload.length > MAX_EVENT_BYTES) return apiError(413, 'too_large', 'The event is too large.');
	let event: Stripe.Event;
	try {
		event = stripe().webhooks.constructEvent(payload, signature, webhookSecret(endpoint), SIGNATURE_TOLERANCE_S);
	} catch (e) {
		if (e instanceof Stripe.errors.StripeSignatureVerificationError) {
			return apiError(400, 'bad_signature', 'The signature does not match this endpoint, or it is too old.');
		}
		// Signed, but the body is not JSON.
		if (e instanceof SyntaxError) return apiError(400, 'invalid_event', 'The event is not JSON.');
		throw e;
	}
	// The SDK refuses a signature too old, not one dated ahead: a stamp from the future is refused
	// with the same tolerance, so a captured event cannot be made to last longer than five minutes.
	const signedAt = signatureTimestamp(signature);
	if (signedAt === null || signedAt > Date.now() / 1000 + SIGNATURE_TOLERANCE_S) {
		return apiError(400, 'bad_signature', 'The signature’s time is ahead of ours.');
	}
	const problem = eventShapeProblem(event);
	if (problem) return apiError(400, 'invalid_event', problem);
	try {
		const result = await processStripeEvent(event, endpoint);
		return json({ received: true, ...result });
	} catch (e) {
		// Nothing was committed: Stripe retries the delivery and the retry processes it.
		console.error(`[stripe webhook] ${event.type} ${event.id} failed:`, (e as Error).message);
		if (isDatabaseDown(e)) return apiError(503, 'unavailable', DATABASE_UNAVAILABLE);
		return apiError(500, 'retry_later', 'The event could not be processed now.');
	}
}

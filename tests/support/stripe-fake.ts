// The Stripe fake's test controls (fake-services/stripe/README.md), over its real socket.
import { STRIPE_API_BASE } from './env';

/** Pays a Checkout Session on the fake as a customer would on its page; gives the HTTP status. */
export async function payOnFake(sessionId: string): Promise<number> {
	const res = await fetch(`${STRIPE_API_BASE}/_control/sessions/${sessionId}/pay`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: '{}'
	});
	await res.body?.cancel();
	return res.status;
}

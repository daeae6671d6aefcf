// The Stripe client: the real API, or the project's fake when STRIPE_API_BASE points at it
// (fake-services/stripe). One client per process; keys and secrets come from the environment only.
import Stripe from 'stripe';
import { env } from '$env/dynamic/private';

let client: Stripe | null = null;

/** Host, port and protocol for the SDK from a base URL such as http://127.0.0.1:12111. */
export function stripeHostOptions(base: string | undefined): { host?: string; port?: number; protocol?: 'http' | 'https' } {
	if (!base) return {};
	const url = new URL(base);
	const protocol = url.protocol === 'http:' ? 'http' : 'https';
	return { host: url.hostname, port: url.port ? Number(url.port) : protocol === 'http' ? 80 : 443, protocol };
}

export function stripe(): Stripe {
	if (client) return client;
	const key = env.STRIPE_SECRET_KEY;
	if (!key) throw new Error('STRIPE_SECRET_KEY is not set (see .env.example)');
	client = new Stripe(key, {
		...stripeHostOptions(env.STRIPE_API_BASE),
		// The SDK retries network failures with the same Idempotency-Key, so a retry never doubles a charge.
		maxNetworkRetries: 2,
		timeout: 15_000,
		appInfo: { name: 'Slateroom' }
	});
	return client;
}

/** Where an event came in: the platform's own endpoint, or the Connect endpoint (connected accounts' events). */
export type WebhookEndpoint = 'platform' | 'connect';

/** The signing secret of an endpoint (each endpoint at Stripe has its own). */
export function webhookSecret(endpoint: WebhookEndpoint = 'platform'): string {
	const name = endpoint === 'connect' ? 'STRIPE_CONNECT_WEBHOOK_SECRET' : 'STRIPE_WEBHOOK_SECRET';
	const secret = env[name];
	if (!secret) throw new Error(`${name} is not set (see .env.example)`);
	return secret;
}

/**
 * The request options that run a call on a connected account (Stripe docs, "Making API calls for
 * connected accounts": the Stripe-Account header). A null account is the platform's own, as every
 * payment made before Connect was.
 */
export function onAccount(accountId: string | null, options: Stripe.RequestOptions = {}): Stripe.RequestOptions {
	return accountId ? { ...options, stripeAccount: accountId } : options;
}

export { Stripe };

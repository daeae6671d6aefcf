/** Test helpers: a local webhook receiver and bounded waiting. Used by the *.spec.ts files. */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { afterAll, beforeAll, beforeEach } from 'vitest';
import { type StripeFake, type StripeFakeOptions, startStripeFake } from './app.js';

export interface Received {
	headers: http.IncomingHttpHeaders;
	body: string;
	event: { id: string; type: string; data: { object: Record<string, unknown> } };
	at: number;
}

export interface Receiver {
	url: string;
	received: Received[];
	/** Status codes for the next deliveries, in order; after that every delivery gets 200. */
	respondWith(statuses: number[]): void;
	clear(): void;
	close(): Promise<void>;
}

export async function startReceiver(path = '/api/stripe/webhook'): Promise<Receiver> {
	const received: Received[] = [];
	let plan: number[] = [];
	const server = http.createServer((req, res) => {
		const chunks: Buffer[] = [];
		req.on('data', (c: Buffer) => chunks.push(c));
		req.on('end', () => {
			const body = Buffer.concat(chunks).toString('utf8');
			received.push({
				headers: req.headers,
				body,
				event: JSON.parse(body) as Received['event'],
				at: Date.now()
			});
			const status = plan.shift() ?? 200;
			res.writeHead(status, { 'Content-Type': 'application/json' });
			res.end(JSON.stringify({ received: status < 300 }));
		});
	});
	await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
	const { port } = server.address() as AddressInfo;
	return {
		url: `http://127.0.0.1:${port}${path}`,
		received,
		respondWith(statuses) {
			plan = [...statuses];
		},
		clear() {
			received.length = 0;
			plan = [];
		},
		close() {
			return new Promise<void>((resolve) => {
				server.close(() => resolve());
				server.closeAllConnections();
			});
		}
	};
}

/**
 * Polls until `check` returns a value that is not undefined/false, or fails after `timeoutMs`. The
 * limits in these specs only end a wait that never will: a loaded machine can take seconds to
 * answer on a local socket, and waiting longer never passes a wrong result.
 */
export async function waitFor<T>(check: () => T | undefined | false, what: string, timeoutMs = 60_000): Promise<T> {
	const deadline = Date.now() + timeoutMs;
	for (;;) {
		const value = check();
		if (value !== undefined && value !== false) return value;
		if (Date.now() > deadline) throw new Error(`Timed out after ${timeoutMs} ms waiting for ${what}`);
		await new Promise((r) => setTimeout(r, 10));
	}
}

export const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

// ---- a fake + receiver + real SDK client, for the specs ----------------------------------------

export const WEBHOOK_SECRET = 'whsec_slateroom_spec';
export const CONNECT_WEBHOOK_SECRET = 'whsec_slateroom_connect_spec';

export interface Fixture {
	fake: StripeFake;
	/** The platform endpoint. */
	receiver: Receiver;
	/** The Connect endpoint (events of connected accounts). */
	connect: Receiver;
	stripe: Stripe;
	/** Calls a /_control route with a JSON body; returns status and parsed JSON. */
	control(
		method: 'GET' | 'POST' | 'PUT',
		path: string,
		body?: unknown
	): Promise<{ status: number; json: Record<string, unknown> }>;
	/** Deliveries (not resends) received for events of this type, in arrival order. */
	receivedOf(type: string): Received[];
	close(): Promise<void>;
}

export function sdk(port: number, key = 'sk_test_slateroom_spec'): Stripe {
	return new Stripe(key, {
		host: '127.0.0.1',
		port,
		protocol: 'http',
		timeout: 60_000,
		maxNetworkRetries: 2
	});
}

export async function startFixture(options: StripeFakeOptions = {}): Promise<Fixture> {
	const receiver = await startReceiver();
	const connect = await startReceiver('/api/stripe/connect-webhook');
	const fake = await startStripeFake({
		port: 0,
		webhookUrl: receiver.url,
		webhookSecret: WEBHOOK_SECRET,
		connectWebhookUrl: connect.url,
		connectWebhookSecret: CONNECT_WEBHOOK_SECRET,
		retryDelaysMs: [20, 40, 80],
		deliveryTimeoutMs: 60_000,
		...options
	});
	return {
		fake,
		receiver,
		connect,
		stripe: sdk(fake.port),
		async control(method, path, body) {
			const res = await fetch(`${fake.url}/_control${path}`, {
				method,
				headers: body === undefined ? {} : { 'Content-Type': 'application/json' },
				body: body === undefined ? undefined : JSON.stringify(body),
				signal: AbortSignal.timeout(60_000)
			});
			return { status: res.status, json: (await res.json()) as Record<string, unknown> };
		},
		receivedOf(type) {
			return receiver.received.filter((r) => r.event.type === type);
		},
		async close() {
			await fake.close();
			await receiver.close();
			await connect.close();
		}
	};
}

/** A deposit for a half-day tracking block in the demo studio's live room, plus engineer hours. */
export function depositParams(overrides: Partial<Stripe.Checkout.SessionCreateParams> = {}): Stripe.Checkout.SessionCreateParams {
	return {
		mode: 'payment',
		line_items: [
			{
				price_data: {
					currency: 'eur',
					unit_amount: 16000,
					product_data: { name: 'Live room, half day (4 h)' }
				},
				quantity: 1
			},
			{
				price_data: {
					currency: 'eur',
					unit_amount: 3500,
					product_data: { name: 'Engineer, per hour' }
				},
				quantity: 2
			}
		],
		customer_email: 'artist@slateroom.test',
		client_reference_id: 'bk_1001',
		metadata: { bookingId: 'bk_1001', purpose: 'deposit' },
		payment_intent_data: { metadata: { bookingId: 'bk_1001', purpose: 'deposit' } },
		success_url: 'http://127.0.0.1:3000/bookings/bk_1001/paid?session_id={CHECKOUT_SESSION_ID}',
		cancel_url: 'http://127.0.0.1:3000/bookings/bk_1001',
		expires_at: Math.floor(Date.now() / 1000) + 31 * 60,
		...overrides
	};
}

/**
 * One fake and its two receivers for a whole spec file, everything forgotten before each test.
 * `use` is handed the fixture once it runs: `let fx: Fixture; useFixture((f) => (fx = f));`
 */
export function useFixture(use: (fx: Fixture) => void, options: StripeFakeOptions = {}): void {
	let fx: Fixture | undefined;
	beforeAll(async () => {
		fx = await startFixture(options);
		use(fx);
	});
	afterAll(async () => {
		await fx?.close();
	});
	beforeEach(async () => {
		await fx!.control('POST', '/reset');
		fx!.receiver.clear();
		fx!.connect.clear();
	});
}

/**
 * Webhooks, the hosted pay page and the test controls. Signatures are checked with the real
 * SDK's `stripe.webhooks.constructEvent` (default tolerance 300 s), the way the app checks them.
 * Delivery rules follow Stripe's webhook docs: at least once, no guaranteed order, non-2xx retried.
 */
import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { startStripeFake } from './app.js';
import {
	type Fixture,
	WEBHOOK_SECRET,
	depositParams,
	sleep,
	startFixture,
	useFixture,
	startReceiver,
	waitFor
} from './testkit.js';

let fx: Fixture;
useFixture((f) => (fx = f));

function verify(r: { body: string; headers: Record<string, unknown> }, tolerance?: number): Stripe.Event {
	return fx.stripe.webhooks.constructEvent(r.body, String(r.headers['stripe-signature']), WEBHOOK_SECRET, tolerance);
}

function postForm(path: string, body = ''): Promise<Response> {
	return fetch(`${fx.fake.url}${path}`, {
		method: 'POST',
		redirect: 'manual',
		headers: { 'Content-Type': 'application/x-www-form-urlencoded' },
		body,
		signal: AbortSignal.timeout(60_000)
	});
}

async function getText(url: string): Promise<{ status: number; text: string }> {
	const res = await fetch(url, { signal: AbortSignal.timeout(60_000) });
	return { status: res.status, text: await res.text() };
}

describe('signed webhook deliveries', () => {
	it('delivers checkout.session.completed signed so that the SDK’s constructEvent accepts it', async () => {
		const s = await fx.stripe.checkout.sessions.create(depositParams());
		await fx.control('POST', `/sessions/${s.id}/pay`);
		const got = await waitFor(() => fx.receivedOf('checkout.session.completed')[0], 'checkout.session.completed');

		const header = String(got.headers['stripe-signature']);
		expect(header).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
		const t = Number(/^t=(\d+)/.exec(header)?.[1]);
		expect(header).toBe(
			fx.stripe.webhooks.generateTestHeaderString({
				payload: got.body,
				secret: WEBHOOK_SECRET,
				timestamp: t
			})
		);
		expect(got.headers['content-type']).toMatch(/^application\/json/);

		const event = verify(got);
		expect(event.id).toMatch(/^evt_/);
		expect(event).toMatchObject({
			object: 'event',
			type: 'checkout.session.completed',
			livemode: false,
			api_version: Stripe.API_VERSION,
			pending_webhooks: 1,
			request: { id: null, idempotency_key: null }
		});
		if (event.type !== 'checkout.session.completed') throw new Error('narrowing');
		expect(event.data.object).toMatchObject({
			id: s.id,
			client_reference_id: 'bk_1001',
			metadata: { bookingId: 'bk_1001', purpose: 'deposit' },
			payment_status: 'paid',
			status: 'complete'
		});
		expect(event.data.object.payment_intent).toMatch(/^pi_/);

		const pi = await waitFor(() => fx.receivedOf('payment_intent.succeeded')[0], 'payment_intent.succeeded');
		expect(verify(pi).data.object).toMatchObject({
			metadata: { bookingId: 'bk_1001', purpose: 'deposit' }
		});
		// After a 2xx, the stored event has no pending webhooks.
		const stored = await waitFor(() => {
			const e = fx.fake.state.eventsById.get(event.id);
			return e && e.pending_webhooks === 0 ? e : undefined;
		}, 'pending_webhooks to reach 0');
		expect(stored.pending_webhooks).toBe(0);
	});

	it('retries a non-2xx answer with back-off until it succeeds, and logs every attempt', async () => {
		const s = await fx.stripe.checkout.sessions.create(depositParams());
		fx.receiver.respondWith([500, 503]);
		await fx.stripe.checkout.sessions.expire(s.id);
		await waitFor(() => fx.fake.state.deliveries.length === 3 || undefined, 'three logged attempts');
		expect(fx.receiver.received).toHaveLength(3);
		const ids = new Set(fx.receiver.received.map((r) => r.event.id));
		expect(ids.size).toBe(1); // the same event each time: handlers must deduplicate on event.id

		const log = await fx.control('GET', '/deliveries');
		const rows = log.json.data as {
			attempt: number;
			statusCode: number;
			kind: string;
			type: string;
		}[];
		expect(rows.map((d) => [d.type, d.attempt, d.statusCode, d.kind])).toEqual([
			['checkout.session.expired', 1, 500, 'initial'],
			['checkout.session.expired', 2, 503, 'retry'],
			['checkout.session.expired', 3, 200, 'retry']
		]);
		const [a, b, c] = fx.receiver.received;
		expect((b?.at ?? 0) - (a?.at ?? 0)).toBeGreaterThanOrEqual(15); // retryDelaysMs [20, 40, 80]
		expect((c?.at ?? 0) - (b?.at ?? 0)).toBeGreaterThanOrEqual(35);
		const event = await fx.stripe.events.retrieve([...ids][0] ?? '');
		expect(event.pending_webhooks).toBe(0);
	});

	it('gives up after a bounded number of tries when the endpoint is unreachable', async () => {
		const gone = await startReceiver();
		await gone.close(); // a port nobody listens on any more
		const fake = await startStripeFake({
			port: 0,
			webhookUrl: gone.url,
			webhookSecret: WEBHOOK_SECRET,
			retryDelaysMs: [10, 10, 10]
		});
		try {
			const res = await fetch(`${fake.url}/_control/sessions`, {
				signal: AbortSignal.timeout(60_000)
			});
			expect(res.status).toBe(200);
			const stripe = new Stripe('sk_test_x', {
				host: '127.0.0.1',
				port: fake.port,
				protocol: 'http',
				timeout: 60_000
			});
			const s = await stripe.checkout.sessions.create(depositParams());
			await stripe.checkout.sessions.expire(s.id);
			await waitFor(() => fake.state.deliveries.length === 4 || undefined, 'four attempts');
			await sleep(100);
			expect(fake.state.deliveries).toHaveLength(4);
			expect(fake.state.deliveries.every((d) => d.statusCode === null && /ECONNREFUSED/.test(d.error ?? ''))).toBe(true);
		} finally {
			await fake.close();
		}
	});

	it('resends on request: a duplicate, a bad signature, a stale timestamp and a late one', async () => {
		const s = await fx.stripe.checkout.sessions.create(depositParams());
		await fx.stripe.checkout.sessions.expire(s.id);
		const first = await waitFor(() => fx.receiver.received[0], 'first delivery');
		const id = first.event.id;

		expect((await fx.control('POST', `/events/${id}/resend`)).status).toBe(202);
		const dup = await waitFor(() => fx.receiver.received[1], 'duplicate');
		expect(verify(dup).id).toBe(id);

		await fx.control('POST', `/events/${id}/resend`, { signature: 'bad' });
		const bad = await waitFor(() => fx.receiver.received[2], 'bad signature');
		expect(() => verify(bad)).toThrow(Stripe.errors.StripeSignatureVerificationError);

		await fx.control('POST', `/events/${id}/resend`, { timestampOffsetSeconds: -600 });
		const stale = await waitFor(() => fx.receiver.received[3], 'stale');
		expect(() => verify(stale)).toThrow(/Timestamp outside the tolerance zone/);
		expect(verify(stale, 900).id).toBe(id); // the signature itself is valid

		const asked = Date.now();
		await fx.control('POST', `/events/${id}/resend`, { delayMs: 150 });
		const late = await waitFor(() => fx.receiver.received[4], 'late');
		expect(late.at - asked).toBeGreaterThanOrEqual(140);
		await waitFor(() => fx.fake.state.deliveries.length === 5 || undefined, 'five logged attempts');

		const log = await fx.control('GET', `/deliveries?event=${id}`);
		expect((log.json.data as { kind: string; signature: string }[]).map((d) => `${d.kind}:${d.signature}`)).toEqual([
			'initial:valid',
			'resend:valid',
			'resend:bad',
			'resend:valid',
			'resend:valid'
		]);
	});

	it('holds deliveries and releases them in reverse order', async () => {
		await fx.control('POST', '/hold-deliveries');
		const ids: string[] = [];
		for (const ref of ['bk_1', 'bk_2', 'bk_3']) {
			const s = await fx.stripe.checkout.sessions.create(depositParams({ client_reference_id: ref }));
			await fx.stripe.checkout.sessions.expire(s.id);
			ids.push(s.id);
		}
		// All three reach the held queue (the fake counts them there), and none reaches the receiver.
		let held = 0;
		for (const deadline = Date.now() + 60_000; held < 3 && Date.now() < deadline; await sleep(10)) {
			held = (await fx.control('GET', '/deliveries')).json.held as number;
		}
		expect(held).toBe(3);
		expect(fx.receiver.received).toHaveLength(0);

		const released = await fx.control('POST', '/release-deliveries?order=reverse');
		expect(released.json).toEqual({ released: 3, order: 'reverse' });
		expect(fx.receiver.received.map((r) => r.event.data.object.id)).toEqual([...ids].reverse());
	});

	it('sends only the enabled event types, while GET /v1/events keeps them all', async () => {
		const f = await startFixture({ enabledEvents: ['checkout.session.*'] });
		try {
			const s = await f.stripe.checkout.sessions.create(depositParams());
			await f.control('POST', `/sessions/${s.id}/pay`);
			await waitFor(() => f.receivedOf('checkout.session.completed')[0], 'completed');
			await sleep(50);
			expect(f.receiver.received.map((r) => r.event.type)).toEqual(['checkout.session.completed']);
			const all = await f.stripe.events.list();
			expect(all.data).toHaveLength(4);
			expect(all.data.find((e) => e.type === 'payment_intent.succeeded')?.pending_webhooks).toBe(0);
		} finally {
			await f.close();
		}
	});
});

describe('hosted pay page', () => {
	it('shows the line items and total, and Pay redirects to success_url with the session id', async () => {
		const s = await fx.stripe.checkout.sessions.create(depositParams());
		const page = await getText(s.url ?? '');
		expect(page.status).toBe(200);
		expect(page.text).toContain('Slateroom test payments');
		for (const text of ['Live room, half day (4 h)', 'Engineer, per hour', '€160.00', '€70.00', '€230.00']) {
			expect(page.text).toContain(text);
		}
		for (const label of ['>Pay<', '>Decline<', '>Pay later (delayed method)<', '>Abandon<']) expect(page.text).toContain(label);

		const res = await postForm(`/pay/${s.id}/pay`);
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe(`http://127.0.0.1:3000/bookings/bk_1001/paid?session_id=${s.id}`);
		expect(await fx.stripe.checkout.sessions.retrieve(s.id)).toMatchObject({
			status: 'complete',
			payment_status: 'paid'
		});
		expect((await getText(`${fx.fake.url}/pay/${s.id}`)).text).toContain('Payment received');
		await waitFor(() => fx.receivedOf('checkout.session.completed')[0], 'completed');
	});

	it('Decline keeps the session open and shows the decline; paying afterwards reuses the PaymentIntent', async () => {
		const s = await fx.stripe.checkout.sessions.create(depositParams());
		const res = await postForm(`/pay/${s.id}/decline`);
		expect(res.status).toBe(303);
		const back = res.headers.get('location') ?? '';
		expect((await getText(`${fx.fake.url}${back}`)).text).toContain('Card declined');

		const open = await fx.stripe.checkout.sessions.retrieve(s.id, { expand: ['payment_intent'] });
		expect(open.status).toBe('open');
		const pi = open.payment_intent as Stripe.PaymentIntent;
		expect(pi).toMatchObject({
			status: 'requires_payment_method',
			last_payment_error: { code: 'card_declined', type: 'card_error' }
		});
		const failed = await waitFor(() => fx.receivedOf('payment_intent.payment_failed')[0], 'payment_failed');
		expect(verify(failed).data.object).toMatchObject({ id: pi.id });

		await postForm(`/pay/${s.id}/pay`);
		const paid = await fx.stripe.checkout.sessions.retrieve(s.id);
		expect(paid).toMatchObject({
			status: 'complete',
			payment_status: 'paid',
			payment_intent: pi.id
		});
	});

	it('Abandon expires the session, sends checkout.session.expired and goes to cancel_url', async () => {
		const s = await fx.stripe.checkout.sessions.create(depositParams());
		const res = await postForm(`/pay/${s.id}/abandon`);
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe('http://127.0.0.1:3000/bookings/bk_1001');
		expect((await fx.stripe.checkout.sessions.retrieve(s.id)).status).toBe('expired');
		const expired = await waitFor(() => fx.receivedOf('checkout.session.expired')[0], 'expired');
		expect(verify(expired).data.object).toMatchObject({
			id: s.id,
			status: 'expired',
			metadata: { bookingId: 'bk_1001' }
		});

		const late = await postForm(`/pay/${s.id}/pay`);
		expect(late.headers.get('location')).toBe(`/pay/${s.id}?notice=not-open`);
		expect((await getText(`${fx.fake.url}/pay/${s.id}`)).text).toContain('This payment page has expired');
	});

	it('Pay later completes unpaid, then settles to async_payment_succeeded or _failed', async () => {
		const s = await fx.stripe.checkout.sessions.create(depositParams());
		const res = await postForm(`/pay/${s.id}/pay-later`);
		expect(res.headers.get('location')).toBe(`http://127.0.0.1:3000/bookings/bk_1001/paid?session_id=${s.id}`);
		const completed = await waitFor(() => fx.receivedOf('checkout.session.completed')[0], 'completed');
		expect(verify(completed).data.object).toMatchObject({
			status: 'complete',
			payment_status: 'unpaid'
		});

		expect((await fx.control('POST', `/sessions/${s.id}/settle`)).status).toBe(200);
		const ok = await waitFor(() => fx.receivedOf('checkout.session.async_payment_succeeded')[0], 'async succeeded');
		expect(verify(ok).data.object).toMatchObject({ id: s.id, payment_status: 'paid' });
		expect((await fx.control('POST', `/sessions/${s.id}/settle`)).status).toBe(400); // nothing left to settle

		const s2 = await fx.stripe.checkout.sessions.create(depositParams({ client_reference_id: 'bk_1002' }));
		await fx.control('POST', `/sessions/${s2.id}/pay-later`);
		await fx.control('POST', `/sessions/${s2.id}/settle`, { outcome: 'fail' });
		const bad = await waitFor(() => fx.receivedOf('checkout.session.async_payment_failed')[0], 'async failed');
		expect(verify(bad).data.object).toMatchObject({ id: s2.id, payment_status: 'unpaid' });
		const pi = await fx.stripe.paymentIntents.retrieve(String(bad.event.data.object.payment_intent));
		expect(pi.status).toBe('requires_payment_method');
	});

	it('answers an unknown session with a 404 page', async () => {
		const page = await getText(`${fx.fake.url}/pay/cs_test_nope`);
		expect(page.status).toBe(404);
		expect(page.text).toContain('cs_test_nope');
	});
});

describe('time and lifecycle', () => {
	it('expires sessions past expires_at by itself and forgets idempotency keys after 24 h', async () => {
		let clock = Date.now();
		const f = await startFixture({ now: () => clock, sweepIntervalMs: 20 });
		try {
			const s = await f.stripe.checkout.sessions.create(depositParams({ expires_at: Math.floor(clock / 1000) + 30 * 60 }), {
				idempotencyKey: 'hold-bk_1001'
			});
			clock += 31 * 60 * 1000;
			const expired = await waitFor(() => f.receivedOf('checkout.session.expired')[0], 'expiry by the sweep');
			expect(verify(expired).data.object).toMatchObject({ id: s.id, status: 'expired' });
			expect((await getText(`${f.fake.url}/pay/${s.id}`)).text).toContain('This payment page has expired');
			expect((await f.control('POST', `/sessions/${s.id}/pay`)).status).toBe(400);

			clock += 24 * 3600 * 1000;
			const fresh = await f.stripe.checkout.sessions.create(
				depositParams({
					expires_at: Math.floor(clock / 1000) + 3600,
					client_reference_id: 'bk_other'
				}),
				{ idempotencyKey: 'hold-bk_1001' }
			);
			expect(fresh.id).not.toBe(s.id);
		} finally {
			await f.close();
		}
	});

	it('reset clears state and deliveries; close frees the port', async () => {
		const s = await fx.stripe.checkout.sessions.create(depositParams());
		await fx.control('POST', `/sessions/${s.id}/pay`);
		await waitFor(() => fx.receiver.received.length >= 4 || undefined, 'deliveries');
		await fx.control('POST', '/reset');
		expect((await fx.control('GET', '/sessions')).json.data).toEqual([]);
		expect((await fx.control('GET', '/deliveries')).json.data).toEqual([]);
		expect((await fx.stripe.events.list()).data).toEqual([]);

		const other = await startStripeFake({ port: 0, webhookUrl: null });
		await other.close();
		await expect(fetch(`${other.url}/_control/health`, { signal: AbortSignal.timeout(2000) })).rejects.toThrow();
	});
});

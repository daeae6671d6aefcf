/**
 * Stripe Connect in the fake, driven by the real stripe-node SDK: connected accounts, the
 * Stripe-Account header (the SDK's `stripeAccount` option) scoping every object made under it,
 * direct charges refused on an account that cannot take charges, and Connect webhooks signed with
 * the Connect endpoint's own secret. Behaviour follows Stripe's Connect docs ("Making API calls
 * for connected accounts", "Direct charges", "Connect webhooks"); details the docs leave open are
 * named in the README.
 */
import Stripe from 'stripe';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { CONNECT_WEBHOOK_SECRET, type Fixture, WEBHOOK_SECRET, depositParams, startFixture, waitFor } from './testkit.js';

let fx: Fixture;

beforeAll(async () => {
	fx = await startFixture();
});
afterAll(async () => {
	await fx?.close();
});
beforeEach(async () => {
	await fx.control('POST', '/reset');
	fx.receiver.clear();
	fx.connect.clear();
});

/** A connected account that can take charges, made through the control route as seeds make them. */
async function readyAccount(id: string): Promise<string> {
	const res = await fx.control('PUT', `/accounts/${id}`, {
		country: 'DE',
		email: `${id}@studio.test`,
		default_currency: 'eur',
		completed: true
	});
	expect(res.status).toBe(201);
	return id;
}

async function paidOn(account: string): Promise<{ session: string; pi: string }> {
	const s = await fx.stripe.checkout.sessions.create(depositParams(), { stripeAccount: account });
	const paid = await fx.control('POST', `/sessions/${s.id}/pay`);
	expect(paid.status).toBe(200);
	return { session: s.id, pi: (paid.json.session as { payment_intent: string }).payment_intent };
}

function verifyConnect(r: { body: string; headers: Record<string, unknown> }): Stripe.Event {
	return fx.stripe.webhooks.constructEvent(r.body, String(r.headers['stripe-signature']), CONNECT_WEBHOOK_SECRET);
}

describe('connected accounts', () => {
	it('creates an account that cannot take charges yet, and retrieves it by id and by header', async () => {
		const made = await fx.stripe.accounts.create({
			type: 'express',
			country: 'DE',
			email: 'owner@tapehouse.test',
			default_currency: 'eur',
			business_type: 'individual',
			business_profile: { name: 'Tapehouse Leipzig', url: 'https://tapehouse.test', mcc: '7929' },
			metadata: { studioId: 'st_1' }
		});
		expect(made.id).toMatch(/^acct_/);
		expect(made).toMatchObject({
			object: 'account',
			type: 'express',
			country: 'DE',
			email: 'owner@tapehouse.test',
			default_currency: 'eur',
			business_type: 'individual',
			business_profile: { name: 'Tapehouse Leipzig', url: 'https://tapehouse.test', mcc: '7929' },
			metadata: { studioId: 'st_1' },
			charges_enabled: false,
			payouts_enabled: false,
			details_submitted: false,
			requirements: { disabled_reason: 'requirements.past_due' }
		});
		expect(made.requirements?.currently_due).toContain('external_account');
		expect(made.requirements?.currently_due).not.toContain('business_profile.url'); // it was given
		expect(made.requirements?.eventually_due).toEqual(expect.arrayContaining(made.requirements?.currently_due ?? []));

		expect(await fx.stripe.accounts.retrieve(made.id)).toEqual(made);
		expect(await fx.stripe.accounts.retrieveCurrent({}, { stripeAccount: made.id })).toEqual(made);
		expect((await fx.stripe.accounts.list()).data.map((a) => a.id)).toEqual([made.id]);

		// With a header, an account reads only itself; another account's id does not exist for it.
		const other = await fx.stripe.accounts.create({ type: 'standard', country: 'GB' });
		expect(other.default_currency).toBe('gbp');
		await expect(fx.stripe.accounts.retrieve(other.id, {}, { stripeAccount: made.id })).rejects.toMatchObject({
			statusCode: 404,
			code: 'resource_missing'
		});
		await expect(fx.stripe.accounts.create({ type: 'express' }, { stripeAccount: made.id })).rejects.toMatchObject({
			statusCode: 400
		});
	});

	it('refuses an unknown account in the Stripe-Account header with 403 account_invalid', async () => {
		await expect(
			fx.stripe.checkout.sessions.create(depositParams(), { stripeAccount: 'acct_NotConnected' })
		).rejects.toMatchObject({ type: 'StripePermissionError', statusCode: 403, code: 'account_invalid' });
		await expect(fx.stripe.events.list({}, { stripeAccount: 'acct_NotConnected' })).rejects.toMatchObject({
			statusCode: 403
		});
		expect(fx.fake.state.sessions.size).toBe(0);
	});

	it('makes an account with exactly the id a seed asks for, idempotently, through PUT /_control/accounts/:id', async () => {
		const first = await fx.control('PUT', '/accounts/acct_SeedStudioOne', {
			country: 'gb',
			email: 'seed@studio.test',
			completed: false
		});
		expect(first.status).toBe(201);
		expect(first.json).toMatchObject({
			id: 'acct_SeedStudioOne',
			country: 'GB',
			default_currency: 'gbp',
			email: 'seed@studio.test',
			charges_enabled: false,
			details_submitted: false
		});
		const again = await fx.control('PUT', '/accounts/acct_SeedStudioOne', {
			country: 'gb',
			email: 'seed@studio.test',
			completed: false
		});
		expect(again.status).toBe(200);
		expect(again.json).toEqual(first.json);
		expect(fx.fake.state.events).toHaveLength(0); // neither making nor repeating sends anything

		const done = await fx.control('PUT', '/accounts/acct_SeedStudioOne', { completed: true });
		expect(done.json).toMatchObject({ charges_enabled: true, payouts_enabled: true, details_submitted: true });
		expect((done.json.requirements as { currently_due: string[] }).currently_due).toEqual([]);
		const updated = await waitFor(() => fx.connect.received[0], 'account.updated');
		expect(verifyConnect(updated)).toMatchObject({
			type: 'account.updated',
			account: 'acct_SeedStudioOne',
			data: { object: { id: 'acct_SeedStudioOne', charges_enabled: true }, previous_attributes: { charges_enabled: false } }
		});

		const list = await fx.control('GET', '/accounts');
		expect((list.json.data as { id: string }[]).map((a) => a.id)).toEqual(['acct_SeedStudioOne']);
		expect((await fx.control('PUT', '/accounts/not_an_account', {})).status).toBe(400);
		expect((await fx.control('PUT', '/accounts/acct_Bad', { completed: 'yes' })).status).toBe(400);
	});

	it('sends account.updated when set-up completes and when new requirements stop charges', async () => {
		await fx.control('PUT', '/accounts/acct_Requirements', { country: 'DE', completed: false });
		const completed = await fx.control('POST', '/accounts/acct_Requirements/complete');
		expect(completed.json).toMatchObject({ charges_enabled: true, payouts_enabled: true });
		const due = await fx.control('POST', '/accounts/acct_Requirements/requirements', {
			currently_due: ['individual.verification.document']
		});
		expect(due.json).toMatchObject({
			charges_enabled: false,
			payouts_enabled: false,
			requirements: { currently_due: ['individual.verification.document'], disabled_reason: 'requirements.past_due' }
		});
		await waitFor(() => fx.connect.received.length === 2 || undefined, 'two account.updated');
		const events = fx.connect.received.map((r) => verifyConnect(r));
		expect(events.map((e) => [e.type, e.account, (e.data.object as Stripe.Account).charges_enabled])).toEqual(
			expect.arrayContaining([
				['account.updated', 'acct_Requirements', true],
				['account.updated', 'acct_Requirements', false]
			])
		);
		expect(fx.receiver.received).toHaveLength(0); // nothing of a connected account goes to the platform endpoint
		expect((await fx.control('POST', '/accounts/acct_Requirements/requirements', { currently_due: 'x' })).status).toBe(400);
		expect((await fx.control('POST', '/accounts/acct_Missing/complete')).status).toBe(404);
	});
});

describe('the Stripe-Account header scopes every object', () => {
	it('keeps a session, its PaymentIntent, charge, refunds and events to the account that made them', async () => {
		const a = await readyAccount('acct_StudioA');
		const b = await readyAccount('acct_StudioB');
		const { session, pi } = await paidOn(a);

		// The owner sees it all.
		const own = await fx.stripe.checkout.sessions.retrieve(session, { expand: ['payment_intent'] }, { stripeAccount: a });
		expect((own.payment_intent as Stripe.PaymentIntent).id).toBe(pi);
		const intent = await fx.stripe.paymentIntents.retrieve(pi, {}, { stripeAccount: a });
		const charge = await fx.stripe.charges.retrieve(intent.latest_charge as string, {}, { stripeAccount: a });
		expect(charge.payment_intent).toBe(pi);
		expect((await fx.stripe.checkout.sessions.list({}, { stripeAccount: a })).data.map((s) => s.id)).toEqual([session]);

		// The platform and another account do not, not even in lists.
		for (const other of [undefined, b]) {
			const opts = other ? { stripeAccount: other } : {};
			await expect(fx.stripe.checkout.sessions.retrieve(session, {}, opts)).rejects.toMatchObject({
				statusCode: 404,
				code: 'resource_missing'
			});
			await expect(fx.stripe.checkout.sessions.listLineItems(session, {}, opts)).rejects.toMatchObject({ statusCode: 404 });
			await expect(fx.stripe.paymentIntents.retrieve(pi, {}, opts)).rejects.toMatchObject({ statusCode: 404 });
			await expect(fx.stripe.charges.retrieve(charge.id, {}, opts)).rejects.toMatchObject({ statusCode: 404 });
			await expect(fx.stripe.refunds.create({ payment_intent: pi }, opts)).rejects.toMatchObject({
				code: 'resource_missing',
				param: 'payment_intent'
			});
			await expect(fx.stripe.refunds.create({ charge: charge.id }, opts)).rejects.toMatchObject({
				code: 'resource_missing',
				param: 'charge'
			});
			expect((await fx.stripe.checkout.sessions.list({}, opts)).data).toEqual([]);
			expect((await fx.stripe.events.list({}, opts)).data).toEqual([]);
		}

		// Expanding from a session of the platform never reaches into an account.
		const refund = await fx.stripe.refunds.create({ payment_intent: pi, amount: 1000 }, { stripeAccount: a });
		expect(refund).toMatchObject({ status: 'succeeded', amount: 1000, payment_intent: pi });
		expect((await fx.stripe.refunds.list({}, { stripeAccount: a })).data.map((r) => r.id)).toEqual([refund.id]);
		expect((await fx.stripe.refunds.list({}, { stripeAccount: b })).data).toEqual([]);
		expect((await fx.stripe.refunds.list()).data).toEqual([]);
		await expect(fx.stripe.refunds.retrieve(refund.id, {}, { stripeAccount: b })).rejects.toMatchObject({ statusCode: 404 });

		const events = await fx.stripe.events.list({ limit: 100 }, { stripeAccount: a });
		expect(events.data.map((e) => e.type)).toEqual(
			expect.arrayContaining(['checkout.session.completed', 'payment_intent.succeeded', 'refund.created', 'charge.refunded'])
		);
		expect(events.data.every((e) => e.account === a)).toBe(true);
		const completed = events.data.find((e) => e.type === 'checkout.session.completed');
		expect(completed).toBeDefined();
		expect((await fx.stripe.events.retrieve(completed?.id ?? '', {}, { stripeAccount: a })).id).toBe(completed?.id);
		await expect(fx.stripe.events.retrieve(completed?.id ?? '')).rejects.toMatchObject({ statusCode: 404 });
		await expect(fx.stripe.events.retrieve(completed?.id ?? '', {}, { stripeAccount: b })).rejects.toMatchObject({
			statusCode: 404
		});
	});

	it('lets no one but the owner expire a session', async () => {
		const a = await readyAccount('acct_ExpireA');
		const b = await readyAccount('acct_ExpireB');
		const s = await fx.stripe.checkout.sessions.create(depositParams(), { stripeAccount: a });
		await expect(fx.stripe.checkout.sessions.expire(s.id)).rejects.toMatchObject({ statusCode: 404, code: 'resource_missing' });
		await expect(fx.stripe.checkout.sessions.expire(s.id, {}, { stripeAccount: b })).rejects.toMatchObject({
			statusCode: 404
		});
		expect((await fx.stripe.checkout.sessions.retrieve(s.id, {}, { stripeAccount: a })).status).toBe('open');
		expect((await fx.stripe.checkout.sessions.expire(s.id, {}, { stripeAccount: a })).status).toBe('expired');
	});

	it('keeps the platform’s own objects out of every account', async () => {
		const a = await readyAccount('acct_PlatformApart');
		const s = await fx.stripe.checkout.sessions.create(depositParams());
		await expect(fx.stripe.checkout.sessions.retrieve(s.id, {}, { stripeAccount: a })).rejects.toMatchObject({
			statusCode: 404
		});
		expect((await fx.stripe.checkout.sessions.list()).data.map((x) => x.id)).toEqual([s.id]);
		const paid = await fx.control('POST', `/sessions/${s.id}/pay`);
		expect(paid.json.account).toBeNull();
		const platformEvents = await fx.stripe.events.list({ limit: 100 });
		expect(platformEvents.data.length).toBeGreaterThan(0);
		expect(platformEvents.data.every((e) => e.account === undefined)).toBe(true);
		expect((await fx.stripe.events.list({}, { stripeAccount: a })).data).toEqual([]);
	});

	it('scopes idempotency keys per API key and per account', async () => {
		const a = await readyAccount('acct_IdemA');
		const b = await readyAccount('acct_IdemB');
		const key = 'booking-77-deposit';
		const onPlatform = await fx.stripe.checkout.sessions.create(depositParams(), { idempotencyKey: key });
		const onA = await fx.stripe.checkout.sessions.create(depositParams(), { idempotencyKey: key, stripeAccount: a });
		const onB = await fx.stripe.checkout.sessions.create(depositParams(), { idempotencyKey: key, stripeAccount: b });
		expect(new Set([onPlatform.id, onA.id, onB.id]).size).toBe(3);
		const replay = await fx.stripe.checkout.sessions.create(depositParams({ expires_at: onA.expires_at }), {
			idempotencyKey: key,
			stripeAccount: a
		});
		expect(replay.id).toBe(onA.id);
		expect(replay.lastResponse.headers['idempotent-replayed']).toBe('true');
		expect(fx.fake.state.sessions.size).toBe(3);
	});
});

describe('an account that cannot take charges', () => {
	it('refuses a Checkout Session with 400 charges_not_enabled', async () => {
		await fx.control('PUT', '/accounts/acct_NotReady', { country: 'DE', completed: false });
		await expect(fx.stripe.checkout.sessions.create(depositParams(), { stripeAccount: 'acct_NotReady' })).rejects.toMatchObject({
			type: 'StripeInvalidRequestError',
			statusCode: 400,
			code: 'charges_not_enabled'
		});
		expect(fx.fake.state.sessions.size).toBe(0);
	});

	it('refuses to charge an open session once the account has lost the right to take charges', async () => {
		const a = await readyAccount('acct_LosesCharges');
		const s = await fx.stripe.checkout.sessions.create(depositParams(), { stripeAccount: a });
		await fx.control('POST', `/accounts/${a}/requirements`, { currently_due: ['external_account'] });

		const viaControl = await fx.control('POST', `/sessions/${s.id}/pay`);
		expect(viaControl.status).toBe(400);
		expect(viaControl.json).toMatchObject({ error: { code: 'charges_not_enabled' } });

		const viaPage = await fetch(`${fx.fake.url}/pay/${s.id}/pay`, {
			method: 'POST',
			redirect: 'manual',
			headers: { 'Content-Type': 'application/x-www-form-urlencoded' },
			body: '',
			signal: AbortSignal.timeout(60_000)
		});
		expect(viaPage.status).toBe(303);
		const page = await fetch(new URL(viaPage.headers.get('location') ?? '', fx.fake.url), {
			signal: AbortSignal.timeout(60_000)
		});
		expect(await page.text()).toContain('Payment refused.');
		const still = await fx.stripe.checkout.sessions.retrieve(s.id, {}, { stripeAccount: a });
		expect(still).toMatchObject({ status: 'open', payment_intent: null });
	});
});

describe('Connect webhooks', () => {
	it('sends an account’s events, with `account`, to the Connect endpoint signed with its secret; the platform’s to the platform endpoint', async () => {
		const a = await readyAccount('acct_Hooks');
		const { session } = await paidOn(a);
		const completed = await waitFor(
			() => fx.connect.received.find((r) => r.event.type === 'checkout.session.completed'),
			'checkout.session.completed on the Connect endpoint'
		);
		const event = verifyConnect(completed);
		expect(event).toMatchObject({
			type: 'checkout.session.completed',
			account: a,
			api_version: Stripe.API_VERSION,
			data: { object: { id: session, payment_status: 'paid' } }
		});
		// Signed with the Connect secret, not the platform's.
		expect(() =>
			fx.stripe.webhooks.constructEvent(completed.body, String(completed.headers['stripe-signature']), WEBHOOK_SECRET)
		).toThrow(Stripe.errors.StripeSignatureVerificationError);

		const platform = await fx.stripe.checkout.sessions.create(depositParams());
		await fx.control('POST', `/sessions/${platform.id}/pay`);
		const own = await waitFor(
			() => fx.receiver.received.find((r) => r.event.type === 'checkout.session.completed'),
			'checkout.session.completed on the platform endpoint'
		);
		const ownEvent = fx.stripe.webhooks.constructEvent(own.body, String(own.headers['stripe-signature']), WEBHOOK_SECRET);
		expect(ownEvent.account).toBeUndefined();
		expect('account' in JSON.parse(own.body)).toBe(false);
		expect((ownEvent.data.object as Stripe.Checkout.Session).id).toBe(platform.id);
		expect(fx.receiver.received.every((r) => !('account' in r.event))).toBe(true);
		expect(fx.connect.received.every((r) => (r.event as { account?: string }).account === a)).toBe(true);

		// The delivery log names the endpoint of each attempt.
		await waitFor(() => fx.fake.state.deliveries.some((d) => d.eventId === ownEvent.id) || undefined, 'logged delivery');
		const log = await fx.control('GET', '/deliveries');
		const rows = log.json.data as { eventId: string; endpoint: string; url: string }[];
		expect(rows.find((d) => d.eventId === event.id)).toMatchObject({ endpoint: 'connect', url: fx.connect.url });
		expect(rows.find((d) => d.eventId === ownEvent.id)).toMatchObject({ endpoint: 'platform', url: fx.receiver.url });
		const onlyConnect = await fx.control('GET', '/deliveries?endpoint=connect');
		expect((onlyConnect.json.data as { endpoint: string }[]).every((d) => d.endpoint === 'connect')).toBe(true);

		// A resend of an account's event goes to the Connect endpoint again.
		fx.connect.clear();
		expect((await fx.control('POST', `/events/${event.id}/resend`)).status).toBe(202);
		const resent = await waitFor(() => fx.connect.received[0], 'resent event');
		expect(verifyConnect(resent).id).toBe(event.id);
	});

	it('records an account’s events without sending them when no Connect URL is set', async () => {
		const { startStripeFake } = await import('./app.js');
		const fake = await startStripeFake({ port: 0, webhookUrl: fx.receiver.url, webhookSecret: WEBHOOK_SECRET });
		try {
			const res = await fetch(`${fake.url}/_control/accounts/acct_Quiet`, {
				method: 'PUT',
				headers: { 'Content-Type': 'application/json' },
				body: JSON.stringify({ completed: false }),
				signal: AbortSignal.timeout(60_000)
			});
			expect(res.status).toBe(201);
			fake.state.completeAccount('acct_Quiet');
			const [updated] = fake.state.events;
			expect(updated).toMatchObject({ type: 'account.updated', account: 'acct_Quiet', pending_webhooks: 0 });
			expect(fake.webhooks.willDeliver('account.updated', 'acct_Quiet')).toBe(false);
			expect(fake.webhooks.willDeliver('checkout.session.completed', null)).toBe(true);
		} finally {
			await fake.close();
		}
	});
});

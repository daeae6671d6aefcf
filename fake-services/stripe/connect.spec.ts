/**
 * Stripe Connect in the fake, driven by the real stripe-node SDK: connected accounts, the
 * Stripe-Account header (the SDK's `stripeAccount` option) scoping every object made under it,
 * direct charges refused on an account that cannot take charges, and Connect webhooks signed with
 * the Connect endpoint's own secret. Behaviour follows Stripe's Connect docs ("Making API calls
 * for connected accounts", "Direct charges", "Connect webhooks"); details the docs leave open are
 * named in the README.
 */
import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { CONNECT_WEBHOOK_SECRET, type Fixture, WEBHOOK_SECRET, depositParams, useFixture, waitFor } from './testkit.js';

let fx: Fixture;
useFixture((f) => (fx = f));

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

		const shown = await fetch(s.url ?? '', { signal: AbortSignal.timeout(60_000) });
		expect(await shown.text()).toContain(`Paid to</dt><dd>a connected account (<code>${a}</code>)`);

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

describe('account links and the onboarding page', () => {
	const refreshUrl = 'http://127.0.0.1:3000/studio/settings/get-paid/refresh';
	const returnUrl = 'http://127.0.0.1:3000/studio/settings/get-paid/return';

	async function newAccount(): Promise<string> {
		const made = await fx.stripe.accounts.create({ type: 'express', country: 'DE', email: 'owner@reelroom.test' });
		return made.id;
	}

	async function link(account: string): Promise<Stripe.AccountLink> {
		return fx.stripe.accountLinks.create({
			account,
			refresh_url: refreshUrl,
			return_url: returnUrl,
			type: 'account_onboarding'
		});
	}

	function get(url: string): Promise<Response> {
		return fetch(url, { redirect: 'manual', signal: AbortSignal.timeout(60_000) });
	}

	/** Posts the page's form the way a browser would for the named button (its formaction, or the form's action). */
	async function press(html: string, pageUrl: string, button: string): Promise<Response> {
		const form = /<form method="post" action="([^"]+)">/.exec(html);
		const tag = new RegExp(`<button[^>]*>${button}</button>`).exec(html)?.[0];
		expect(form?.[1]).toBeDefined();
		expect(tag).toBeDefined();
		const target = /formaction="([^"]+)"/.exec(tag ?? '')?.[1] ?? form?.[1] ?? '';
		return fetch(new URL(target, pageUrl), {
			method: 'POST',
			redirect: 'manual',
			headers: { 'Content-Type': 'application/x-www-form-urlencoded' },
			body: '',
			signal: AbortSignal.timeout(60_000)
		});
	}

	it('gives a single-use link whose "Complete set-up" readies the account and returns to return_url', async () => {
		const account = await newAccount();
		const made = await link(account);
		expect(made).toMatchObject({ object: 'account_link' });
		expect(made.expires_at).toBeGreaterThan(made.created);
		expect(made.url).toMatch(new RegExp(`^${fx.fake.url}/connect/onboard/[A-Za-z0-9]+$`));

		const page = await get(made.url);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('Slateroom test payment accounts');
		expect(html).toContain(account);
		expect(html).toContain('external_account'); // what is still due

		const done = await press(html, made.url, 'Complete set-up');
		expect(done.status).toBe(303);
		expect(done.headers.get('location')).toBe(returnUrl);
		const ready = await fx.stripe.accounts.retrieve(account);
		expect(ready).toMatchObject({
			charges_enabled: true,
			payouts_enabled: true,
			details_submitted: true,
			requirements: { currently_due: [], eventually_due: [], past_due: [], disabled_reason: null }
		});
		const updated = await waitFor(() => fx.connect.received.find((r) => r.event.type === 'account.updated'), 'account.updated');
		expect(verifyConnect(updated)).toMatchObject({ account, data: { object: { id: account, charges_enabled: true } } });

		// Used: opening it again, or pressing a button again, goes to refresh_url.
		const reopened = await get(made.url);
		expect(reopened.status).toBe(303);
		expect(reopened.headers.get('location')).toBe(refreshUrl);
		const again = await press(html, made.url, 'Complete set-up');
		expect(again.headers.get('location')).toBe(refreshUrl);
		expect(fx.fake.state.events.filter((e) => e.type === 'account.updated')).toHaveLength(1);

		// The account can take charges now.
		const s = await fx.stripe.checkout.sessions.create(depositParams(), { stripeAccount: account });
		expect(s.status).toBe('open');
	});

	it('"Leave unfinished" returns to return_url with nothing completed and nothing sent', async () => {
		const account = await newAccount();
		const before = await fx.stripe.accounts.retrieve(account);
		const made = await link(account);
		const html = await (await get(made.url)).text();
		const left = await press(html, made.url, 'Leave unfinished');
		expect(left.status).toBe(303);
		expect(left.headers.get('location')).toBe(returnUrl);
		expect(await fx.stripe.accounts.retrieve(account)).toEqual(before);
		expect(fx.fake.state.events).toHaveLength(0);
		expect((await get(made.url)).headers.get('location')).toBe(refreshUrl);
		// A new link starts over.
		const fresh = await link(account);
		expect((await get(fresh.url)).status).toBe(200);
	});

	it('validates a link request the way the API validates any other', async () => {
		const account = await newAccount();
		await expect(
			fx.stripe.accountLinks.create({
				account: 'acct_Nobody',
				refresh_url: refreshUrl,
				return_url: returnUrl,
				type: 'account_onboarding'
			})
		).rejects.toMatchObject({ statusCode: 400, code: 'resource_missing', param: 'account' });
		await expect(
			fx.stripe.accountLinks.create({
				account,
				refresh_url: refreshUrl,
				type: 'account_onboarding'
			})
		).rejects.toMatchObject({ statusCode: 400, code: 'parameter_missing', param: 'return_url' });
		await expect(
			fx.stripe.accountLinks.create({ account, refresh_url: refreshUrl, return_url: returnUrl, type: 'account_update' })
		).rejects.toMatchObject({ statusCode: 400, param: 'type' });
		await expect(
			fx.stripe.accountLinks.create(
				{ account, refresh_url: refreshUrl, return_url: returnUrl, type: 'account_onboarding' },
				{ stripeAccount: account }
			)
		).rejects.toMatchObject({ statusCode: 400 });
		expect((await get(`${fx.fake.url}/connect/onboard/NoSuchLink`)).status).toBe(404);
		// Only a GET opens (and uses up) a link.
		const made = await link(account);
		const head = await fetch(made.url, { method: 'HEAD', signal: AbortSignal.timeout(60_000) });
		expect(head.status).toBe(405);
		expect((await get(made.url)).status).toBe(200);
	});

	it('sends an expired link to refresh_url, but lets a page opened in time be finished', async () => {
		let clock = Date.now();
		const { startStripeFake } = await import('./app.js');
		const fake = await startStripeFake({ port: 0, webhookUrl: null, now: () => clock });
		try {
			const stripe = new Stripe('sk_test_clock', { host: '127.0.0.1', port: fake.port, protocol: 'http' });
			const account = (await stripe.accounts.create({ type: 'express' })).id;
			const params = { account, refresh_url: refreshUrl, return_url: returnUrl, type: 'account_onboarding' } as const;
			const unopened = await stripe.accountLinks.create(params);
			const opened = await stripe.accountLinks.create(params);
			const html = await (await get(opened.url)).text();
			clock += (unopened.expires_at - unopened.created + 1) * 1000;

			expect((await get(unopened.url)).headers.get('location')).toBe(refreshUrl);
			// The page opened before expiry can still be finished.
			const late = await press(html, opened.url, 'Complete set-up');
			expect(late.headers.get('location')).toBe(returnUrl);
			expect((await stripe.accounts.retrieve(account)).charges_enabled).toBe(true);
			const stale = await fetch(`${unopened.url}/complete`, {
				method: 'POST',
				redirect: 'manual',
				signal: AbortSignal.timeout(60_000)
			});
			expect(stale.headers.get('location')).toBe(refreshUrl);
		} finally {
			await fake.close();
		}
	});
});

describe('application fees on direct charges', () => {
	async function sessionWithFee(account: string | null, fee: number): Promise<Stripe.Checkout.Session> {
		return fx.stripe.checkout.sessions.create(
			depositParams({
				payment_intent_data: { application_fee_amount: fee, metadata: { bookingId: 'bk_1001' } }
			}),
			account ? { stripeAccount: account } : {}
		);
	}

	it('carries the fee to the PaymentIntent and the charge, and lists the fee on the platform', async () => {
		const a = await readyAccount('acct_FeeStudio');
		const s = await sessionWithFee(a, 1150); // total 230.00: 5 % of it
		const paid = await fx.control('POST', `/sessions/${s.id}/pay`);
		const piId = (paid.json.session as { payment_intent: string }).payment_intent;
		const pi = await fx.stripe.paymentIntents.retrieve(piId, { expand: ['latest_charge'] }, { stripeAccount: a });
		expect(pi.application_fee_amount).toBe(1150);
		expect(pi.application).toMatch(/^ca_/);
		const charge = pi.latest_charge as Stripe.Charge;
		expect(charge.application_fee).toMatch(/^fee_/);
		expect(charge.application_fee_amount).toBe(1150);

		const fees = await fx.stripe.applicationFees.list();
		expect(fees.data).toHaveLength(1);
		expect(fees.data[0]).toMatchObject({
			id: charge.application_fee,
			object: 'application_fee',
			account: a,
			amount: 1150,
			amount_refunded: 0,
			charge: charge.id,
			currency: 'eur',
			application: pi.application
		});
		expect((await fx.stripe.applicationFees.list({ charge: charge.id })).data).toHaveLength(1);
		expect((await fx.stripe.applicationFees.list({ charge: 'ch_other' })).data).toHaveLength(0);
		expect((await fx.stripe.applicationFees.retrieve(charge.application_fee as string)).amount).toBe(1150);
		// The fee is the platform's: the account does not list it.
		expect((await fx.stripe.applicationFees.list({}, { stripeAccount: a })).data).toEqual([]);

		// application_fee.created is a platform event; the charge's own events carry the fee.
		const created = await waitFor(
			() => fx.receiver.received.find((r) => r.event.type === 'application_fee.created'),
			'application_fee.created on the platform endpoint'
		);
		const feeEvent = fx.stripe.webhooks.constructEvent(created.body, String(created.headers['stripe-signature']), WEBHOOK_SECRET);
		expect(feeEvent.account).toBeUndefined();
		const succeeded = await waitFor(
			() => fx.connect.received.find((r) => r.event.type === 'charge.succeeded'),
			'charge.succeeded on the Connect endpoint'
		);
		expect(verifyConnect(succeeded).data.object).toMatchObject({
			application_fee: charge.application_fee,
			application_fee_amount: 1150
		});
	});

	it('takes the fee when a delayed payment settles, not before', async () => {
		const a = await readyAccount('acct_FeeLater');
		const s = await sessionWithFee(a, 500);
		await fx.control('POST', `/sessions/${s.id}/pay-later`);
		expect((await fx.stripe.applicationFees.list()).data).toEqual([]);
		await fx.control('POST', `/sessions/${s.id}/settle`);
		expect((await fx.stripe.applicationFees.list()).data.map((f) => f.amount)).toEqual([500]);
	});

	it('gives back a share of the fee with refund_application_fee', async () => {
		const a = await readyAccount('acct_FeeRefund');
		const s = await sessionWithFee(a, 1000);
		const paid = await fx.control('POST', `/sessions/${s.id}/pay`);
		const pi = (paid.json.session as { payment_intent: string }).payment_intent;
		await fx.stripe.refunds.create({ payment_intent: pi, amount: 11500 }, { stripeAccount: a }); // half of 230.00
		expect((await fx.stripe.applicationFees.list()).data[0]).toMatchObject({ amount_refunded: 0, refunded: false });
		await fx.stripe.refunds.create({ payment_intent: pi, amount: 5750, refund_application_fee: true }, { stripeAccount: a });
		expect((await fx.stripe.applicationFees.list()).data[0]).toMatchObject({ amount_refunded: 250, refunded: false });
	});

	it('refuses a fee above the total, below zero, or without a Stripe-Account header', async () => {
		const a = await readyAccount('acct_FeeRules');
		await expect(sessionWithFee(a, 23001)).rejects.toMatchObject({
			statusCode: 400,
			param: 'payment_intent_data[application_fee_amount]'
		});
		await expect(sessionWithFee(a, -1)).rejects.toMatchObject({
			statusCode: 400,
			param: 'payment_intent_data[application_fee_amount]'
		});
		await expect(sessionWithFee(null, 100)).rejects.toMatchObject({
			statusCode: 400,
			param: 'payment_intent_data[application_fee_amount]'
		});
		expect(fx.fake.state.sessions.size).toBe(0);
		const whole = await sessionWithFee(a, 23000); // the whole total is allowed
		expect(whole.amount_total).toBe(23000);
		const none = await fx.stripe.checkout.sessions.create(depositParams(), { stripeAccount: a });
		const paid = await fx.control('POST', `/sessions/${none.id}/pay`);
		expect((paid.json.payment_intent as { application_fee_amount: number | null }).application_fee_amount).toBeNull();
		expect((await fx.stripe.applicationFees.list()).data).toEqual([]);
	});
});

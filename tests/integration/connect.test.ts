// Each studio is paid into its own connected account (Stripe Connect, direct charges), over real
// sockets: the app, the Stripe fake (fake-services/stripe) and the real database. Rules checked:
// - Stripe docs, "Making API calls for connected accounts": a call with the Stripe-Account header
//   runs on that account, and what it makes (sessions, PaymentIntents, refunds) cannot be read from
//   another account or from the platform (404 resource_missing);
// - Stripe docs, "Collect application fees": payment_intent_data.application_fee_amount on a
//   direct charge; the studio's platformFeeBp of the amount, rounded down (src/lib/domain/platform-fee.ts);
// - Stripe docs, "Connect webhooks": a connected account's events carry `account` and go to the
//   Connect endpoint with its own secret; an event changes only what belongs to its account, and
//   `account.updated` events arrive in any order (the newest `created` wins).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import Stripe from 'stripe';
import { APP_URL, DEMO, STRIPE_API_BASE } from '../support/env';
import { studioIdOf, testDb } from '../support/db';
import { signedIn, type Client } from '../support/http';
import { waitFor } from '../support/wait';
import { workdaysAhead } from '../support/dates';
import { isPublicHoliday } from '../../src/lib/domain/holidays';
import { holdFirstFree, payAndConfirm, type Held } from '../support/booking';
import { accountOf } from '../support/stripe-fake';
import { firstFree } from '../support/slots';
import { makeStudio, type TestStudio } from '../support/team';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

const PLATFORM_KEY = process.env.STRIPE_SECRET_KEY ?? 'sk_test_slateroom_test';
const WEBHOOK_SECRET = process.env.STRIPE_WEBHOOK_SECRET ?? 'whsec_slateroom_test';
const CONNECT_WEBHOOK_SECRET = process.env.STRIPE_CONNECT_WEBHOOK_SECRET ?? 'whsec_slateroom_connect_test';
const fakeUrl = new URL(STRIPE_API_BASE);
/** The platform's own client: with no Stripe-Account header it sees the platform's objects only. */
const stripe = new Stripe(PLATFORM_KEY, { host: fakeUrl.hostname, port: Number(fakeUrl.port), protocol: 'http' });

/** This file's own days: working weekdays from 42 days ahead (Hollow Pine books 180 days ahead, Tallbacken 120). */
const DAYS = workdaysAhead(42, 12);
/** Tallbacken is closed on Swedish public holidays (its seed). */
const SE_DAYS = DAYS.filter((d) => !isPublicHoliday('SE', d));
const SLOTS = [
	['10:00', '12:00'],
	['13:00', '15:00'],
	['15:30', '17:30']
] as const;

let hollowPine: { id: string; account: string };
let tallbacken: { id: string; account: string };
let artist: Client;

beforeAll(async () => {
	const hp = await studioIdOf(db);
	const tl = await studioIdOf(db, 'tallbacken');
	hollowPine = { id: hp, account: await accountOf(db, hp) };
	tallbacken = { id: tl, account: await accountOf(db, tl) };
	artist = await signedIn(DEMO.artist2);
});

const on = (account: string) => ({ stripeAccount: account });

/** What Stripe answers for an object another account (or the platform) asks about. */
async function missing(lookUp: () => Promise<unknown>): Promise<string | undefined> {
	try {
		await lookUp();
		return 'found';
	} catch (e) {
		const err = e as { statusCode?: number; code?: string };
		return err.statusCode === 404 ? err.code : `status ${err.statusCode}`;
	}
}

async function paymentOf(bookingId: string) {
	const rows = await db.select().from(t.payment).where(eq(t.payment.bookingId, bookingId));
	expect(rows).toHaveLength(1);
	return rows[0]!;
}

async function bookingRow(id: string) {
	const [row] = await db.select().from(t.booking).where(eq(t.booking.id, id));
	return row!;
}

async function fakeControl(path: string, body: unknown = {}) {
	const res = await fetch(`${STRIPE_API_BASE}/_control${path}`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify(body)
	});
	const answer = (await res.json()) as Record<string, unknown>;
	return { status: res.status, body: answer };
}

interface Answer {
	status: number;
	body: { received?: boolean; duplicate?: boolean; outcome?: string; message?: string; error?: string };
}

/** Posts an event signed as Stripe signs it (SDK generateTestHeaderString) to one of the app's endpoints. */
async function postSigned(event: Record<string, unknown>, endpoint: 'connect' | 'platform'): Promise<Answer> {
	const payload = JSON.stringify(event);
	const header = stripe.webhooks.generateTestHeaderString({
		payload,
		secret: endpoint === 'connect' ? CONNECT_WEBHOOK_SECRET : WEBHOOK_SECRET
	});
	const res = await fetch(`${APP_URL}/api/stripe/${endpoint === 'connect' ? 'connect-webhook' : 'webhook'}`, {
		method: 'POST',
		headers: { 'content-type': 'application/json', 'stripe-signature': header },
		body: payload
	});
	return { status: res.status, body: (await res.json()) as Answer['body'] };
}

/** An event as Stripe shapes it (API reference, "The Event object"), `account` set for a connected account's. */
function event(type: string, object: unknown, account: string | null, created = Math.floor(Date.now() / 1000)) {
	return {
		id: `evt_connect_spec_${crypto.randomUUID().replaceAll('-', '')}`,
		object: 'event',
		api_version: '2026-10-28.endive',
		created,
		type,
		livemode: false,
		pending_webhooks: 1,
		request: { id: null, idempotency_key: null },
		...(account ? { account } : {}),
		data: { object }
	};
}

/** The session of a held booking as Stripe would report it paid: the template of a forged "paid" event. */
async function paidSessionOf(b: Held) {
	const res = await fetch(`${STRIPE_API_BASE}/_control/sessions/${b.sessionId}`);
	const { session } = (await res.json()) as { session: Record<string, unknown> };
	return { ...session, status: 'complete', payment_status: 'paid', payment_intent: `pi_forged_${b.id.slice(0, 8)}` };
}

const recordedEvent = async (id: string) => (await db.select().from(t.stripeEvent).where(eq(t.stripeEvent.id, id)))[0];

const holdAtHollowPine = () => holdFirstFree(artist, { room: 'vocal-booth', days: DAYS, slots: SLOTS });
const holdAtTallbacken = () => holdFirstFree(artist, { studio: 'tallbacken', room: 'cabin', days: SE_DAYS, slots: SLOTS });

describe('each studio is paid into its own account', () => {
	let hp: Held;
	let tl: Held;

	beforeAll(async () => {
		hp = await holdAtHollowPine();
		tl = await holdAtTallbacken();
	});

	it('makes each demo studio’s deposit on its own connected account, out of sight of the other and of the platform', async () => {
		expect(hollowPine.account).not.toBe(tallbacken.account);
		expect((await paymentOf(hp.id)).stripeAccountId).toBe(hollowPine.account);
		expect((await paymentOf(tl.id)).stripeAccountId).toBe(tallbacken.account);

		// The session lives on its studio's account alone.
		const own = await stripe.checkout.sessions.retrieve(hp.sessionId, {}, on(hollowPine.account));
		expect(own.metadata).toMatchObject({ bookingId: hp.id, kind: 'deposit' });
		expect(await missing(() => stripe.checkout.sessions.retrieve(hp.sessionId, {}, on(tallbacken.account)))).toBe(
			'resource_missing'
		);
		expect(await missing(() => stripe.checkout.sessions.retrieve(hp.sessionId))).toBe('resource_missing');
		const theirs = await stripe.checkout.sessions.retrieve(tl.sessionId, {}, on(tallbacken.account));
		expect(theirs.currency).toBe('sek');
		expect(await missing(() => stripe.checkout.sessions.retrieve(tl.sessionId, {}, on(hollowPine.account)))).toBe(
			'resource_missing'
		);
		expect(await missing(() => stripe.checkout.sessions.retrieve(tl.sessionId))).toBe('resource_missing');

		// Paid, each through the Connect endpoint, and the money (the PaymentIntent) is on the same account.
		await payAndConfirm(db, hp);
		await payAndConfirm(db, tl);
		for (const [b, mine, other] of [
			[hp, hollowPine.account, tallbacken.account],
			[tl, tallbacken.account, hollowPine.account]
		] as const) {
			const p = await paymentOf(b.id);
			expect(p.status).toBe('paid');
			const intent = await stripe.paymentIntents.retrieve(p.paymentIntentId!, {}, on(mine));
			expect(intent.status).toBe('succeeded');
			expect(await missing(() => stripe.paymentIntents.retrieve(p.paymentIntentId!, {}, on(other)))).toBe('resource_missing');
			expect(await missing(() => stripe.paymentIntents.retrieve(p.paymentIntentId!))).toBe('resource_missing');
		}
		// The completed events came from the studios' accounts and were recorded with them.
		const hpEvents = await stripe.events.list({ type: 'checkout.session.completed', limit: 100 }, on(hollowPine.account));
		const completed = hpEvents.data.find((e) => (e.data.object as { id: string }).id === hp.sessionId);
		expect(completed?.account).toBe(hollowPine.account);
		expect((await recordedEvent(completed!.id))?.account).toBe(hollowPine.account);
	});

	it('asks the studio’s platform fee on the PaymentIntent and records it; a studio without a fee is asked none', async () => {
		const [hpStudio] = await db.select().from(t.studio).where(eq(t.studio.id, hollowPine.id));
		const [tlStudio] = await db.select().from(t.studio).where(eq(t.studio.id, tallbacken.id));
		// The demo seeds: Hollow Pine pays the platform 2 % of each charge, Tallbacken nothing.
		expect([hpStudio!.platformFeeBp, tlStudio!.platformFeeBp]).toEqual([200, 0]);

		const paid = await paymentOf(hp.id);
		// 2 % of the deposit, rounded down to the cent (worked out here by hand from the amount).
		const fee = Math.floor((paid.amount * 200) / 10_000);
		expect(fee).toBeGreaterThan(0);
		expect(paid.applicationFee).toBe(fee);
		const intent = await stripe.paymentIntents.retrieve(paid.paymentIntentId!, {}, on(hollowPine.account));
		expect(intent.application_fee_amount).toBe(fee);
		const charge = typeof intent.latest_charge === 'string' ? intent.latest_charge : intent.latest_charge?.id;
		const fees = await stripe.applicationFees.list({ limit: 100 });
		const taken = fees.data.find((f) => (typeof f.charge === 'string' ? f.charge : f.charge.id) === charge);
		expect(taken).toMatchObject({ amount: fee, account: hollowPine.account });

		const free = await paymentOf(tl.id);
		expect(free.applicationFee).toBe(0);
		const freeIntent = await stripe.paymentIntents.retrieve(free.paymentIntentId!, {}, on(tallbacken.account));
		expect(freeIntent.application_fee_amount ?? null).toBeNull();
	});

	it('refunds out of the account the deposit was paid into', async () => {
		// 42 days ahead: both ladders give the whole deposit back.
		expect((await artist.json(`/api/bookings/${tl.id}/cancel`, {})).status).toBe(200);
		const back = await waitFor(async () => {
			const [r] = await db.select().from(t.refund).where(eq(t.refund.bookingId, tl.id));
			return r?.status === 'succeeded' ? r : undefined;
		}, 'the refund at Tallbacken succeeded');
		const paid = await paymentOf(tl.id);
		expect(back.amount).toBe(paid.amount);
		expect(back.stripeAccountId).toBe(tallbacken.account);
		const atStripe = await stripe.refunds.retrieve(back.stripeRefundId!, {}, on(tallbacken.account));
		expect(atStripe).toMatchObject({ amount: paid.amount, status: 'succeeded', payment_intent: paid.paymentIntentId });
		expect(await missing(() => stripe.refunds.retrieve(back.stripeRefundId!, {}, on(hollowPine.account)))).toBe(
			'resource_missing'
		);
		expect(await missing(() => stripe.refunds.retrieve(back.stripeRefundId!))).toBe('resource_missing');

		// Another studio's account cannot say this refund failed: the event is recorded and changes nothing.
		const forged = event('refund.updated', { ...atStripe, status: 'failed', failure_reason: 'unknown' }, hollowPine.account);
		const answer = await postSigned(forged, 'connect');
		expect(answer).toMatchObject({ status: 200, body: { received: true, duplicate: false, outcome: 'other_account' } });
		const [after] = await db.select().from(t.refund).where(eq(t.refund.id, back.id));
		expect(after!.status).toBe('succeeded');
		expect((await recordedEvent(forged.id))?.account).toBe(hollowPine.account);
	});
});

describe('the Connect webhook applies an event only where its account matches', () => {
	it('never lets an event carrying Tallbacken’s account touch a Hollow Pine payment, nor a platform event', async () => {
		const b = await holdAtHollowPine();
		const paidSession = await paidSessionOf(b);
		const fromOther = event('checkout.session.completed', paidSession, tallbacken.account);
		const answer = await postSigned(fromOther, 'connect');
		expect(answer).toMatchObject({ status: 200, body: { duplicate: false, outcome: 'other_account' } });
		expect(answer.body.message).toMatch(/another account/);
		// The platform's own endpoint, with no account: not this payment's account either.
		const fromPlatform = event('checkout.session.completed', paidSession, null);
		expect((await postSigned(fromPlatform, 'platform')).body.outcome).toBe('other_account');

		expect((await bookingRow(b.id)).status).toBe('held');
		const p = await paymentOf(b.id);
		expect([p.status, p.paymentIntentId]).toEqual(['open', null]);
		expect((await recordedEvent(fromOther.id))?.account).toBe(tallbacken.account);
		expect((await recordedEvent(fromPlatform.id))?.account).toBeNull();
	});

	it('records an event of an account no studio owns, says so, and changes nothing', async () => {
		const b = await holdAtHollowPine();
		const stranger = `acct_${crypto.randomUUID().replaceAll('-', '').slice(0, 16)}`;
		const paid = event('checkout.session.completed', await paidSessionOf(b), stranger);
		const answer = await postSigned(paid, 'connect');
		expect(answer).toMatchObject({ status: 200, body: { received: true, duplicate: false, outcome: 'unknown_account' } });
		expect(answer.body.message).toMatch(/No studio uses this account/);
		expect((await bookingRow(b.id)).status).toBe('held');
		expect((await paymentOf(b.id)).status).toBe('open');
		const recorded = await recordedEvent(paid.id);
		expect(recorded).toMatchObject({ account: stranger, type: 'checkout.session.completed' });

		// Its account.updated changes no studio either.
		const before = await db.select().from(t.studio);
		const update = event('account.updated', { id: stranger, object: 'account', charges_enabled: false }, stranger);
		expect((await postSigned(update, 'connect')).body.outcome).toBe('unknown_account');
		expect(await db.select().from(t.studio)).toEqual(before);
	});
});

describe('a studio’s account state', () => {
	let studio: TestStudio;
	let account: string;

	beforeAll(async () => {
		studio = await makeStudio(db, `Connect Spec Barn ${crypto.randomUUID().slice(0, 6)}`);
		account = await accountOf(db, studio.id);
		// Published, so an artist outside its team can book it.
		await db.update(t.studio).set({ published: true }).where(eq(t.studio.id, studio.id));
	});

	const stateOf = async () => {
		const [row] = await db.select().from(t.studio).where(eq(t.studio.id, studio.id));
		return { charges: row!.chargesEnabled, payouts: row!.payoutsEnabled, due: row!.accountRequirements };
	};
	const accountUpdated = (created: number, charges: boolean, due: string[]) =>
		event(
			'account.updated',
			{
				id: account,
				object: 'account',
				charges_enabled: charges,
				payouts_enabled: charges,
				details_submitted: true,
				requirements: { currently_due: due, eventually_due: due, past_due: [], disabled_reason: null }
			},
			account,
			created
		);

	it('keeps the newest account.updated when they arrive out of order', async () => {
		const now = Math.floor(Date.now() / 1000);
		const newer = accountUpdated(now - 10, false, ['external_account']);
		const older = accountUpdated(now - 100, true, []);
		expect((await postSigned(newer, 'connect')).body.outcome).toBe('account_updated');
		expect(await stateOf()).toEqual({ charges: false, payouts: false, due: ['external_account'] });
		// The older one arrives late: recorded, and the studio keeps the newer state.
		expect((await postSigned(older, 'connect')).status).toBe(200);
		expect(await stateOf()).toEqual({ charges: false, payouts: false, due: ['external_account'] });
		expect((await recordedEvent(older.id))?.account).toBe(account);
		// Newer still: it applies.
		expect((await postSigned(accountUpdated(now - 5, true, []), 'connect')).body.outcome).toBe('account_updated');
		expect(await stateOf()).toEqual({ charges: true, payouts: true, due: [] });
	});

	it('refuses a checkout with 409 payments_not_ready while Stripe says the account cannot take charges, and takes it again once it can', async () => {
		const artistHere = await signedIn(DEMO.artist);
		const hold = await firstFree<{ id: string; status: string; checkoutUrl: string | null }>(DAYS, SLOTS, async (slot) => {
			const res = await artistHere.json(`/api/studios/${studio.slug}/bookings`, {
				room: studio.roomSlug,
				start: slot.start,
				end: slot.end
			});
			return { status: res.status, body: () => res.json() };
		});
		expect(hold.status).toBe('held');

		// The fake sends account.updated to the Connect endpoint (fake-services/stripe/README.md).
		expect((await fakeControl(`/accounts/${account}/requirements`, { currently_due: ['external_account'] })).status).toBe(200);
		await waitFor(async () => ((await stateOf()).charges ? undefined : true), 'the account can no longer take charges');
		expect((await stateOf()).due).toEqual(['external_account']);

		// No new hold while the studio cannot take charges; the hold made before asks for its payment again.
		const another = await artistHere.json(`/api/studios/${studio.slug}/bookings`, {
			room: studio.roomSlug,
			start: `${DAYS.at(-1)}T10:00`,
			end: `${DAYS.at(-1)}T11:00`
		});
		expect(another.status).toBe(409);
		expect(((await another.json()) as { error: string }).error).toBe('bookings_not_open');
		const refused = await artistHere.json(`/api/bookings/${hold.id}/pay`, { kind: 'deposit' });
		expect(refused.status).toBe(409);
		expect(((await refused.json()) as { error: string }).error).toBe('payments_not_ready');

		expect((await fakeControl(`/accounts/${account}/complete`)).status).toBe(200);
		await waitFor(async () => (await stateOf()).charges, 'the account can take charges again');
		const pay = await artistHere.json(`/api/bookings/${hold.id}/pay`, { kind: 'deposit' });
		expect(pay.status).toBe(200);
		const { sessionId } = (await pay.json()) as { sessionId: string };
		expect((await paymentOf(hold.id)).stripeAccountId).toBe(account);
		expect((await stripe.checkout.sessions.retrieve(sessionId, {}, on(account))).status).toBe('open');
	});
});

describe('payments made before Connect', () => {
	it('are still confirmed by the platform endpoint’s events and refunded from the platform', async () => {
		const b = await holdAtHollowPine();
		const row = await paymentOf(b.id);
		// As a deposit checkout made before Connect: a session on the platform itself, the payment
		// row naming no account. The studio's own session is then expired (its event finds no row).
		const platformSession = await stripe.checkout.sessions.create({
			mode: 'payment',
			line_items: [{ quantity: 1, price_data: { currency: 'eur', unit_amount: row.amount, product_data: { name: 'Deposit' } } }],
			metadata: { bookingId: b.id, kind: 'deposit', paymentId: row.id },
			payment_intent_data: { metadata: { bookingId: b.id, kind: 'deposit', paymentId: row.id } },
			success_url: `${APP_URL}/bookings/${b.id}?paid=1`,
			cancel_url: `${APP_URL}/bookings/${b.id}`
		});
		await db
			.update(t.payment)
			.set({ stripeAccountId: null, applicationFee: 0, checkoutSessionId: platformSession.id, checkoutUrl: platformSession.url })
			.where(eq(t.payment.id, row.id));
		await stripe.checkout.sessions.expire(b.sessionId, {}, on(hollowPine.account));

		// A connected account's word about a platform payment changes nothing.
		const forged = event(
			'checkout.session.completed',
			{ ...platformSession, status: 'complete', payment_status: 'paid', payment_intent: 'pi_forged_platform' },
			hollowPine.account
		);
		expect((await postSigned(forged, 'connect')).body.outcome).toBe('other_account');
		expect((await paymentOf(b.id)).status).toBe('open');

		// Paid on the fake: the platform's event reaches the platform endpoint and confirms it.
		await payAndConfirm(db, { id: b.id, checkoutUrl: platformSession.url! });
		const paid = await paymentOf(b.id);
		expect(paid).toMatchObject({ status: 'paid', stripeAccountId: null });
		const events = await stripe.events.list({ type: 'checkout.session.completed', limit: 100 });
		const completed = events.data.find((e) => (e.data.object as { id: string }).id === platformSession.id);
		expect(completed?.account ?? null).toBeNull();
		expect((await recordedEvent(completed!.id))?.account).toBeNull();

		// Cancelled: the refund comes out of the platform, where the payment was made.
		expect((await artist.json(`/api/bookings/${b.id}/cancel`, {})).status).toBe(200);
		const back = await waitFor(async () => {
			const [r] = await db.select().from(t.refund).where(eq(t.refund.bookingId, b.id));
			return r?.status === 'succeeded' ? r : undefined;
		}, 'the platform refund succeeded');
		expect(back.stripeAccountId).toBeNull();
		const atStripe = await stripe.refunds.retrieve(back.stripeRefundId!);
		expect(atStripe.payment_intent).toBe(paid.paymentIntentId);
		expect(await missing(() => stripe.refunds.retrieve(back.stripeRefundId!, {}, on(hollowPine.account)))).toBe(
			'resource_missing'
		);
	});
});

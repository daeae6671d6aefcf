// Payments the owner records by hand (cash, bank transfer), over HTTP against the production
// build, the real database, the Stripe fake and the mail catcher: who may record one, what is
// refused (422 with the field, more than is owed with what is owed), reversal once, the database
// refusing any change to an entry, the balance everywhere it is read (JSON, balance Checkout, the
// final invoice's paid amount, EN 16931 BT-113/BR-CO-16), the accountant's payments register
// adding up to the month's totals, and one receipt per payment however often Stripe's webhook comes.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, like, sql } from 'drizzle-orm';
import Stripe from 'stripe';
import { parse } from 'csv-parse/sync';
import { strFromU8, unzipSync } from 'fflate';
import { Client, signedIn } from '../support/http';
import { DEMO, STRIPE_API_BASE } from '../support/env';
import { studioIdOf, testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { moveIntoPast } from '../support/started';
import * as t from '../../src/lib/server/db/schema';
import { studioToday, workdaysAhead, ymdInZone } from '../support/dates';
import { expectRefused } from '../support/refusal';
import { bookAndPay, holdFirstFree, type Held } from '../support/booking';
import { accountOf } from '../support/stripe-fake';
import { mailTo } from '../support/team';
import { brokenRules } from '../support/en16931';
import { addDays } from '../../src/lib/domain/time';
import { formatMoney } from '../../src/lib/domain/money';

const { db, client } = testDb();
afterAll(() => client.end());

const fakeUrl = new URL(STRIPE_API_BASE);
const stripe = new Stripe('sk_test_recorded_spec', { host: fakeUrl.hostname, port: Number(fakeUrl.port), protocol: 'http' });
let demoAccount: string;
beforeAll(async () => {
	demoAccount = await accountOf(db, await studioIdOf(db));
});

/** This file's days: working weekdays from 36 days ahead, tried in order. */
const DAYS = workdaysAhead(36, 10);
/** Half days in the live room (160.00, deposit 50.00 on the demo's rates): enough owed to record parts of it. */
const SLOTS: [string, string][] = [
	['09:00', '13:00'],
	['13:30', '17:30']
];
const ROOM = 'live-room';

async function control(path: string, body?: unknown) {
	const res = await fetch(`${STRIPE_API_BASE}/_control${path}`, {
		method: body === undefined ? 'GET' : 'POST',
		headers: { 'content-type': 'application/json' },
		body: body === undefined ? undefined : JSON.stringify(body)
	});
	return { status: res.status, body: (await res.json()) as Record<string, unknown> };
}

async function book(): Promise<Held> {
	return bookAndPay(db, await signedIn(DEMO.artist), { room: ROOM, days: DAYS, slots: SLOTS });
}

interface Entry {
	id: string;
	amount: number;
	method: string;
	paidOn: string;
	note: string;
	reversesId: string | null;
	reason: string | null;
	balanceOwed: number;
}

async function bookingJson(who: Client, id: string) {
	const res = await who.json(`/api/bookings/${id}`);
	expect(res.status).toBe(200);
	return (await res.json()) as {
		money: { paidByCard: number; recorded: number; balanceOwed: number; invoiced: number | null };
		recordedPayments: (Entry & { reversed: boolean })[];
	};
}

/** Mail to the demo artist about one booking whose subject matches. */
async function mailAbout(reference: string, subject: RegExp) {
	return (await mailTo(DEMO.artist)).filter((m) => m.subject.includes(reference) && subject.test(m.subject));
}

const euros = (minor: number) => (minor / 100).toFixed(2);
/** An amount as the e-mails write it ('€1,234.00'). */
const eur = (minor: number) => formatMoney(minor, 'EUR');
const escape = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

describe('recording a payment by hand', () => {
	it('is the owner’s alone; bad fields are 422s naming the field; more than is owed is refused with what is owed', async () => {
		const b = await book();
		const url = `/api/bookings/${b.id}/payments`;
		const ok = { amount: 5000, method: 'cash', paidOn: studioToday(), note: 'Paid at the desk' };

		// Who: the artist of the booking and the rest of the team know it (403); another artist does not (404).
		await expectRefused(await (await signedIn(DEMO.artist)).json(url, ok), 403);
		await expectRefused(await (await signedIn(DEMO.engineer)).json(url, ok), 403);
		await expectRefused(await (await signedIn(DEMO.accountant)).json(url, ok), 403);
		await expectRefused(await (await signedIn(DEMO.artist2)).json(url, ok), 404);
		await expectRefused(await (await signedIn('owner2@slateroom.test')).json(url, ok), 404);
		expect((await new Client().json(url, ok)).status).toBe(401);

		const owner = await signedIn(DEMO.owner);
		const field = async (body: unknown, name: string) => {
			const res = await owner.json(url, body);
			const answer = (await res.json()) as { error: string; fields?: Record<string, string[]> };
			expect(res.status, JSON.stringify(answer)).toBe(422);
			expect(Object.keys(answer.fields ?? {}), JSON.stringify(answer)).toContain(name);
		};
		await field({ ...ok, amount: '50.00' }, 'amount'); // the API takes integer minor units, as everywhere
		await field({ ...ok, amount: 0 }, 'amount');
		await field({ ...ok, amount: -100 }, 'amount');
		await field({ ...ok, amount: 10.5 }, 'amount');
		await field({ ...ok, method: 'card' }, 'method');
		await field({ ...ok, paidOn: '2027-02-30' }, 'paidOn');
		await field({ ...ok, paidOn: addDays(studioToday(), 1) }, 'paidOn'); // not in the future
		await field({ ...ok, paidOn: addDays(studioToday(), -1) }, 'paidOn'); // not before the booking was made (today)
		await field({ ...ok, note: 'bad\u0000note' }, 'note');
		await field({ ...ok, note: 'x'.repeat(501) }, 'note');
		expect(await db.select().from(t.recordedPayment).where(eq(t.recordedPayment.bookingId, b.id))).toEqual([]);

		const owed = b.quote.total - b.quote.deposit;
		const over = await owner.json(url, { ...ok, amount: owed + 1 });
		const overBody = (await over.json()) as { error: string; owed: number; message: string };
		expect(over.status).toBe(422);
		expect(overBody).toMatchObject({ error: 'overpayment', owed });
		expect(overBody.message).toContain(eur(owed));

		const made = await owner.json(url, ok);
		const entry = (await made.json()) as Entry;
		expect(made.status, JSON.stringify(entry)).toBe(201);
		expect(entry).toMatchObject({
			amount: 5000,
			method: 'cash',
			paidOn: studioToday(),
			note: 'Paid at the desk',
			reversesId: null
		});
		expect(entry.balanceOwed).toBe(owed - 5000);
		const seen = await bookingJson(await signedIn(DEMO.artist), b.id);
		expect(seen.money).toMatchObject({ paidByCard: b.quote.deposit, recorded: 5000, balanceOwed: owed - 5000, invoiced: null });
		expect(seen.recordedPayments.map((r) => [r.amount, r.method])).toEqual([[5000, 'cash']]);

		// A booking that is only held takes none (its deposit goes through Checkout).
		const held = await holdFirstFree(await signedIn(DEMO.artist), { room: ROOM, days: DAYS, slots: SLOTS });
		const refused = await owner.json(`/api/bookings/${held.id}/payments`, ok);
		expect(refused.status).toBe(409);
		expect(await refused.json()).toMatchObject({ error: 'not_accepting' });
	});

	it('is never changed in the database: UPDATE and DELETE are refused with their own message', async () => {
		const b = await book();
		const owner = await signedIn(DEMO.owner);
		const made = await owner.json(`/api/bookings/${b.id}/payments`, {
			amount: 1000,
			method: 'bank_transfer',
			paidOn: studioToday()
		});
		const entry = (await made.json()) as Entry;
		expect(made.status).toBe(201);
		const refusal = async (work: Promise<unknown>) => {
			try {
				await work;
			} catch (e) {
				const cause = (e as { cause?: { code?: string; message?: string } }).cause ?? (e as { code?: string; message?: string });
				return { code: cause.code, message: cause.message };
			}
			return null;
		};
		const update = await refusal(db.execute(sql`update recorded_payment set amount = 1 where id = ${entry.id}`));
		expect(update?.code).toBe('55000');
		expect(update?.message).toMatch(/recorded payments are never changed: UPDATE is refused/);
		const del = await refusal(db.execute(sql`delete from recorded_payment where id = ${entry.id}`));
		expect(del?.code).toBe('55000');
		expect(del?.message).toMatch(/DELETE is refused/);
		const [row] = await db.select().from(t.recordedPayment).where(eq(t.recordedPayment.id, entry.id));
		expect(row?.amount).toBe(1000);
	});

	it('settles the balance: counted as paid on the final invoice, asked no more by Checkout, reversed once; a receipt each', async () => {
		const b = await book();
		const owner = await signedIn(DEMO.owner);
		const artist = await signedIn(DEMO.artist);
		const url = `/api/bookings/${b.id}/payments`;
		const today = studioToday();

		// Cash before the session: the final invoice deducts it with the deposit (BT-113).
		const early = (await (
			await owner.json(url, { amount: 4321, method: 'cash', paidOn: today, note: 'Cash on arrival' })
		).json()) as Entry;
		const held = await moveIntoPast(db, b.id);
		const closed = await (await signedIn(DEMO.engineer)).json(`/api/bookings/${b.id}/close`, { actualEnd: held.end });
		expect(closed.status).toBe(200);
		const [final] = await db
			.select()
			.from(t.invoice)
			.where(and(eq(t.invoice.bookingId, b.id), eq(t.invoice.typeCode, 380)));
		expect(final!.prepaid).toBe(b.quote.deposit + 4321);
		expect(final!.amountDue).toBe(b.quote.total - b.quote.deposit - 4321); // BR-CO-16
		expect(final!.note).toContain('Received before this invoice: cash');
		// Its e-invoice keeps every rule: the month's UBL export holds it.
		const month = ymdInZone(final!.issuedAt).slice(0, 7);
		const ubl = unzipSync(
			new Uint8Array(
				await (await owner.fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=ubl`)).arrayBuffer()
			)
		);
		const xml = strFromU8(ubl[`ubl/${final!.displayNumber}.xml`]!);
		expect(brokenRules(xml)).toEqual([]);
		expect(xml).toContain(`<cbc:PrepaidAmount currencyID="EUR">${euros(b.quote.deposit + 4321)}</cbc:PrepaidAmount>`);
		expect(xml).toContain(`<cbc:PayableAmount currencyID="EUR">${euros(final!.amountDue)}</cbc:PayableAmount>`);

		// The balance Checkout asks only what is still owed.
		const owed = final!.amountDue;
		expect((await bookingJson(artist, b.id)).money.balanceOwed).toBe(owed);
		const pay = (await (await artist.json(`/api/bookings/${b.id}/pay`, { kind: 'balance' })).json()) as { checkoutUrl: string };
		const sessionId = pay.checkoutUrl.split('/pay/')[1]!;
		const session = (await control(`/sessions/${sessionId}`)).body.session as Stripe.Checkout.Session;
		expect(session.amount_total).toBe(owed);

		// The rest in cash after the invoice: nothing owed, no Checkout offered.
		const rest = await owner.json(url, { amount: owed, method: 'cash', paidOn: today });
		expect(rest.status).toBe(201);
		expect(((await rest.json()) as Entry).balanceOwed).toBe(0);
		expect((await bookingJson(artist, b.id)).money.balanceOwed).toBe(0);
		const nothing = await artist.json(`/api/bookings/${b.id}/pay`, { kind: 'balance' });
		expect(nothing.status).toBe(409);
		expect((await owner.json(url, { amount: 1, method: 'cash', paidOn: today })).status).toBe(422);
		// The card checkout opened before still goes through: what is over goes back to the card, never kept twice.
		expect((await control(`/sessions/${sessionId}/pay`, {})).status).toBe(200);
		const back = await waitFor(async () => {
			const [r] = await db.select().from(t.refund).where(eq(t.refund.bookingId, b.id));
			return r;
		}, 'the overpaid balance refunded');
		expect(back).toMatchObject({ amount: owed, reason: 'duplicate' });

		// Reversal: a reason is needed; once; a reversal is not reversed; the balance is owed again.
		const reverse = (id: string, body: unknown) => owner.json(`/api/bookings/${b.id}/payments/${id}/reverse`, body);
		await expectRefused(await artist.json(`/api/bookings/${b.id}/payments/${early.id}/reverse`, { reason: 'x' }), 403);
		expect((await reverse(early.id, {})).status).toBe(422);
		expect((await reverse(early.id, { reason: '  ' })).status).toBe(422);
		const undone = await reverse(early.id, { reason: 'Counted twice at the desk' });
		const reversal = (await undone.json()) as Entry;
		expect(undone.status, JSON.stringify(reversal)).toBe(201);
		expect(reversal).toMatchObject({ amount: -4321, reversesId: early.id, reason: 'Counted twice at the desk', method: 'cash' });
		expect(reversal.balanceOwed).toBe(4321);
		const twice = await reverse(early.id, { reason: 'again' });
		expect(twice.status).toBe(409);
		expect(await twice.json()).toMatchObject({ error: 'already_reversed' });
		expect((await reverse(reversal.id, { reason: 'undo the undo' })).status).toBe(409);
		expect((await reverse('00000000-0000-4000-8000-000000000000', { reason: 'none' })).status).toBe(404);
		const json = await bookingJson(artist, b.id);
		expect(json.money).toMatchObject({ recorded: owed, balanceOwed: 4321 });
		expect(json.recordedPayments.find((r) => r.id === early.id)?.reversed).toBe(true);

		// A receipt for each payment (deposit by card, two in cash) and a note of the reversal, each once.
		const receipts = await waitFor(async () => {
			const got = await mailAbout(b.reference, /^(Receipt|Payment taken off)/);
			return got.length >= 5 ? got : undefined;
		}, 'five receipts');
		const subjects = receipts.map((m) => m.subject).sort();
		expect(subjects.filter((s) => s.startsWith('Payment taken off'))).toEqual([
			`Payment taken off booking ${b.reference}: ${eur(4321)}`
		]);
		expect(subjects.filter((s) => s === `Receipt: ${eur(4321)} for booking ${b.reference}`)).toHaveLength(1);
		const cash = receipts.find((m) => m.subject === `Receipt: ${eur(4321)} for booking ${b.reference}`)!;
		expect(cash.text).toContain('Hollow Pine Studio');
		expect(cash.text).toContain(`Booking:    ${b.reference}`);
		expect(cash.text).toContain('Method:     Cash');
		expect(cash.text).toContain(`Still owed: ${eur(owed)}`);
		expect(cash.text).toMatch(/Session: {4}\w+day,? \d{1,2} \w+ \d{4}, \d\d:\d\d–\d\d:\d\d \(Europe\/Helsinki time\)/);
		const note = receipts.find((m) => m.subject.startsWith('Payment taken off'))!;
		expect(note.text).toContain('Reason: Counted twice at the desk');
		expect(note.text).toContain(`Still owed: ${eur(4321)}`);
		const messages = await db
			.select({ key: t.scheduledMessage.key, kind: t.scheduledMessage.kind, sentAt: t.scheduledMessage.sentAt })
			.from(t.scheduledMessage)
			.where(and(eq(t.scheduledMessage.bookingId, b.id), like(t.scheduledMessage.key, 'receipt:%')));
		expect(messages.map((m) => m.key).sort()).toEqual(expect.arrayContaining([`receipt:${early.id}`, `receipt:${reversal.id}`]));
		expect(messages).toHaveLength(5); // deposit, cash before, cash after, balance by card, reversal
		expect(messages.every((m) => m.kind === 'receipt' && m.sentAt !== null)).toBe(true);
	});
});

describe('receipts of Checkout payments', () => {
	it('sends one receipt per payment even when the webhook is delivered again', async () => {
		const b = await book();
		const events = await waitFor(async () => {
			const list = await stripe.events.list({ type: 'checkout.session.completed', limit: 100 }, { stripeAccount: demoAccount });
			return list.data.find((e) => (e.data.object as { id?: string }).id === b.sessionId);
		}, 'the completed event');
		for (let i = 0; i < 3; i++) expect((await control(`/events/${events.id}/resend`, {})).status).toBe(202);
		await waitFor(async () => {
			const d = (await control(`/deliveries?event=${events.id}`)).body.data as { statusCode: number | null }[];
			return d.length >= 4 && d.every((x) => x.statusCode === 200);
		}, 'four deliveries answered');
		// A later payment's receipt is queued after them; once it is in the catcher, the outbox has
		// sent everything queued before it (it sends oldest first).
		const owner = await signedIn(DEMO.owner);
		const later = await owner.json(`/api/bookings/${b.id}/payments`, {
			amount: 1234,
			method: 'bank_transfer',
			paidOn: studioToday()
		});
		expect(later.status).toBe(201);
		await waitFor(async () => (await mailAbout(b.reference, /^Receipt: €12\.34 /)).length > 0, 'the later receipt');
		const card = await mailAbout(b.reference, new RegExp(`^Receipt: ${escape(eur(b.quote.deposit))} `));
		expect(card).toHaveLength(1);
		expect(card[0]!.text).toContain('Method:     Card');
		expect(card[0]!.text).toContain(`Still owed: ${eur(b.quote.total - b.quote.deposit)}`);
		const outbox = await db.select().from(t.emailOutbox).where(like(t.emailOutbox.dedupeKey, `receipt:%`));
		const [deposit] = await db.select().from(t.payment).where(eq(t.payment.bookingId, b.id));
		expect(outbox.filter((m) => m.dedupeKey === `receipt:${deposit!.id}`)).toHaveLength(1);
	});
});

describe('the accountant’s month', () => {
	it('lists each recorded payment and reversal as a row with method, day, note and booking; the CSV adds up to the totals', async () => {
		const b = await book();
		const owner = await signedIn(DEMO.owner);
		const today = studioToday();
		const a = (await (
			await owner.json(`/api/bookings/${b.id}/payments`, { amount: 2500, method: 'cash', paidOn: today, note: 'Desk, evening' })
		).json()) as Entry;
		const c = (await (
			await owner.json(`/api/bookings/${b.id}/payments`, { amount: 1500, method: 'bank_transfer', paidOn: today })
		).json()) as Entry;
		const r = (await (
			await owner.json(`/api/bookings/${b.id}/payments/${c.id}/reverse`, { reason: 'Transfer bounced' })
		).json()) as Entry;
		expect(r.amount).toBe(-1500);

		const month = today.slice(0, 7);
		const accountant = await signedIn(DEMO.accountant);
		const report = (await (await accountant.json(`/api/studios/hollow-pine/invoices?month=${month}`)).json()) as {
			payments: {
				id: string;
				kind: string;
				method: string;
				amount: number;
				paidOn: string;
				note: string;
				bookingReference: string;
			}[];
			totals: { received: number; recorded: number };
		};
		const mine = report.payments.filter((p) => [a.id, c.id, r.id].includes(p.id));
		expect(mine.map((p) => [p.kind, p.method, p.amount, p.paidOn, p.note, p.bookingReference])).toEqual([
			['recorded', 'cash', 2500, today, 'Desk, evening', b.reference],
			['recorded', 'bank_transfer', 1500, today, '', b.reference],
			['reversal', 'bank_transfer', -1500, today, 'Transfer bounced', b.reference]
		]);
		expect(report.totals.received).toBe(report.payments.reduce((s, p) => s + p.amount, 0));

		const csv = parse<Record<string, string>>(
			await (
				await accountant.fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=csv&register=payments`)
			).text(),
			{ columns: true }
		);
		expect(csv).toHaveLength(report.payments.length);
		const cents = (text: string) => {
			const [whole, frac = ''] = text.replace('-', '').split('.');
			return (text.startsWith('-') ? -1 : 1) * (Number(whole) * 100 + Number(frac.padEnd(2, '0')));
		};
		expect(csv.reduce((s, row) => s + cents(row.Amount!), 0)).toBe(report.totals.received);
		expect(csv.filter((row) => row.Method !== 'card').reduce((s, row) => s + cents(row.Amount!), 0)).toBe(report.totals.recorded);
		const rows = csv.filter((row) => row.Booking === b.reference && row.Method !== 'card');
		expect(rows.map((row) => [row['Paid on'], row.For, row.Method, row.Amount, row.Note])).toEqual([
			[today, 'recorded', 'cash', '25.00', 'Desk, evening'],
			[today, 'recorded', 'bank_transfer', '15.00', ''],
			[today, 'reversal', 'bank_transfer', '-15.00', 'Transfer bounced']
		]);
		// The accountant may open the booking the rows lead to.
		expect((await accountant.json(`/api/bookings/${b.id}`)).status).toBe(200);
	});
});

// Moving a booked session over real HTTP: the moving policy for the artist and the owner, the
// preview's numbers, moves that cost the same, less (a refund and its credit note) or more (paid
// through the Stripe fake's Checkout), a taken slot (409 with the nearest starts), the e-mails with
// their calendar files parsed back with node-ical, the engineer's feed, and 50 moves racing for one
// free slot.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, inArray, like } from 'drizzle-orm';
import ical from 'node-ical';
import { signedIn, type Client } from '../support/http';
import { APP_URL, DEMO, MAIL_API } from '../support/env';
import { studioIdOf, testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { workdaysAhead } from '../support/dates';
import { payOnFake } from '../support/stripe-fake';
import { bookAndPay, sessionOf, type Held } from '../support/booking';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

/** This file's days: working weekdays from 8 days ahead (more than 7 days' notice), clear of other specs. */
const DAYS = workdaysAhead(8, 9);
const RACE_DAYS = DAYS.slice(3);

let studioId = '';
let artist: Client;
let owner: Client;
beforeAll(async () => {
	studioId = await studioIdOf(db);
	artist = await signedIn(DEMO.artist);
	owner = await signedIn(DEMO.owner);
});

interface Preview {
	allowed: boolean;
	refusal?: string;
	policy: { freeHours: number; minHours: number; fee: number };
	fee: number;
	oldTotal: number;
	newTotal: number;
	oldDeposit: number;
	newDeposit: number;
	depositPaid: number;
	settlement: number;
	toPay: number;
	refund: number;
	kept: number;
	available: boolean;
	nearestStarts?: string[];
	quote: { total: number; deposit: number; lines: { key: string; amount: number }[] };
}

const query = (o: Record<string, string>) => new URLSearchParams(o).toString();
const preview = async (who: Client, id: string, o: Record<string, string>) => {
	const res = await who.json(`/api/bookings/${id}/move?${query(o)}`);
	return { status: res.status, body: (await res.json()) as Preview & { error?: string; fields?: Record<string, string[]> } };
};
const move = async (who: Client, id: string, body: Record<string, unknown>) => {
	const res = await who.json(`/api/bookings/${id}/move`, body);
	return { status: res.status, body: (await res.json()) as Record<string, unknown> & Preview };
};
const row = async (id: string) => (await db.select().from(t.booking).where(eq(t.booking.id, id)))[0]!;

async function setPolicy(freeHours: number, minHours: number, fee: number) {
	await db
		.update(t.studio)
		.set({ moveFreeHours: freeHours, moveMinHours: minHours, moveFee: fee })
		.where(eq(t.studio.id, studioId));
}

interface CaughtMail {
	subject: string;
	text: string;
	to: { address: string }[];
	attachments?: { filename: string; generatedFileName: string; contentType: string }[];
	id: string;
}
async function mailTo(address: string): Promise<CaughtMail[]> {
	const all = (await (await fetch(`${MAIL_API}/api/email`)).json()) as CaughtMail[];
	return all.filter((m) => m.to.some((x) => x.address === address));
}
async function icsOf(m: CaughtMail): Promise<ical.VEvent> {
	const file = m.attachments?.find((a) => a.filename.endsWith('.ics'));
	const res = await fetch(`${MAIL_API}/api/email/${m.id}/attachment/${file!.generatedFileName}`);
	const events = Object.values(ical.sync.parseICS(await res.text())).filter((c): c is ical.VEvent => c?.type === 'VEVENT');
	expect(events).toHaveLength(1);
	return events[0]!;
}

describe('moving a session', () => {
	let b: Held;

	it('previews the move at the booked rates and moves a same-price session at once, with e-mails and a new SEQUENCE', async () => {
		b = await bookAndPay(db, artist, {
			room: 'control-room',
			days: [DAYS[0]!],
			slots: [['10:00', '12:00']],
			extra: { engineer: true }
		});
		const before = await row(b.id);
		expect(before.engineerId).not.toBeNull();

		const p = await preview(artist, b.id, { start: `${DAYS[0]}T14:00`, end: `${DAYS[0]}T16:00` });
		expect(p.status).toBe(200);
		expect(p.body).toMatchObject({
			allowed: true,
			fee: 0,
			policy: { freeHours: 168, minHours: 48 },
			oldTotal: before.total,
			newTotal: before.total,
			oldDeposit: before.deposit,
			newDeposit: before.deposit,
			depositPaid: before.deposit,
			settlement: 0,
			available: true
		});

		const moved = await move(artist, b.id, { start: `${DAYS[0]}T14:00`, end: `${DAYS[0]}T16:00` });
		expect(moved.status).toBe(200);
		expect(moved.body.status).toBe('applied');
		const after = await row(b.id);
		expect(after.sequence).toBe(before.sequence + 1);
		expect(after.endsAt.getTime() - after.startsAt.getTime()).toBe(2 * 3600_000);
		expect(after.busyUntil.getTime() - after.endsAt.getTime()).toBe(before.busyUntil.getTime() - before.endsAt.getTime());
		expect(after.engineerId).toBe(before.engineerId);
		const [m] = await db.select().from(t.bookingMove).where(eq(t.bookingMove.bookingId, b.id));
		expect(m).toMatchObject({ status: 'applied', settlement: 0, fee: 0 });
		const audit = await db
			.select()
			.from(t.auditLog)
			.where(and(eq(t.auditLog.entityId, b.id), eq(t.auditLog.action, 'booking.moved')));
		expect(audit).toHaveLength(1);

		// The artist's and the engineer's e-mails carry the calendar file: same UID, SEQUENCE one higher.
		const keys = (
			await db
				.select({ key: t.emailOutbox.dedupeKey })
				.from(t.emailOutbox)
				.where(like(t.emailOutbox.dedupeKey, `booking-moved:${b.id}:%`))
		).map((r) => r.key);
		expect(keys.sort()).toEqual([`booking-moved:${b.id}:${after.sequence}`, `booking-moved:${b.id}:${after.sequence}:engineer`]);
		const [engineer] = await db.select().from(t.user).where(eq(t.user.id, after.engineerId!));
		for (const to of [DEMO.artist, engineer!.email]) {
			const mail = await waitFor(
				async () => (await mailTo(to)).find((x) => x.subject.startsWith('Moved:') && x.text.includes(`/bookings/${b.id}`)),
				`the move e-mail to ${to}`
			);
			const event = await icsOf(mail);
			expect(event.uid).toBe(b.id);
			expect(Number(event.sequence)).toBe(after.sequence);
			expect(new Date(event.start).getTime()).toBe(after.startsAt.getTime());
			expect(new Date(event.end!).getTime()).toBe(after.endsAt.getTime());
		}
		const artistMail = (await mailTo(DEMO.artist)).find((x) => x.subject.startsWith('Moved:') && x.text.includes(b.id))!;
		expect(artistMail.text).toContain('Total after the move');

		// The engineer's feed shows the new time, at the new SEQUENCE.
		await engineerPlanFeed();
		const [feedRow] = await db
			.select({ token: t.calendarFeed.token })
			.from(t.calendarFeed)
			.where(eq(t.calendarFeed.userId, after.engineerId!));
		expect(feedRow).toBeDefined();
		{
			const text = await (await fetch(`${APP_URL}/feed/${feedRow!.token}/sessions.ics`)).text();
			const event = Object.values(ical.sync.parseICS(text)).find((c) => c?.type === 'VEVENT' && c.uid === b.id) as
				ical.VEvent | undefined;
			expect(event).toBeDefined();
			expect(new Date(event!.start).getTime()).toBe(after.startsAt.getTime());
			expect(Number(event!.sequence)).toBe(after.sequence);
		}
	});

	it('answers 404 to anyone who may not see the booking, 403 to staff who may not move it, 422 to bad input', async () => {
		const other = await signedIn(DEMO.artist2);
		expect((await preview(other, b.id, { start: `${DAYS[0]}T14:00`, end: `${DAYS[0]}T16:00` })).status).toBe(404);
		expect((await move(other, b.id, { start: `${DAYS[0]}T14:00`, end: `${DAYS[0]}T16:00` })).status).toBe(404);
		const engineer = await signedIn(DEMO.engineer);
		expect((await move(engineer, b.id, { start: `${DAYS[0]}T17:00`, end: `${DAYS[0]}T19:00` })).status).toBe(403);
		const bad = await preview(artist, b.id, { start: 'tomorrow', end: `${DAYS[0]}T16:00` });
		expect(bad.status).toBe(422);
		expect(bad.body.fields?.start).toBeDefined();
		expect((await move(artist, b.id, { end: `${DAYS[0]}T16:00` })).status).toBe(422);
		expect((await move(artist, b.id, { start: `${DAYS[0]}T14:00`, end: `${DAYS[0]}T16:00`, engineer: 'someone' })).status).toBe(
			422
		);
	});

	it('applies the policy to the artist (free, fee, refused) and not to the owner', async () => {
		const to = { start: `${DAYS[0]}T17:00`, end: `${DAYS[0]}T19:00` };
		try {
			// Every session of this file is between the minimum and the free notice: the fee applies.
			await setPolicy(5000, 24, 2500);
			const feeNow = await preview(artist, b.id, to);
			expect(feeNow.body).toMatchObject({ allowed: true, fee: 2500 });
			expect(feeNow.body.settlement).toBe(feeNow.body.newDeposit - feeNow.body.depositPaid + 2500);
			expect((await preview(owner, b.id, to)).body).toMatchObject({ allowed: true, fee: 0 });
			// Under the minimum notice: refused for the artist, still free for the owner.
			await setPolicy(5000, 5000, 2500);
			const refused = await preview(artist, b.id, to);
			expect(refused.body).toMatchObject({ allowed: false, refusal: 'too_late' });
			const tried = await move(artist, b.id, to);
			expect(tried.status).toBe(409);
			expect(tried.body.error).toBe('too_late');
			expect((await preview(owner, b.id, to)).body).toMatchObject({ allowed: true, fee: 0 });
		} finally {
			await setPolicy(168, 48, 0);
		}
	});

	it('moves onto a taken slot with a 409 and the nearest free starts, and keeps the old slot', async () => {
		const blocker = await bookAndPay(db, await signedIn(DEMO.artist2), {
			room: 'control-room',
			days: [DAYS[1]!],
			slots: [['10:00', '12:00']]
		});
		const before = await row(b.id);
		const p = await preview(artist, b.id, { start: `${DAYS[1]}T10:00`, end: `${DAYS[1]}T12:00` });
		expect(p.body.available).toBe(false);
		expect(p.body.nearestStarts?.length).toBeGreaterThan(0);
		const res = await move(artist, b.id, { start: `${DAYS[1]}T11:00`, end: `${DAYS[1]}T13:00` });
		expect(res.status).toBe(409);
		expect(res.body).toMatchObject({ error: 'slot_taken', taken: 'room' });
		expect((res.body.nearestStarts as string[]).length).toBeGreaterThan(0);
		const after = await row(b.id);
		expect(after.startsAt).toEqual(before.startsAt);
		expect(after.sequence).toBe(before.sequence);
		expect((await row(blocker.id)).status).toBe('confirmed');
	});

	it('refuses a move onto gear another session has then', async () => {
		const [gear] = await db
			.select()
			.from(t.gearItem)
			.where(and(eq(t.gearItem.studioId, studioId), eq(t.gearItem.hireable, true), eq(t.gearItem.active, true)))
			.limit(1);
		await bookAndPay(db, await signedIn(DEMO.artist2), {
			room: 'live-room',
			days: [DAYS[1]!],
			slots: [['15:00', '17:00']],
			extra: { gear: [gear!.id] }
		});
		const res = await move(owner, b.id, { start: `${DAYS[1]}T15:00`, end: `${DAYS[1]}T17:00`, gear: [gear!.id] });
		expect(res.status).toBe(409);
		expect(res.body.taken).toBe('gear');
	});

	it('refunds the excess deposit of a cheaper move and issues a credit note; invoices issued stay as they were', async () => {
		const big = await bookAndPay(db, artist, { room: 'live-room', days: [DAYS[2]!], slots: [['09:00', '17:00']] });
		const before = await row(big.id);
		const [depositInvoice] = await db.select().from(t.invoice).where(eq(t.invoice.bookingId, big.id));
		const p = await preview(artist, big.id, { start: `${DAYS[2]}T09:00`, end: `${DAYS[2]}T11:00` });
		expect(p.body.newTotal).toBeLessThan(before.total);
		expect(p.body.settlement).toBe(p.body.newDeposit - before.deposit);
		expect(p.body.settlement).toBeLessThan(0);
		// Far ahead: the ladder gives the whole difference back.
		expect(p.body.refund).toBe(-p.body.settlement);
		const res = await move(artist, big.id, { start: `${DAYS[2]}T09:00`, end: `${DAYS[2]}T11:00` });
		expect(res.status).toBe(200);
		const after = await row(big.id);
		expect(after.total).toBe(p.body.newTotal);
		expect(after.deposit).toBe(p.body.newDeposit);
		const [refund] = await db.select().from(t.refund).where(eq(t.refund.bookingId, big.id));
		expect(refund).toMatchObject({ reason: 'move', amount: p.body.refund });
		const credit = await waitFor(
			async () =>
				(
					await db
						.select()
						.from(t.invoice)
						.where(and(eq(t.invoice.bookingId, big.id), eq(t.invoice.typeCode, 381)))
				)[0],
			'the credit note of the refund'
		);
		expect(credit.precedingInvoiceId).toBe(depositInvoice!.id);
		const [still] = await db.select().from(t.invoice).where(eq(t.invoice.id, depositInvoice!.id));
		expect(still).toEqual(depositInvoice);
	});

	it('takes a dearer move through Checkout: the old slot stays until paid, then the move applies with its own invoice', async () => {
		const small = await bookAndPay(db, artist, { room: 'vocal-booth', days: [DAYS[1]!], slots: [['09:00', '11:00']] });
		const before = await row(small.id);
		const to = { start: `${DAYS[1]}T09:00`, end: `${DAYS[1]}T14:00`, room: 'live-room' };
		const p = await preview(artist, small.id, to);
		expect(p.body.settlement).toBeGreaterThan(0);
		const res = await move(artist, small.id, to);
		expect(res.status).toBe(202);
		expect(res.body.status).toBe('awaiting_payment');
		const checkoutUrl = res.body.checkoutUrl as string;
		expect(checkoutUrl).toContain('/pay/');
		// Until paid the booking keeps its slot.
		expect((await row(small.id)).startsAt).toEqual(before.startsAt);
		const [waiting] = await db.select().from(t.bookingMove).where(eq(t.bookingMove.bookingId, small.id));
		expect(waiting).toMatchObject({ status: 'awaiting_payment', settlement: p.body.settlement });

		expect(await payOnFake(sessionOf(checkoutUrl))).toBe(200);
		const applied = await waitFor(async () => {
			const [m] = await db.select().from(t.bookingMove).where(eq(t.bookingMove.id, waiting!.id));
			return m?.status === 'applied' ? m : null;
		}, 'the paid move applied');
		expect(applied.paymentId).not.toBeNull();
		const after = await row(small.id);
		expect(after.sequence).toBe(before.sequence + 1);
		expect(after.total).toBe(p.body.newTotal);
		expect(after.deposit).toBe(p.body.newDeposit);
		const [pay] = await db.select().from(t.payment).where(eq(t.payment.id, applied.paymentId!));
		expect(pay).toMatchObject({ kind: 'move', status: 'paid', amount: p.body.settlement });
		const docs = await db.select().from(t.invoice).where(eq(t.invoice.bookingId, small.id));
		expect(docs.filter((d) => d.typeCode === 386)).toHaveLength(2);
		expect(docs.find((d) => d.paymentId === pay!.id)?.typeCode).toBe(386);
	});

	it('refunds a paid move in full when its new slot was taken before the payment came', async () => {
		const mine = await bookAndPay(db, artist, { room: 'vocal-booth', days: [DAYS[2]!], slots: [['18:00', '20:00']] });
		const to = { start: `${DAYS[2]}T18:00`, end: `${DAYS[2]}T22:00`, room: 'control-room' };
		const res = await move(artist, mine.id, to);
		expect(res.status).toBe(202);
		// Someone books the new time before the artist pays.
		await bookAndPay(db, await signedIn(DEMO.artist2), { room: 'control-room', days: [DAYS[2]!], slots: [['19:00', '21:00']] });
		expect(await payOnFake(sessionOf(res.body.checkoutUrl as string))).toBe(200);
		const m = await waitFor(async () => {
			const [x] = await db.select().from(t.bookingMove).where(eq(t.bookingMove.bookingId, mine.id));
			return x?.status === 'cancelled' ? x : null;
		}, 'the move given up');
		const [refund] = await db.select().from(t.refund).where(eq(t.refund.paymentId, m.paymentId!));
		expect(refund).toMatchObject({ reason: 'slot_unavailable' });
		const [pay] = await db.select().from(t.payment).where(eq(t.payment.id, m.paymentId!));
		expect(refund!.amount).toBe(pay!.amount);
		expect((await row(mine.id)).sequence).toBe(0);
		await waitFor(
			async () => (await mailTo(DEMO.artist)).find((x) => x.subject.includes('was not moved') && x.text.includes(mine.id)),
			'the note that the move could not be made'
		);
	});
});

describe('the moving policy setting', () => {
	it('is the owner’s to set on the rates & policy page, checked field by field', async () => {
		const studioRow = async () => (await db.select().from(t.studio).where(eq(t.studio.id, studioId)))[0]!;
		try {
			const saved = await owner.form('/studio/settings?/movePolicy', {
				moveFreeHours: '120',
				moveMinHours: '24',
				moveFee: '15.50'
			});
			expect(saved.status).toBe(200);
			expect(await studioRow()).toMatchObject({ moveFreeHours: 120, moveMinHours: 24, moveFee: 1550 });
			const page = await (await owner.fetch('/studio/settings', { headers: { accept: 'text/html' } })).text();
			expect(page).toContain('value="15.50"');
			// The shortest notice longer than the free one, or a fee with a comma: nothing saved.
			const bad = await owner.form('/studio/settings?/movePolicy', { moveFreeHours: '24', moveMinHours: '48', moveFee: '1,5' });
			expect(bad.status).toBe(422);
			expect(await studioRow()).toMatchObject({ moveFreeHours: 120, moveMinHours: 24, moveFee: 1550 });
			const artistTry = await artist.form('/studio/settings?/movePolicy', {
				moveFreeHours: '1',
				moveMinHours: '0',
				moveFee: '0'
			});
			expect(artistTry.status).not.toBe(200);
			expect((await studioRow()).moveFreeHours).toBe(120);
		} finally {
			await setPolicy(168, 48, 0);
		}
	});
});

/** Makes sure the demo engineer has a feed address (the /plan page's action). */
async function engineerPlanFeed() {
	const engineer = await signedIn(DEMO.engineer);
	const [u] = await db.select().from(t.user).where(eq(t.user.email, DEMO.engineer));
	const [has] = await db.select().from(t.calendarFeed).where(eq(t.calendarFeed.userId, u!.id));
	if (!has) await engineer.form('/plan?/feed', {});
}

describe('50 moves racing for one free slot', () => {
	it('lets exactly one win; the others get 409 and keep their slots', async () => {
		const rooms = ['vocal-booth', 'control-room', 'live-room'];
		const slots = [
			['09:00', '11:00'],
			['11:00', '13:00'],
			['13:00', '15:00'],
			['15:00', '17:00'],
			['17:00', '19:00'],
			['19:00', '21:00'],
			['21:00', '23:00']
		];
		const ids: string[] = [];
		const booker = await signedIn(DEMO.artist2);
		outer: for (const day of RACE_DAYS) {
			for (const room of rooms) {
				for (const [from, to] of slots) {
					if (ids.length === 50) break outer;
					const res = await booker.json('/api/studios/hollow-pine/bookings', {
						room,
						start: `${day}T${from}`,
						end: `${day}T${to}`
					});
					if (res.status === 201) ids.push(((await res.json()) as { id: string }).id);
					else await res.body?.cancel();
				}
			}
		}
		expect(ids).toHaveLength(50);
		// Confirmed with their deposits paid, as the webhook would leave them (the race is about the slot, not Stripe).
		await db.update(t.booking).set({ status: 'confirmed', holdExpiresAt: null }).where(inArray(t.booking.id, ids));
		await db.update(t.payment).set({ status: 'paid', paidAt: new Date() }).where(inArray(t.payment.bookingId, ids));

		// The slot: vocal booth, 13:00–15:00 on a day of this file nobody else takes.
		const day = DAYS[2]!;
		const target = { start: `${day}T13:00`, end: `${day}T15:00`, room: 'vocal-booth' };
		const answers = await Promise.all(ids.map((id) => move(owner, id, target)));
		const statuses = answers.map((a) => a.status);
		expect(statuses.filter((s) => s === 200)).toHaveLength(1);
		expect(statuses.filter((s) => s === 409)).toHaveLength(49);
		for (const a of answers.filter((x) => x.status === 409)) expect(a.body.error).toBe('slot_taken');

		const [room] = await db
			.select()
			.from(t.room)
			.where(and(eq(t.room.studioId, studioId), eq(t.room.slug, 'vocal-booth')));
		const onSlot = await db
			.select()
			.from(t.booking)
			.where(and(eq(t.booking.roomId, room!.id), inArray(t.booking.status, ['confirmed', 'held', 'pending'])));
		const start = answers.find((a) => a.status === 200)!.body.start as string;
		const winners = onSlot.filter((x) => x.startsAt.getTime() === Date.parse(start));
		expect(winners).toHaveLength(1);
		expect(ids).toContain(winners[0]!.id);
		const applied = await db.select().from(t.bookingMove).where(inArray(t.bookingMove.bookingId, ids));
		expect(applied.filter((m) => m.status === 'applied')).toHaveLength(1);
	});
});

// "Nobody came" over real HTTP: the app, the Stripe fake, the outbox and the mail catcher, and the
// real database. Rules checked:
// - who: the owner or an engineer of the booking's studio, as for recording the end of a session;
//   its artist 403, anyone else 404 (src/lib/server/payments/no-show.ts);
// - when: a confirmed booking once its start has passed; before, 409 not_started
//   (src/lib/domain/lifecycle.ts noShowRefusal, and the database's trigger);
// - what: status no_show with who and when, the deposit dealt with by the cancellation ladder at
//   zero notice (the demo's last rung gives nothing back; a studio whose last rung gives a quarter
//   back refunds it through Stripe, with a credit note), no final invoice, the slot kept, one note
//   to the artist with the dedupe key booking-no-show:<id>, and a second request changes nothing.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { Client, signedIn } from '../support/http';
import { APP_URL, DEMO } from '../support/env';
import { testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { moveIntoPast } from '../support/started';
import { workdaysAhead, ymdInZone } from '../support/dates';
import ical from 'node-ical';
import { expectRefused } from '../support/refusal';
import { bookAndPay, type Held } from '../support/booking';
import { joinTeam, mailTo, makeStudio, userIdOf, type TestStudio } from '../support/team';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

/** This file's days: working weekdays from 125 days ahead, tried in order. */
const DAYS = workdaysAhead(125, 30);
const SLOTS = [
	['10:00', '12:00'],
	['13:00', '15:00'],
	['16:00', '18:00']
] as const;

const euros = (minor: number) => `€${(minor / 100).toFixed(2)}`; // display only; amounts are integers

async function bookingRow(id: string) {
	const [row] = await db.select().from(t.booking).where(eq(t.booking.id, id));
	return row!;
}
const documentsOf = (id: string) => db.select().from(t.invoice).where(eq(t.invoice.bookingId, id));
const outboxOf = (id: string) =>
	db
		.select()
		.from(t.emailOutbox)
		.where(eq(t.emailOutbox.dedupeKey, `booking-no-show:${id}`));
const auditOf = (id: string) =>
	db
		.select()
		.from(t.auditLog)
		.where(and(eq(t.auditLog.entityId, id), eq(t.auditLog.action, 'booking.no_show')));

interface NoShowAnswer {
	id: string;
	status: string;
	start: string;
	room: { name: string };
	noShow: { alreadyRecorded: boolean; recordedAt: string; refund: number; retained: number; rule: string };
}

describe('recording that nobody came, at the demo studio', () => {
	let artist: Client;
	let owner: Client;
	let engineer: Client;
	let b: Held;

	beforeAll(async () => {
		artist = await signedIn(DEMO.artist);
		owner = await signedIn(DEMO.owner);
		engineer = await signedIn(DEMO.engineer);
		b = await bookAndPay(db, artist, { room: 'vocal-booth', days: DAYS, slots: SLOTS });
	});

	it('is refused before the start, by the API (409) and by the booking page, which does not offer it', async () => {
		const early = await owner.json(`/api/bookings/${b.id}/no-show`, {});
		expect(early.status).toBe(409);
		const said = (await early.json()) as { error: string; message: string };
		expect(said.error).toBe('not_started');
		expect(said.message).toMatch(/has not started/);
		const asForm = await owner.form(`/bookings/${b.id}?/noShow`, {});
		expect(asForm.status).toBe(303);
		expect(asForm.headers.get('location')).toBe(`/bookings/${b.id}?money=no-show-not_started#money`);
		expect((await bookingRow(b.id)).status).toBe('confirmed');
		expect(await owner.fetch(`/bookings/${b.id}`).then((r) => r.text())).not.toContain('data-testid="no-show"');
	});

	it('is for the owner and engineers only: the artist 403, another artist 404, the accountant 403', async () => {
		await moveIntoPast(db, b.id);
		await expectRefused(await artist.json(`/api/bookings/${b.id}/no-show`, {}), 403);
		await expectRefused(await (await signedIn(DEMO.artist2)).json(`/api/bookings/${b.id}/no-show`, {}), 404);
		await expectRefused(await (await signedIn(DEMO.accountant)).json(`/api/bookings/${b.id}/no-show`, {}), 403);
		await expectRefused(await new Client().json(`/api/bookings/${b.id}/no-show`, {}), 401, {
			code: 'unauthenticated'
		});
		expect((await bookingRow(b.id)).status).toBe('confirmed');
		// Offered on the page to those who may use it, once the start has passed; never to the artist.
		expect(await owner.fetch(`/bookings/${b.id}`).then((r) => r.text())).toContain('data-testid="no-show"');
		expect(await engineer.fetch(`/bookings/${b.id}`).then((r) => r.text())).toContain('data-testid="no-show"');
		expect(await artist.fetch(`/bookings/${b.id}`).then((r) => r.text())).not.toContain('data-testid="no-show"');
	});

	it('once the start has passed: no_show, the deposit kept, no final invoice, one note to the artist', async () => {
		const res = await engineer.json(`/api/bookings/${b.id}/no-show`, {});
		const body = (await res.json()) as NoShowAnswer;
		expect(res.status, JSON.stringify(body)).toBe(200);
		expect(body).toMatchObject({ id: b.id, status: 'no_show' });
		// The demo ladder's last rung (under 48 hours) gives nothing back.
		expect(body.noShow).toMatchObject({ alreadyRecorded: false, refund: 0, retained: b.quote.deposit });
		expect(body.noShow.rule).toMatch(/no refund of the deposit/);

		const row = await bookingRow(b.id);
		expect(row.status).toBe('no_show');
		expect(row.noShowBy).toBe(await userIdOf(db, DEMO.engineer));
		expect(row.noShowAt).toBeInstanceOf(Date);
		expect(row.actualEndsAt).toBeNull();
		// The deposit invoice stays the only document: no final invoice, no credit note.
		expect((await documentsOf(b.id)).map((d) => d.typeCode)).toEqual([386]);
		expect(await db.select().from(t.refund).where(eq(t.refund.bookingId, b.id))).toEqual([]);

		const mail = await waitFor(
			async () => (await mailTo(DEMO.artist)).find((m) => m.subject.startsWith('Nobody came') && m.text.includes(b.id)),
			'the no-show note in the mail catcher'
		);
		expect(mail.subject).toMatch(/^Nobody came: Vocal booth on \w+, \d{1,2} \w+ \d{4}, \d{2}:00–\d{2}:00$/);
		expect(mail.from[0]!.name).toBe('Hollow Pine Studio');
		expect(mail.text).toContain('we recorded that nobody came to your session at Hollow Pine Studio.');
		expect(mail.text).toContain('Room:      Vocal booth');
		expect(mail.text).toContain('(Europe/Helsinki time)');
		expect(mail.text).toContain(`Your deposit of ${euros(b.quote.deposit)} is kept`);
		expect(mail.text).toContain(`To book another session: ${APP_URL}/hollow-pine/book`);
		expect(mail.text).toContain(`${APP_URL}/bookings/${b.id}`);
		expect((await outboxOf(b.id)).map((m) => m.to)).toEqual([DEMO.artist]);
	});

	it('a second request, or the page form, changes nothing and answers with the first', async () => {
		const again = await owner.json(`/api/bookings/${b.id}/no-show`, {});
		expect(again.status).toBe(200);
		expect(((await again.json()) as NoShowAnswer).noShow.alreadyRecorded).toBe(true);
		const asForm = await owner.form(`/bookings/${b.id}?/noShow`, {});
		expect(asForm.headers.get('location')).toBe(`/bookings/${b.id}?money=no-show#money`);
		expect(await outboxOf(b.id)).toHaveLength(1);
		expect(await auditOf(b.id)).toHaveLength(1);
		expect((await bookingRow(b.id)).noShowBy).toBe(await userIdOf(db, DEMO.engineer));
	});

	it('ends the booking: no closing, no cancelling, no balance, and the page says nobody came', async () => {
		const close = await owner.json(`/api/bookings/${b.id}/close`, { actualEnd: b.end });
		expect(close.status).toBe(409);
		expect(await close.json()).toMatchObject({ error: 'not_confirmed' });
		const cancel = await owner.json(`/api/bookings/${b.id}/cancel`, {});
		expect(cancel.status).toBe(409);
		expect(((await cancel.json()) as { message: string }).message).toMatch(/^Nobody came to this session/);
		expect((await artist.json(`/api/bookings/${b.id}/pay`, { kind: 'balance' })).status).toBe(409);
		expect((await documentsOf(b.id)).map((d) => d.typeCode)).toEqual([386]);
		const page = await artist.fetch(`/bookings/${b.id}`).then((r) => r.text());
		expect(page).toContain('data-status="no_show"');
		expect(page).toContain('Nobody came');
		expect(page).not.toContain('data-testid="no-show"');
	});

	it('shows on the day plan as "Nobody came", and the engineers’ feed marks it cancelled', async () => {
		const row = await bookingRow(b.id);
		const day = ymdInZone(row.startsAt);
		const plan = (await (await engineer.fetch(`/api/studios/hollow-pine/plan?date=${day}`)).json()) as {
			rooms: { slug: string; sessions: { id: string; status: string }[] }[];
		};
		const listed = plan.rooms.flatMap((r) => r.sessions).find((s) => s.id === b.id);
		expect(listed?.status).toBe('no_show');
		const planPage = await engineer.fetch(`/plan?date=${day}`).then((r) => r.text());
		expect(planPage).toMatch(/data-testid="plan-status"[^>]*>Nobody came</);

		// The feed reaches a month back; the session was moved back a few weeks at most.
		expect(Date.now() - row.startsAt.getTime()).toBeLessThan(31 * 86_400_000);
		expect((await engineer.form('/plan?/feed', {})).status).toBe(200);
		const [feed] = await db
			.select({ token: t.calendarFeed.token })
			.from(t.calendarFeed)
			.where(eq(t.calendarFeed.userId, await userIdOf(db, DEMO.engineer)));
		const text = await fetch(`${APP_URL}/feed/${feed!.token}/sessions.ics`).then((r) => r.text());
		const event = Object.values(ical.sync.parseICS(text)).find((c): c is ical.VEvent => c?.type === 'VEVENT' && c.uid === b.id);
		expect(event?.status).toBe('CANCELLED');
		expect(event?.summary).toMatch(/\(nobody came\)$/);
	});

	it('keeps the slot: nobody can book that time again after the fact', async () => {
		const row = await bookingRow(b.id);
		// Not through the API (the time has passed) …
		const local = (d: Date) =>
			new Intl.DateTimeFormat('sv-SE', {
				timeZone: 'Europe/Helsinki',
				year: 'numeric',
				month: '2-digit',
				day: '2-digit',
				hour: '2-digit',
				minute: '2-digit'
			})
				.format(d)
				.replace(' ', 'T');
		const res = await (
			await signedIn(DEMO.artist2)
		).json('/api/studios/hollow-pine/bookings', { room: 'vocal-booth', start: local(row.startsAt), end: local(row.endsAt) });
		expect(res.status).not.toBe(201);
		// … and not by the database either: the no-show's time stays taken for the room.
		const err = await db
			.insert(t.booking)
			.values({ ...row, id: crypto.randomUUID(), reference: `NS-${crypto.randomUUID().slice(0, 8)}`, status: 'confirmed' })
			.then(
				() => null,
				(e: { cause?: unknown }) => e.cause ?? e
			);
		expect(err).toMatchObject({ code: '23P01', constraint_name: 'booking_room_no_overlap' });
	});
});

describe('recording that nobody came, where the last rung of the ladder gives something back', () => {
	let studio: TestStudio;

	beforeAll(async () => {
		studio = await makeStudio(db, `No-show Spec Loft ${crypto.randomUUID().slice(0, 6)}`);
		// Published, so an artist outside its team can book it; a quarter of the deposit back at any notice under 48 hours.
		await db
			.update(t.studio)
			.set({
				published: true,
				cancellation: [
					{ minNoticeHours: 48, refundBp: 10_000 },
					{ minNoticeHours: 0, refundBp: 2500 }
				]
			})
			.where(eq(t.studio.id, studio.id));
		await joinTeam(db, studio.id, await userIdOf(db, DEMO.engineer), 'engineer');
	});

	it('refunds that part through Stripe, with a credit note and still no final invoice', async () => {
		const artist = await signedIn(DEMO.artist2);
		const b = await bookAndPay(db, artist, { room: studio.roomSlug, studio: studio.slug, days: DAYS, slots: SLOTS });
		await moveIntoPast(db, b.id);
		const engineer = await signedIn(DEMO.engineer);
		// The demo studio's owner is nobody at this studio: an artist here, and not this booking's.
		await expectRefused(await (await signedIn(DEMO.owner)).json(`/api/bookings/${b.id}/no-show`, {}), 404);

		const res = await engineer.json(`/api/bookings/${b.id}/no-show`, {});
		const body = (await res.json()) as NoShowAnswer;
		expect(res.status, JSON.stringify(body)).toBe(200);
		const quarter = Math.round(b.quote.deposit / 4); // a quarter of the deposit, rounded half-up to the cent
		expect(body.noShow.refund).toBe(quarter);
		expect(body.noShow.retained).toBe(b.quote.deposit - quarter);
		expect(body.noShow.rule).toMatch(/^Under 48 hours' notice: 25 % of the deposit refunded$/);

		const refund = await waitFor(async () => {
			const [r] = await db.select().from(t.refund).where(eq(t.refund.bookingId, b.id));
			return r?.status === 'succeeded' ? r : null;
		}, 'the refund went through');
		expect(refund.amount).toBe(quarter);
		const docs = await waitFor(async () => {
			const d = await documentsOf(b.id);
			return d.some((x) => x.typeCode === 381) ? d : null;
		}, 'the credit note');
		expect(docs.map((d) => d.typeCode).sort()).toEqual([381, 386]);
		const credit = docs.find((d) => d.typeCode === 381)!;
		expect(credit.gross + credit.rounding).toBe(quarter);

		const mail = await waitFor(
			async () => (await mailTo(DEMO.artist2)).find((m) => m.subject.startsWith('Nobody came') && m.text.includes(b.id)),
			'the no-show note'
		);
		expect(mail.text).toContain(`${euros(quarter)} goes back to the card you paid with`);
		expect(mail.text).toContain(`The studio keeps ${euros(b.quote.deposit - quarter)}.`);
		expect(mail.text).toContain(`${APP_URL}/${studio.slug}/book`);

		// A double request sends no second refund.
		expect(((await (await engineer.json(`/api/bookings/${b.id}/no-show`, {})).json()) as NoShowAnswer).noShow).toMatchObject({
			alreadyRecorded: true,
			refund: quarter
		});
		const counted = await db
			.select({ n: sql<number>`count(*)::int` })
			.from(t.refund)
			.where(eq(t.refund.bookingId, b.id));
		expect(counted).toEqual([{ n: 1 }]);
	});
});

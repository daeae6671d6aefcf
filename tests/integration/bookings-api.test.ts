// Quotes, availability and holds over real HTTP against the production build and PostgreSQL.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, inArray, sql } from 'drizzle-orm';
import { Client, signedIn } from '../support/http';
import { DEMO } from '../support/env';
import { clearDays, studioIdOf, testDb } from '../support/db';
import { addDays, nextDstChange, studioInstant, studioIso, studioToday, TZ, weekdayAhead, workdaysAhead } from '../support/dates';
import { expectRefused, expectRefusedPage } from '../support/refusal';
import { waitFor } from '../support/wait';
import type { ApiQuote as Quote } from '../support/booking';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

// This file owns twenty working weekdays from 61 days ahead, one test to a day (`ownDay(n)`), so no
// two tests meet on one day whatever today is; a rerun against the same database starts them clean.
const DAYS = workdaysAhead(61, 20);
const ownDay = (n: number) => DAYS[n]!;
beforeAll(() => clearDays(db, DAYS));

async function quote(body: unknown) {
	const res = await new Client().json('/api/studios/hollow-pine/quote', body);
	return { status: res.status, body: (await res.json()) as Quote & { error?: string; fields?: Record<string, string[]> } };
}

/** Helsinki wall time → the ISO 8601 instant (IANA tz database, through the app's own zone code). */
const helsinki = studioIso;

describe('POST /api/studios/hollow-pine/quote', () => {
	const day = ownDay(0);

	it('prices 5 h in the live room as a half day plus one hour (demo rates)', async () => {
		// 160.00 (half day, 4 h) + 45.00 (1 h) = 205.00, cheaper than 5 × 45.00 = 225.00.
		const { status, body } = await quote({ room: 'live-room', start: `${day}T10:00`, end: `${day}T15:00` });
		expect(status).toBe(200);
		expect(body.total).toBe(20500);
		expect(body.lines.map((l) => l.amount)).toEqual([16000, 4500]);
		// Deposit: 30 % of 205.00 = 61.50, rounded up to whole euros = 62.00 (≥ 50.00 minimum).
		expect(body.deposit).toBe(6200);
		expect(body.deposit + body.balance).toBe(body.total);
	});

	it('prices 7 h 30 min as one full day, and adds the engineer from their own rates', async () => {
		// Full day 300.00 < half day + 3.5 h = 160.00 + 157.50 = 317.50. Engineer full day 230.00.
		const { body } = await quote({ room: 'live-room', start: `${day}T09:00`, end: `${day}T16:30`, engineer: true });
		expect(body.total).toBe(30000 + 23000);
	});

	it('holds the EN 16931 totals rules on the quote (BR-CO-10, -13, -14, -15, -16, -17)', async () => {
		const { body } = await quote({ room: 'vocal-booth', start: `${day}T16:00`, end: `${day}T20:30`, engineer: true });
		const lineNets = body.lines.reduce((s, l) => s + l.net, 0);
		expect(lineNets).toBe(body.net); // BR-CO-10 (and BR-CO-13: no document allowances or charges)
		expect(body.vat.reduce((s, v) => s + v.amount, 0)).toBe(body.vatTotal); // BR-CO-14
		expect(body.net + body.vatTotal).toBe(body.gross); // BR-CO-15
		expect(body.gross + body.rounding).toBe(body.total); // BR-CO-16, nothing prepaid
		// BR-CO-17: category VAT = base × rate / 100, rounded half-up to 2 decimals.
		for (const v of body.vat) expect(v.amount).toBe(Math.round((v.base * Number(v.ratePercent)) / 100));
		// Prices include VAT: the gross equals the sum of the advertised line amounts.
		expect(body.total).toBe(body.lines.reduce((s, l) => s + l.amount, 0));
	});

	it.each([
		[{ room: 'attic', start: `${day}T10:00`, end: `${day}T12:00` }, 'room'],
		[{ room: 'live-room', start: `${day}T12:00`, end: `${day}T10:00` }, 'end'],
		[{ room: 'live-room', start: `${day}T10:00`, end: `${day}T11:00` }, 'end'],
		[{ room: 'live-room', start: `${day}T10:15`, end: `${day}T12:15` }, 'start'],
		[{ room: 'live-room', start: `${day}T07:00`, end: `${day}T10:00` }, 'start'],
		[{ room: 'live-room', start: 'tomorrow', end: `${day}T12:00` }, 'start'],
		[{ room: 'live-room', start: helsinki(weekdayAhead(0), '23:00'), end: helsinki(weekdayAhead(0), '23:00') }, 'end'],
		[{ room: 'live-room', start: `${weekdayAhead(400)}T10:00`, end: `${weekdayAhead(400)}T12:00` }, 'start'],
		[{ room: 'live-room', start: `${day}T10:00`, end: `${day}T12:00`, gear: ['00000000-0000-4000-8000-000000000000'] }, 'gear'],
		[{ room: 'live-room', start: `${day}T10:00`, end: `${day}T12:00`, engineer: 'yes' }, 'engineer']
	])('answers 422 with a message on the field for %o', async (body, field) => {
		const res = await quote(body);
		expect(res.status).toBe(422);
		expect(res.body.error).toBe('invalid');
		expect(res.body.fields?.[field]?.[0]).toMatch(/\w+/);
	});

	it('refuses less than the minimum notice', async () => {
		// Two open hours (09:00–23:00) that start within the 24 hours of notice, at least an hour
		// from now: today's or tomorrow's, whatever the hour of the run.
		const now = Date.now();
		const today = studioToday(now);
		const starts = [today, addDays(today, 1)].flatMap((d) =>
			['09:00', '11:00', '13:00', '15:00', '17:00', '19:00', '21:00'].map((h) => studioInstant(d, h))
		);
		const start = starts.find((ms) => ms - now >= 3_600_000 && ms - now <= 22 * 3_600_000)!;
		const res = await quote({
			room: 'live-room',
			start: new Date(start).toISOString(),
			end: new Date(start + 2 * 3_600_000).toISOString()
		});
		expect(res.status).toBe(422);
		expect(res.body.fields?.start?.join(' ')).toMatch(/notice/i);
		expect(Object.keys(res.body.fields ?? {})).toEqual(['start']);
	});

	it('never answers 500, whatever the body', async () => {
		// Not JSON at all: invalid_json; JSON that is not a booking request: invalid, with its fields.
		const cases: [string, string][] = [
			['', 'invalid_json'],
			['{"room":', 'invalid_json'],
			['null', 'invalid'],
			['[]', 'invalid'],
			['{"room":{}}', 'invalid'],
			['{"start":1e400}', 'invalid'],
			['"x"', 'invalid'],
			['{"gear":"all"}', 'invalid']
		];
		for (const [body, error] of cases) {
			const res = await new Client().fetch('/api/studios/hollow-pine/quote', {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body
			});
			const answer = (await res.json()) as { error: string; message: string };
			expect(res.status, body).toBe(422);
			expect(answer.error, body).toBe(error);
			expect(answer.message).toMatch(/\w/);
		}
		// A body that is not sent as JSON.
		const form = await new Client().fetch('/api/studios/hollow-pine/quote', { method: 'POST', body: 'room=live-room' });
		expect(form.status).toBe(415);
		expect(((await form.json()) as { error: string }).error).toBe('unsupported_media_type');
	});

	it('answers 422 at once for a time far off or a booking without end, instead of walking the calendar', async () => {
		const cases: [unknown, string][] = [
			[{ room: 'live-room', start: `${day}T10:00`, end: '9999-12-31T10:00:00Z' }, 'end'],
			[{ room: 'live-room', start: '0001-01-01T10:00:00Z', end: `${day}T12:00` }, 'start'],
			[{ room: 'live-room', start: '0001-01-01T10:00:00Z', end: '9999-12-31T10:00:00Z' }, 'start'],
			[{ room: 'live-room', start: '9999-12-30T10:00:00Z', end: '9999-12-31T10:00:00Z' }, 'start']
		];
		for (const [body, field] of cases) {
			const res = await quote(body);
			expect(res.status).toBe(422);
			expect(res.body.fields?.[field]?.[0]).toMatch(/\w+/);
		}
	});

	it('refuses more than 72 h even when the studio is open round the clock (was a 500 past 366 days)', async () => {
		const [studio] = await db.select().from(t.studio);
		await db.update(t.studio).set({
			horizonDays: 900,
			openingHours: [1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, openMinute: 0, closeMinute: 1440 }))
		});
		try {
			const later = (days: number) => new Date(Date.parse(helsinki(day, '10:00')) + days * 86_400_000).toISOString();
			const long = await quote({ room: 'live-room', start: helsinki(day, '10:00'), end: later(400) });
			expect(long.status).toBe(422);
			expect(long.body.fields?.end?.[0]).toContain('at most 72 h');
			const weekend = await quote({ room: 'live-room', start: helsinki(day, '10:00'), end: later(3) });
			expect(weekend.status).toBe(200);
		} finally {
			await db.update(t.studio).set({ horizonDays: studio!.horizonDays, openingHours: studio!.openingHours });
		}
	});

	it('refuses a blackout day', async () => {
		const closed = ownDay(5);
		const [row] = await db
			.insert(t.blackout)
			.values({ studioId: await studioIdOf(db), startsOn: closed, endsOn: closed, reason: 'Roof repairs' })
			.returning();
		try {
			const res = await quote({ room: 'live-room', start: `${closed}T10:00`, end: `${closed}T12:00` });
			expect(res.status).toBe(422);
			expect(res.body.fields?.start?.join(' ')).toContain('closed');
		} finally {
			await db.delete(t.blackout).where(eq(t.blackout.id, row!.id));
		}
	});
});

describe('GET /api/studios/hollow-pine/availability', () => {
	it('shows open hours, a booking plus its turnaround as busy, and no names', async () => {
		const day = ownDay(1);
		const artist = await signedIn(DEMO.artist);
		const made = await artist.json('/api/studios/hollow-pine/bookings', {
			room: 'control-room',
			start: `${day}T10:00`,
			end: `${day}T14:00`,
			project: 'Secret demo'
		});
		expect(made.status).toBe(201);
		const res = await new Client().fetch(`/api/studios/hollow-pine/availability?room=control-room&from=${day}&to=${day}`);
		expect(res.status).toBe(200);
		expect(res.headers.get('cache-control')).toContain('max-age');
		const text = await res.text();
		expect(text).not.toContain('Secret demo');
		expect(text).not.toContain('Noa');
		const body = JSON.parse(text) as {
			timeZone: string;
			busy: { start: string; end: string }[];
			open: { start: string; end: string }[];
		};
		expect(body.timeZone).toBe(TZ);
		// Busy: the booking and its 30-minute turnaround (demo policy), 10:00–14:30 local.
		expect(body.busy.map((b) => [Date.parse(b.start), Date.parse(b.end)])).toEqual([
			[Date.parse(helsinki(day, '10:00')), Date.parse(helsinki(day, '14:30'))]
		]);
		// Open: 09:00–10:00 is shorter than the 2 h minimum (and a new booking's own turnaround
		// must end by 10:00), so only 14:30–23:00 remains.
		expect(body.open.map((o) => [Date.parse(o.start), Date.parse(o.end)])).toEqual([
			[Date.parse(helsinki(day, '14:30')), Date.parse(helsinki(day, '23:00'))]
		]);
		// Offsets as in the IANA database: +02:00 in winter, +03:00 in summer.
		expect(body.open[0]!.start).toMatch(/\+0[23]:00$/);
	});

	it('shows a blackout day as closed with no open time', async () => {
		const closed = ownDay(6);
		const [row] = await db
			.insert(t.blackout)
			.values({ studioId: await studioIdOf(db), startsOn: closed, endsOn: closed, reason: 'Family day' })
			.returning();
		try {
			const res = await new Client().fetch(`/api/studios/hollow-pine/availability?room=live-room&from=${closed}&to=${closed}`);
			const body = (await res.json()) as { open: unknown[]; closed: { date: string; reason: string }[] };
			expect(body.open).toEqual([]);
			expect(body.closed).toEqual([{ date: closed, reason: 'Family day' }]);
		} finally {
			await db.delete(t.blackout).where(eq(t.blackout.id, row!.id));
		}
	});

	it('clips today by the minimum notice of 24 hours', async () => {
		const today = studioToday();
		const asked = Date.now();
		const res = await new Client().fetch(
			`/api/studios/hollow-pine/availability?room=live-room&from=${today}&to=${addDays(today, 3)}`
		);
		const body = (await res.json()) as { open: { start: string }[] };
		expect(body.open.length).toBeGreaterThan(0);
		// The server's now is no earlier than `asked`.
		for (const o of body.open) expect(Date.parse(o.start)).toBeGreaterThanOrEqual(asked + 24 * 3600_000);
	});

	it('bills real hours across the next daylight-saving change (Directive 2000/84/EC; IANA tz via @date-fns/tz)', async () => {
		const change = nextDstChange(2);
		// The studio opens 09:00–23:00: on a 23 h or 25 h day those are still 14 real hours, since the
		// change happens at 03:00/04:00 local time, outside opening hours.
		const [studio] = await db.select().from(t.studio);
		const horizonNeeded = Math.ceil((Date.parse(change.ymd) - Date.now()) / 86_400_000) + 2;
		if (horizonNeeded > studio!.horizonDays) await db.update(t.studio).set({ horizonDays: horizonNeeded });
		try {
			const res = await new Client().fetch(
				`/api/studios/hollow-pine/availability?room=vocal-booth&from=${change.ymd}&to=${change.ymd}`
			);
			const body = (await res.json()) as { open: { start: string; end: string }[] };
			expect(change.hours === 23 || change.hours === 25).toBe(true);
			expect(body.open).toHaveLength(1);
			const [o] = body.open;
			expect(Date.parse(o!.start)).toBe(Date.parse(helsinki(change.ymd, '09:00')));
			expect((Date.parse(o!.end) - Date.parse(o!.start)) / 3_600_000).toBe(14);
			// The offset after the change: +03:00 after the spring change, +02:00 after the autumn one.
			expect(o!.start.endsWith(change.hours === 23 ? '+03:00' : '+02:00')).toBe(true);
		} finally {
			await db.update(t.studio).set({ horizonDays: studio!.horizonDays });
		}
	});

	it.each([
		['room=attic&from=2027-01-01&to=2027-01-02', 'room'],
		['room=live-room&from=2027-01-05&to=2027-01-01', 'to'],
		['room=live-room&from=2027-01-01&to=2027-06-01', 'to'],
		['room=live-room&from=yesterday&to=2027-01-01', 'from'],
		['from=2027-01-01&to=2027-01-02', 'room'],
		// Real calendar dates only: Date.parse would read 2027-02-31 as 3 March (ISO 8601).
		['room=live-room&from=2027-02-31&to=2027-03-02', 'from'],
		['room=live-room&from=2027-02-01&to=2027-02-29', 'to'],
		['room=live-room&from=2027-13-01&to=2027-13-02', 'from']
	])('answers 422 for %s', async (query, field) => {
		const res = await new Client().fetch(`/api/studios/hollow-pine/availability?${query}`);
		expect(res.status).toBe(422);
		const body = (await res.json()) as { fields: Record<string, string[]> };
		expect(body.fields[field]).toBeDefined();
	});
});

describe('the booking page', () => {
	it('says plainly that a date in the address is not on the calendar (was a 500)', async () => {
		const res = await new Client().fetch('/hollow-pine/book?room=live-room&date=2027-02-31&start=10:00', {
			headers: { accept: 'text/html' }
		});
		expect(res.status).toBe(200);
		const html = await res.text();
		expect(html).toContain('There is no 2027-02-31 on the calendar');
	});
});

describe('POST /api/bookings', () => {
	it('needs a signed-in person (401)', async () => {
		const day = ownDay(12);
		const res = await new Client().json('/api/studios/hollow-pine/bookings', {
			room: 'live-room',
			start: `${day}T10:00`,
			end: `${day}T12:00`
		});
		await expectRefused(res, 401);
		const [{ n } = { n: -1 }] = await db
			.select({ n: sql<number>`count(*)::int` })
			.from(t.booking)
			.where(sql`(${t.booking.startsAt} at time zone 'Europe/Helsinki')::date = ${day}::date`);
		expect(n).toBe(0);
	});

	it('makes a hold priced by the server, ignoring price, status and artist in the body (OWASP ASVS 15.3.3)', async () => {
		const day = ownDay(2);
		const artist = await signedIn(DEMO.artist);
		const res = await artist.json('/api/studios/hollow-pine/bookings', {
			room: 'live-room',
			start: `${day}T10:00`,
			end: `${day}T14:00`,
			total: 1,
			deposit: 0,
			status: 'confirmed',
			artistId: 'someone-else',
			holdExpiresAt: '2099-01-01T00:00:00Z'
		});
		expect(res.status).toBe(201);
		const body = (await res.json()) as { id: string; status: string; holdExpiresAt: string; quote: Quote };
		expect(body.status).toBe('held');
		expect(body.quote.total).toBe(16000);
		const holdMs = Date.parse(body.holdExpiresAt) - Date.now();
		expect(holdMs).toBeGreaterThan(25 * 60_000);
		expect(holdMs).toBeLessThanOrEqual(30 * 60_000);
		const [row] = await db.select().from(t.booking).where(eq(t.booking.id, body.id));
		const [me] = await db.select().from(t.user).where(eq(t.user.email, DEMO.artist));
		expect(row).toMatchObject({ status: 'held', total: 16000, deposit: 5000, artistId: me!.id });
		// The stored quote is a snapshot: changing the rate card later does not alter it.
		await db.update(t.room).set({ halfDay: 99900 }).where(eq(t.room.slug, 'live-room'));
		try {
			const again = await artist.fetch(`/api/bookings/${body.id}`);
			expect(((await again.json()) as { total: number }).total).toBe(16000);
		} finally {
			await db.update(t.room).set({ halfDay: 16000 }).where(eq(t.room.slug, 'live-room'));
		}
	});

	it('answers 409 for a taken slot and offers the nearest free starts', async () => {
		const day = ownDay(3);
		const a = await signedIn(DEMO.artist);
		const b = await signedIn(DEMO.artist2);
		expect(
			(await a.json('/api/studios/hollow-pine/bookings', { room: 'vocal-booth', start: `${day}T12:00`, end: `${day}T16:00` }))
				.status
		).toBe(201);
		const res = await b.json('/api/studios/hollow-pine/bookings', {
			room: 'vocal-booth',
			start: `${day}T13:00`,
			end: `${day}T15:00`
		});
		expect(res.status).toBe(409);
		const body = (await res.json()) as { error: string; taken: string; message: string; nearestStarts: string[] };
		expect(body).toMatchObject({ error: 'slot_taken', taken: 'room' });
		expect(body.nearestStarts.length).toBeGreaterThan(0);
		// The first offer after 16:00 is 16:30 (after the 30-minute turnaround); 09:00–11:00 fits before it too.
		const offered = body.nearestStarts.map((s) => Date.parse(s));
		expect(offered).toContain(Date.parse(helsinki(day, '16:30')));
		expect(offered).toContain(Date.parse(helsinki(day, '09:00')));
	});

	it('answers 409 taken: engineer with nearby starts where the engineer is free too', async () => {
		const day = ownDay(15);
		const engineers = await db
			.select()
			.from(t.member)
			.where(and(eq(t.member.organizationId, await studioIdOf(db)), eq(t.member.role, 'engineer')));
		expect(engineers).toHaveLength(1); // the seed's one engineer
		const a = await signedIn(DEMO.artist);
		const b = await signedIn(DEMO.artist2);
		expect(
			(
				await a.json('/api/studios/hollow-pine/bookings', {
					room: 'live-room',
					start: `${day}T10:00`,
					end: `${day}T14:00`,
					engineer: true
				})
			).status
		).toBe(201);
		const res = await b.json('/api/studios/hollow-pine/bookings', {
			room: 'vocal-booth',
			start: `${day}T10:00`,
			end: `${day}T14:00`,
			engineer: true
		});
		expect(res.status).toBe(409);
		const body = (await res.json()) as { taken: string; nearestStarts: string[] };
		expect(body.taken).toBe('engineer');
		// The engineer is busy 10:00–14:30 (turnaround included); the booth is free all day.
		const offered = body.nearestStarts.map((s) => Date.parse(s));
		expect(offered.length).toBeGreaterThan(0);
		expect(offered).toContain(Date.parse(helsinki(day, '14:30')));
		for (const s of offered)
			expect(s + 4.5 * 3600_000 <= Date.parse(helsinki(day, '10:00')) || s >= Date.parse(helsinki(day, '14:30'))).toBe(true);
		// An offered start really books.
		expect(
			(
				await b.json('/api/studios/hollow-pine/bookings', {
					room: 'vocal-booth',
					start: helsinki(day, '14:30'),
					end: helsinki(day, '18:30'),
					engineer: true
				})
			).status
		).toBe(201);
	});

	it('answers 409 taken: gear with nearby starts where the gear is free too', async () => {
		const day = ownDay(18);
		const [gear] = await db
			.select()
			.from(t.gearItem)
			.where(and(eq(t.gearItem.hireable, true), eq(t.gearItem.active, true)))
			.limit(1);
		const a = await signedIn(DEMO.artist);
		const b = await signedIn(DEMO.artist2);
		expect(
			(
				await a.json('/api/studios/hollow-pine/bookings', {
					room: 'live-room',
					start: `${day}T10:00`,
					end: `${day}T14:00`,
					gear: [gear!.id]
				})
			).status
		).toBe(201);
		const res = await b.json('/api/studios/hollow-pine/bookings', {
			room: 'control-room',
			start: `${day}T11:00`,
			end: `${day}T15:00`,
			gear: [gear!.id]
		});
		expect(res.status).toBe(409);
		const body = (await res.json()) as { taken: string; nearestStarts: string[] };
		expect(body.taken).toBe('gear');
		const offered = body.nearestStarts.map((s) => Date.parse(s));
		expect(offered).toContain(Date.parse(helsinki(day, '14:30')));
		for (const s of offered)
			expect(s + 4.5 * 3600_000 <= Date.parse(helsinki(day, '10:00')) || s >= Date.parse(helsinki(day, '14:30'))).toBe(true);
	});

	it('on the page of a hold that ran out, offers the same time again while free, and the calendar once taken', async () => {
		const day = ownDay(8);
		const [gear] = await db
			.select()
			.from(t.gearItem)
			.where(and(eq(t.gearItem.hireable, true), eq(t.gearItem.active, true)))
			.limit(1);
		const a = await signedIn(DEMO.artist);
		const made = await a.json('/api/studios/hollow-pine/bookings', {
			room: 'control-room',
			start: `${day}T10:00`,
			end: `${day}T14:00`,
			gear: [gear!.id],
			project: 'Night tapes'
		});
		expect(made.status).toBe(201);
		const { id } = (await made.json()) as { id: string };
		await db
			.update(t.booking)
			.set({ status: 'expired', holdExpiresAt: new Date(Date.now() - 60_000) })
			.where(eq(t.booking.id, id));
		const hrefs = async () => {
			const res = await a.fetch(`/bookings/${id}`, { headers: { accept: 'text/html' } });
			expect(res.status).toBe(200);
			const html = (await res.text()).replaceAll('&amp;', '&');
			return { html, free: /data-free="(true|false)"/.exec(html)?.[1] };
		};
		const before = await hrefs();
		expect(before.html).toContain('hold ran out');
		expect(before.free).toBe('true');
		const link = /href="(\/hollow-pine\/book\?[^"]*)"/.exec(before.html)?.[1];
		const q = new URL(link!, 'http://x').searchParams;
		expect(Object.fromEntries(q)).toMatchObject({
			room: 'control-room',
			date: day,
			start: '10:00',
			kind: 'half',
			engineer: '0',
			gear: gear!.id,
			project: 'Night tapes'
		});

		// Someone else takes the time: the page says so and points at that day on the calendar.
		const b = await signedIn(DEMO.artist2);
		expect(
			(await b.json('/api/studios/hollow-pine/bookings', { room: 'control-room', start: `${day}T12:00`, end: `${day}T14:00` }))
				.status
		).toBe(201);
		const after = await hrefs();
		expect(after.free).toBe('false');
		expect(after.html).toContain(`href="/hollow-pine/calendar?room=control-room&date=${day}"`);
		expect(after.html).not.toMatch(/href="\/hollow-pine\/book\?/);
	});

	it('frees an expired hold without anyone visiting a page', async () => {
		const day = ownDay(4);
		const a = await signedIn(DEMO.artist);
		const res = await a.json('/api/studios/hollow-pine/bookings', {
			room: 'control-room',
			start: `${day}T10:00`,
			end: `${day}T12:00`
		});
		const { id } = (await res.json()) as { id: string };
		await db
			.update(t.booking)
			.set({ holdExpiresAt: new Date(Date.now() - 1000) })
			.where(eq(t.booking.id, id));
		// The app's background job runs every 15 s.
		const status = await waitFor(async () => {
			const [row] = await db.select().from(t.booking).where(eq(t.booking.id, id));
			return row!.status === 'held' ? undefined : row!.status;
		}, 'the hold job');
		expect(status).toBe('expired');
		const b = await signedIn(DEMO.artist2);
		expect(
			(await b.json('/api/studios/hollow-pine/bookings', { room: 'control-room', start: `${day}T10:00`, end: `${day}T12:00` }))
				.status
		).toBe(201);
	});
});

describe('scoping (OWASP ASVS 8.2.2)', () => {
	it('artist2 cannot read, list or cancel artist’s booking; the owner and engineer can read it', async () => {
		const day = ownDay(7);
		const a = await signedIn(DEMO.artist);
		const made = await a.json('/api/studios/hollow-pine/bookings', {
			room: 'live-room',
			start: `${day}T18:00`,
			end: `${day}T20:00`
		});
		const { id } = (await made.json()) as { id: string };
		const b = await signedIn(DEMO.artist2);
		await expectRefused(await b.fetch(`/api/bookings/${id}`), 404, { secrets: [id, 'Noa'] });
		const list = (await (await b.fetch('/api/bookings')).json()) as { bookings: { id: string }[] };
		expect(list.bookings.map((x) => x.id)).not.toContain(id);
		await expectRefused(await b.json(`/api/bookings/${id}/cancel`, {}), 404, { secrets: [id] });
		const page = await b.fetch(`/bookings/${id}`, { headers: { accept: 'text/html' } });
		await expectRefusedPage(page, 404, /This page is not here/, ['Noa', `${day}`]);
		const [row] = await db.select().from(t.booking).where(eq(t.booking.id, id));
		expect(row!.status).toBe('held');
		for (const who of [DEMO.owner, DEMO.engineer]) {
			expect((await (await signedIn(who)).fetch(`/api/bookings/${id}`)).status).toBe(200);
		}
		await expectRefused(await (await signedIn(DEMO.accountant)).fetch(`/api/bookings/${id}`), 404, { secrets: [id, 'Noa'] });
		expect((await a.fetch(`/api/bookings/${id}`)).status).toBe(200);
	});
});

describe('races (OWASP ASVS 2.3.4, 15.4.2)', () => {
	const artists: Client[] = [];

	beforeAll(async () => {
		const stamp = Date.now();
		for (let i = 0; i < 50; i++) {
			const c = await new Client().signUp(`Racer ${i}`, `racer-${stamp}-${i}@slateroom.test`, 'racing-password-123');
			expect(c.cookieHeader()).toContain('session_token');
			artists.push(c);
		}
	});

	async function race(bodies: unknown[]) {
		const results = await Promise.all(bodies.map((body, i) => artists[i]!.json('/api/studios/hollow-pine/bookings', body)));
		return results.map((r) => r.status);
	}

	it('50 artists, one slot: exactly one 201, 49 409s, no 5xx, one row', async () => {
		const day = ownDay(9);
		const body = { room: 'live-room', start: `${day}T10:00`, end: `${day}T14:00` };
		const statuses = await race(Array.from({ length: 50 }, () => body));
		expect(statuses.filter((s) => s === 201)).toHaveLength(1);
		expect(statuses.filter((s) => s === 409)).toHaveLength(49);
		const [live] = await db.select().from(t.room).where(eq(t.room.slug, 'live-room'));
		const rows = await db
			.select({ n: sql<number>`count(*)::int` })
			.from(t.booking)
			.where(
				and(
					eq(t.booking.roomId, live!.id),
					inArray(t.booking.status, ['held', 'pending', 'confirmed']),
					sql`${t.booking.startsAt}::date = ${day}::date`
				)
			);
		expect(rows[0]!.n).toBe(1);
	});

	it('one engineer across two rooms: exactly one 201', async () => {
		const day = ownDay(10);
		const statuses = await race(
			Array.from({ length: 50 }, (_, i) => ({
				room: i % 2 ? 'live-room' : 'vocal-booth',
				start: `${day}T10:00`,
				end: `${day}T14:00`,
				engineer: true
			}))
		);
		expect(statuses.filter((s) => s === 201)).toHaveLength(1);
		expect(statuses.filter((s) => s === 409)).toHaveLength(49);
		const rows = await db
			.select({ n: sql<number>`count(*)::int` })
			.from(t.booking)
			.where(
				and(
					sql`${t.booking.engineerId} is not null`,
					inArray(t.booking.status, ['held', 'pending', 'confirmed']),
					sql`(${t.booking.startsAt} at time zone 'Europe/Helsinki')::date = ${day}::date`
				)
			);
		expect(rows[0]!.n).toBe(1);
	});

	it('one piece of gear across two rooms: exactly one 201', async () => {
		const day = ownDay(11);
		const [gear] = await db.select().from(t.gearItem).where(eq(t.gearItem.hireable, true)).limit(1);
		const statuses = await race(
			Array.from({ length: 50 }, (_, i) => ({
				room: i % 2 ? 'live-room' : 'control-room',
				start: `${day}T10:00`,
				end: `${day}T14:00`,
				gear: [gear!.id]
			}))
		);
		// One booking per room could take the room; only one of them may take the gear.
		expect(statuses.filter((s) => s === 201)).toHaveLength(1);
		expect(statuses.filter((s) => s === 409)).toHaveLength(49);
		const rows = await db
			.select({ n: sql<number>`count(*)::int` })
			.from(t.bookingGear)
			.innerJoin(t.booking, eq(t.booking.id, t.bookingGear.bookingId))
			.where(
				and(
					eq(t.bookingGear.gearItemId, gear!.id),
					inArray(t.booking.status, ['held', 'pending', 'confirmed']),
					sql`(${t.booking.startsAt} at time zone 'Europe/Helsinki')::date = ${day}::date`
				)
			);
		expect(rows[0]!.n).toBe(1);
		const bookings = await db
			.select({ n: sql<number>`count(*)::int` })
			.from(t.booking)
			.where(
				and(
					inArray(t.booking.status, ['held', 'pending', 'confirmed']),
					sql`(${t.booking.startsAt} at time zone 'Europe/Helsinki')::date = ${day}::date`
				)
			);
		expect(bookings[0]!.n).toBe(1);
	});
});

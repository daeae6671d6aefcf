// Bad input answers 4xx with the usual body (or the page's form errors) and writes nothing: NUL
// characters that PostgreSQL cannot store, dates at the edges of the calendar or not on it, ids
// that are not UUIDs, bodies that are not what their content type says, and signed webhook bodies
// that are not events. Each of these was a 500 before.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHmac } from 'node:crypto';
import { count, eq } from 'drizzle-orm';
import { Client, signedIn } from '../support/http';
import { APP_URL, DEMO } from '../support/env';
import { testDb } from '../support/db';
import { weekdayAhead } from '../support/dates';
import * as t from '../../src/lib/server/db/schema';
import { user } from '../../src/lib/server/db/auth-schema';

const { db, client } = testDb();
afterAll(() => client.end());

const NUL = '\u0000';
const WEBHOOK_SECRET = process.env.STRIPE_WEBHOOK_SECRET ?? 'whsec_slateroom_test';
// A weekday this file alone uses (well past the other files' days, inside the booking horizon).
const DAY = weekdayAhead(165);

let owner: Client;
let engineer: Client;
let artist: Client;
let artistBooking: typeof t.booking.$inferSelect;
let liveRoom: typeof t.room.$inferSelect;

beforeAll(async () => {
	[owner, engineer, artist] = await Promise.all([signedIn(DEMO.owner), signedIn(DEMO.engineer), signedIn(DEMO.artist)]);
	const [a] = await db.select().from(user).where(eq(user.email, DEMO.artist));
	const [b] = await db.select().from(t.booking).where(eq(t.booking.artistId, a!.id)).limit(1);
	const [r] = await db.select().from(t.room).where(eq(t.room.slug, 'live-room'));
	if (!b || !r) throw new Error('the demo artist’s booking or the live room is missing');
	artistBooking = b;
	liveRoom = r;
});

async function apiError(res: Response, status: number) {
	expect(res.status).toBe(status);
	const body = (await res.json()) as { error: string; message: string; fields?: Record<string, string[]> };
	expect(typeof body.error).toBe('string');
	expect(body.message.length).toBeGreaterThan(0);
	return body;
}

const rows = async (table: typeof t.booking | typeof t.gearItem | typeof t.blackout | typeof t.surchargeRule) =>
	(await db.select({ n: count() }).from(table))[0]!.n;

describe('a NUL character (U+0000) in a text field or parameter', () => {
	it('is refused by the quote, signed in or not', async () => {
		for (const who of [new Client(), artist]) {
			const res = await who.json('/api/studios/hollow-pine/quote', {
				room: `live-room${NUL}`,
				start: `${DAY}T10:00`,
				end: `${DAY}T12:00`
			});
			const body = await apiError(res, 422);
			expect(body.fields?.room?.join(' ')).toMatch(/control characters/);
		}
	});

	it('is refused in the availability query', async () => {
		const res = await new Client().fetch(`/api/studios/hollow-pine/availability?room=live-room%00&from=${DAY}&to=${DAY}`);
		expect((await apiError(res, 422)).fields?.room).toBeTruthy();
	});

	it('is refused by POST /api/bookings, and no booking is made', async () => {
		const before = await rows(t.booking);
		for (const body of [
			{ room: 'live-room', start: `${DAY}T10:00`, end: `${DAY}T12:00`, project: `demo${NUL}` },
			{ room: 'live-room', start: `${DAY}T10:00`, end: `${DAY}T12:00`, notes: `bring${NUL}strings` },
			{ room: 'live-room', start: `${DAY}T10:00${NUL}`, end: `${DAY}T12:00` }
		]) {
			await apiError(await artist.json('/api/studios/hollow-pine/bookings', body), 422);
		}
		expect(await rows(t.booking)).toBe(before);
	});

	it('is refused by the booking form posted without JavaScript, with the form errors shown', async () => {
		const before = await rows(t.booking);
		const res = await artist.form('/hollow-pine/book', {
			room: 'live-room',
			kind: 'half',
			date: DAY,
			start: '10:00',
			notes: `a${NUL}b`
		});
		expect(res.status).toBe(422);
		expect(await res.text()).toContain('Remove the control characters');
		expect(await rows(t.booking)).toBe(before);
	});

	it('is refused on a recall sheet, and the sheet is not saved', async () => {
		const before = await db.select().from(t.recallSheet).where(eq(t.recallSheet.bookingId, artistBooking.id));
		for (const fields of <Record<string, string>[]>[
			{ bookingId: artistBooking.id, rows: '1', 'source-0': `Kick${NUL}`, 'microphone-0': 'dynamic' },
			{ bookingId: artistBooking.id, rows: '0', notes: `notes${NUL}` }
		]) {
			const res = await engineer.form('/plan?/recall', fields);
			expect(res.status).toBe(422);
			expect(await res.text()).toContain('Remove the control characters');
		}
		expect(await db.select().from(t.recallSheet).where(eq(t.recallSheet.bookingId, artistBooking.id))).toEqual(before);
	});

	it('is refused by every owner form, and nothing changes', async () => {
		const gearBefore = await rows(t.gearItem);
		const blackoutsBefore = await rows(t.blackout);
		const surchargesBefore = await rows(t.surchargeRule);
		const posts: [string, Record<string, string>][] = [
			[
				'/studio/rooms?/room',
				{ id: liveRoom.id, name: `Live${NUL}room`, description: '', hourly: '45', halfDay: '160', fullDay: '290', active: 'true' }
			],
			[
				'/studio/rooms?/room',
				{
					id: liveRoom.id,
					name: 'Live room',
					description: `big${NUL}`,
					hourly: '45',
					halfDay: '160',
					fullDay: '290',
					active: 'true'
				}
			],
			['/studio/rooms?/gear', { name: `Ribbon${NUL} microphone`, category: 'microphone', hireFee: '10' }],
			['/studio/rooms?/gear', { name: 'Ribbon microphone', category: `mic${NUL}`, hireFee: '10', notes: 'x', caution: 'y' }],
			['/studio/rooms?/gear', { name: 'Ribbon microphone', category: 'microphone', hireFee: '10', caution: `hot${NUL}` }],
			['/studio/rooms?/blackout', { startsOn: '2099-01-05', reason: `closed${NUL}` }],
			['/studio/settings?/surcharge', { label: `Late${NUL}`, kind: 'holiday', percent: '10', active: 'true' }],
			['/studio/people?/setRole', { userId: `x${NUL}`, role: 'engineer' }]
		];
		for (const [path, fields] of posts) {
			const res = await owner.form(path, fields);
			expect(res.status, path).toBe(422);
		}
		const [room] = await db.select().from(t.room).where(eq(t.room.id, liveRoom.id));
		expect(room).toEqual(liveRoom);
		expect(await rows(t.gearItem)).toBe(gearBefore);
		expect(await rows(t.blackout)).toBe(blackoutsBefore);
		expect(await rows(t.surchargeRule)).toBe(surchargesBefore);
	});
});

describe('dates at the edges of the calendar, and dates that do not exist', () => {
	it('are refused by availability', async () => {
		for (const [from, to] of [
			['0001-01-01', '0001-01-02'],
			['9999-12-30', '9999-12-31']
		]) {
			const body = await apiError(
				await new Client().fetch(`/api/studios/hollow-pine/availability?room=live-room&from=${from}&to=${to}`),
				422
			);
			expect(body.fields?.from?.[0]).toMatch(/between 2000 and 2100/);
		}
	});

	it('are said so on the booking page', async () => {
		for (const date of ['0001-01-01', '9999-12-31']) {
			const res = await new Client().fetch(`/hollow-pine/book?room=live-room&date=${date}`);
			expect(res.status).toBe(200);
			expect(await res.text()).toContain('Choose a date between 2000 and 2100');
		}
	});

	it('are refused by the day plan, page and API, and so is a day that does not exist', async () => {
		for (const date of ['0001-01-01', '9999-12-31']) {
			expect((await engineer.fetch(`/plan?date=${date}`)).status).toBe(400);
			expect((await apiError(await engineer.fetch(`/api/studios/hollow-pine/plan?date=${date}`), 422)).fields?.date).toBeTruthy();
		}
		// It used to answer 200 with an empty plan, as if 30 February existed.
		const body = await apiError(await engineer.fetch('/api/studios/hollow-pine/plan?date=2027-02-30'), 422);
		expect(body.fields?.date?.[0]).toContain('There is no 2027-02-30');
		expect((await engineer.fetch('/plan?date=2027-02-30')).status).toBe(400);
	});

	it('are left out of the owner’s bookings filter and said so beside the field', async () => {
		const res = await owner.fetch('/studio/bookings?from=0001-01-01&to=9999-12-31');
		expect(res.status).toBe(200);
		const html = await res.text();
		expect(html).toContain('id="filter-from-error"');
		expect(html).toContain('id="filter-to-error"');
		expect(html).toContain('Choose a date between 2000 and 2100');
	});

	it('are refused for a blackout', async () => {
		const before = await rows(t.blackout);
		for (const startsOn of ['0001-01-01', '9999-12-31', '2027-02-30']) {
			expect((await owner.form('/studio/rooms?/blackout', { startsOn, reason: 'edge' })).status).toBe(422);
		}
		expect(await rows(t.blackout)).toBe(before);
	});
});

describe('the booking form posted without JavaScript with a date or start that is not one', () => {
	it('shows the form errors instead of failing to render the weekday', async () => {
		const before = await rows(t.booking);
		for (const fields of <Record<string, string>[]>[
			{ room: 'live-room', kind: 'half', date: 'hello', start: '10:00' },
			{ room: 'live-room', kind: 'half', date: DAY, start: 'hello' },
			{ room: 'live-room', kind: 'hourly', hours: '2', date: '2027-02-30', start: '25:99' }
		]) {
			const res = await artist.form('/hollow-pine/book', fields);
			expect(res.status).toBe(422);
			const html = await res.text();
			expect(html).toMatch(/Choose a date|not on the calendar|Choose a start time/);
		}
		expect(await rows(t.booking)).toBe(before);
	});
});

describe('an id that is not a UUID', () => {
	it('is a 404 on cancel, close, no-show and cancel/retry, as on every other [id] route', async () => {
		for (const [who, path] of [
			[artist, '/api/bookings/not-a-uuid/cancel'],
			[engineer, '/api/bookings/not-a-uuid/close'],
			[engineer, '/api/bookings/not-a-uuid/no-show'],
			[owner, '/api/bookings/not-a-uuid/cancel/retry'],
			[owner, '/api/bookings/1234/cancel'],
			[artist, `/api/bookings/${artistBooking.id}x/cancel`]
		] as const) {
			const res = await who.fetch(path, {
				method: 'POST',
				headers: { 'content-type': 'application/json', accept: 'application/json' },
				body: '{}'
			});
			expect(res.status, path).toBe(404);
		}
	});
});

describe('a multipart content type over a body that is not multipart', () => {
	it('is a 400 on cancel, close, pay and retry, and the booking is unchanged', async () => {
		for (const [who, path] of [
			[artist, `/api/bookings/${artistBooking.id}/cancel`],
			[engineer, `/api/bookings/${artistBooking.id}/close`],
			[artist, `/api/bookings/${artistBooking.id}/pay`],
			[owner, `/api/bookings/${artistBooking.id}/cancel/retry`]
		] as const) {
			const res = await who.fetch(path, {
				method: 'POST',
				headers: { 'content-type': 'multipart/form-data; boundary=slateroom', accept: 'application/json' },
				body: 'this is not multipart'
			});
			await apiError(res, 400);
		}
		const [after] = await db.select().from(t.booking).where(eq(t.booking.id, artistBooking.id));
		expect(after!.status).toBe(artistBooking.status);
		expect(after!.cancelledAt).toEqual(artistBooking.cancelledAt);
	});
});

describe('the Stripe webhook', () => {
	function signed(body: string, at = Math.floor(Date.now() / 1000)) {
		const v1 = createHmac('sha256', WEBHOOK_SECRET).update(`${at}.${body}`).digest('hex');
		return fetch(`${APP_URL}/api/stripe/webhook`, {
			method: 'POST',
			headers: { 'content-type': 'application/json', 'stripe-signature': `t=${at},v1=${v1}` },
			body
		});
	}
	const recorded = async (id: string) => (await db.select().from(t.stripeEvent).where(eq(t.stripeEvent.id, id))).length;
	const eventId = () => `evt_bad_input_${crypto.randomUUID().replaceAll('-', '')}`;

	it('refuses a correctly signed body that is not JSON', async () => {
		expect((await apiError(await signed('this is not JSON {'), 400)).error).toBe('invalid_event');
	});

	it('refuses a correctly signed event without data.object, and records nothing', async () => {
		for (const shape of [{}, { data: {} }, { data: { object: null } }, { data: { object: 'cs_1' } }, { data: [] }]) {
			const id = eventId();
			const res = await signed(JSON.stringify({ id, type: 'checkout.session.completed', created: 1, ...shape }));
			expect((await apiError(res, 400)).error).toBe('invalid_event');
			expect(await recorded(id)).toBe(0);
		}
		expect((await apiError(await signed('[1,2,3]'), 400)).error).toBe('invalid_event');
		// A session or refund event is acted on by its object's id: one without is refused too.
		for (const type of ['checkout.session.completed', 'refund.updated']) {
			for (const object of [{}, { id: 42 }, { id: `cs_${NUL}` }]) {
				const id = eventId();
				expect((await apiError(await signed(JSON.stringify({ id, type, data: { object } })), 400)).error).toBe('invalid_event');
				expect(await recorded(id)).toBe(0);
			}
		}
	});

	it('refuses an event signed more than five minutes in the future, as one more than five minutes old', async () => {
		const now = Math.floor(Date.now() / 1000);
		for (const at of [now + 6 * 60, now - 6 * 60]) {
			const id = eventId();
			const res = await signed(JSON.stringify({ id, type: 'customer.created', data: { object: { id: 'cus_1' } } }), at);
			expect((await apiError(res, 400)).error).toBe('bad_signature');
			expect(await recorded(id)).toBe(0);
		}
		// A clock a minute apart is within the tolerance, either way.
		for (const at of [now + 60, now - 60]) {
			const id = eventId();
			const res = await signed(JSON.stringify({ id, type: 'customer.created', data: { object: { id: 'cus_1' } } }), at);
			expect(res.status).toBe(200);
			expect(await recorded(id)).toBe(1);
		}
	});
});

describe('a stranger sent to sign in from a very long address', () => {
	it('gets a short Location header: sign-in would not follow a `next` over 500 characters anyway', async () => {
		const res = await new Client().fetch(`/studio/bookings?q=${'%00'.repeat(5000)}`);
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe(`/sign-in?next=${encodeURIComponent('/studio/bookings')}`);
	});
});

describe('an address whose path does not decode', () => {
	// A broken UTF-8 sequence and a stray "%" (RFC 3986 §2.1: "%" starts an escape of two hex digits).
	const broken = ['%E0%A4%A', '%ZZ', '%C0%80', 'a%'];

	it('is a 400 on every zone and in the API, for visitors and the signed-in, and the server stays up', async () => {
		const visitor = new Client();
		const cases: [Client, string, string][] = [];
		for (const bad of broken) {
			cases.push(
				[visitor, 'GET', `/uploads/${bad}`],
				[visitor, 'GET', `/studio/${bad}`],
				[visitor, 'GET', `/bookings/${bad}/x`],
				[visitor, 'POST', `/api/bookings/${bad}/cancel`],
				[artist, 'GET', `/bookings/${bad}`],
				[artist, 'POST', `/api/bookings/${bad}/cancel`],
				[engineer, 'POST', `/studio/${bad}`],
				[owner, 'GET', `/hollow-pine/calendar/${bad}`]
			);
		}
		for (const [who, method, path] of cases) {
			const res = await who.fetch(path, { method });
			expect(res.status, `${method} ${path}`).toBe(400);
			if (path.startsWith('/api/')) await apiError(res, 400);
			else expect(await res.text()).toMatch(/does not decode/);
			expect((await fetch(`${APP_URL}/api/health`)).status, `the server answers after ${method} ${path}`).toBe(200);
		}
	});
});

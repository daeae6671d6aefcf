// A request that changes something through the API must come from the studio's own pages: the
// artist's cookie riding along on a POST from another origin (another port, a sibling subdomain)
// changes nothing.
import { afterAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { signedIn, type Client } from '../support/http';
import { APP_URL, DEMO } from '../support/env';
import { DEMO_STUDIO_SLUG, testDb } from '../support/db';
import { weekdayAhead } from '../support/dates';
import { holdAt } from '../support/booking';
import { expectRefused } from '../support/refusal';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

const appPort = new URL(APP_URL).port;
const otherPort = String(Number(appPort) + 1);

/** Holds the vocal booth on `day` from `from` to `to`; gives the booking's id. */
const hold = async (c: Client, day: string, from: string, to: string) => (await holdAt(c, 'vocal-booth', day, from, to)).id;

async function statusOf(id: string) {
	const [row] = await db.select({ status: t.booking.status }).from(t.booking).where(eq(t.booking.id, id));
	return row?.status;
}

/** A body-less POST carrying the artist's cookie and whatever origin headers a browser would send. */
function forged(c: Client, path: string, headers: Record<string, string>) {
	return fetch(APP_URL + path, { method: 'POST', headers: { cookie: c.cookieHeader(), ...headers }, redirect: 'manual' });
}

describe('state-changing API requests come from the app’s own origin', () => {
	const day = weekdayAhead(137);

	it.each([
		['another port of the same host', { origin: `http://127.0.0.1:${otherPort}` }],
		['a sibling name of the same site', { origin: `http://files.localhost:${appPort}` }],
		['the opaque origin of a sandboxed frame', { origin: 'null' }],
		['fetch metadata saying cross-site', { 'sec-fetch-site': 'cross-site' }],
		['fetch metadata saying same-site', { 'sec-fetch-site': 'same-site' }]
	])('a cancel from %s is refused with 403 and the booking stays', async (_what, headers) => {
		const artist = await signedIn(DEMO.artist);
		const id = await hold(artist, day, '10:00', '12:00');
		const res = await forged(artist, `/api/bookings/${id}/cancel`, headers);
		await expectRefused(res, 403);
		expect(await statusOf(id)).toBe('held');
		// The same artist from the app's own page cancels it.
		const own = await artist.json(`/api/bookings/${id}/cancel`, {});
		expect(own.status).toBe(200);
		expect(await statusOf(id)).toBe('cancelled');
	});

	it('a request from the app’s own origin, or from a program that sends neither header, goes through', async () => {
		const artist = await signedIn(DEMO.artist);
		const first = await hold(artist, day, '12:30', '14:30');
		expect((await forged(artist, `/api/bookings/${first}/cancel`, { 'sec-fetch-site': 'same-origin' })).status).toBe(200);
		expect(await statusOf(first)).toBe('cancelled');
		const second = await hold(artist, day, '15:00', '17:00');
		// curl with the cookie: no Origin, no Sec-Fetch-Site (see src/lib/domain/request-origin.ts).
		expect((await forged(artist, `/api/bookings/${second}/cancel`, {})).status).toBe(200);
		expect(await statusOf(second)).toBe('cancelled');
	});

	it('a hold at a studio’s address from another origin is refused and nothing is held', async () => {
		const artist = await signedIn(DEMO.artist);
		const count = async () => (await db.select({ id: t.booking.id }).from(t.booking)).length;
		const before = await count();
		const res = await fetch(`${APP_URL}/api/studios/${DEMO_STUDIO_SLUG}/bookings`, {
			method: 'POST',
			headers: { cookie: artist.cookieHeader(), origin: `http://127.0.0.1:${otherPort}`, 'content-type': 'application/json' },
			body: JSON.stringify({ room: 'vocal-booth', start: `${day}T17:30`, end: `${day}T19:30` }),
			redirect: 'manual'
		});
		await expectRefused(res, 403);
		expect(await count()).toBe(before);
	});

	it('sign-out from another origin is refused too; reading stays open', async () => {
		const artist = await signedIn(DEMO.artist2);
		const out = await forged(artist, '/api/auth/sign-out', { origin: `http://127.0.0.1:${otherPort}` });
		expect(out.status).toBe(403);
		const session = await fetch(`${APP_URL}/api/auth/get-session`, {
			headers: { cookie: artist.cookieHeader(), origin: `http://127.0.0.1:${otherPort}` }
		});
		expect(session.status).toBe(200);
		expect(((await session.json()) as { user: { email: string } }).user.email).toBe(DEMO.artist2);
	});
});

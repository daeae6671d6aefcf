// The foundation over real HTTP against the production build: health, rooms, sign-in, roles.
import { afterAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { Client, signedIn } from '../support/http';
import { DEMO, DEMO_PASSWORD } from '../support/env';
import { expectRefusedPage } from '../support/refusal';
import { testDb } from '../support/db';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

describe('public endpoints', () => {
	it('GET /api/health answers ok with the database up', async () => {
		const res = await new Client().fetch('/api/health');
		expect(res.status).toBe(200);
		expect(await res.json()).toEqual({ ok: true, db: 'up' });
	});

	it('GET /api/studios/hollow-pine/rooms lists the demo rooms with their rates in minor units', async () => {
		const res = await new Client().fetch('/api/studios/hollow-pine/rooms');
		expect(res.status).toBe(200);
		const body = (await res.json()) as { currency: string; rooms: { slug: string; rates: Record<string, number> }[] };
		expect(body.currency).toBe('EUR');
		// The demo studio (src/lib/domain/demo.ts): live room 45/160/300, vocal booth 30/100/190, control room 40/140/260.
		expect(Object.fromEntries(body.rooms.map((r) => [r.slug, r.rates]))).toEqual({
			'live-room': { hourly: 4500, halfDay: 16000, fullDay: 30000 },
			'vocal-booth': { hourly: 3000, halfDay: 10000, fullDay: 19000 },
			'control-room': { hourly: 4000, halfDay: 14000, fullDay: 26000 }
		});
	});

	it('unknown routes give 404, not a stack trace', async () => {
		const res = await new Client().fetch('/no-such-page', { headers: { accept: 'text/html' } });
		expect(res.status).toBe(404);
		const html = await res.text();
		expect(html).toContain('This page is not here');
		expect(html).not.toMatch(/at .*\.js:\d+/);
	});
});

describe('sign-in', () => {
	it.each(Object.entries(DEMO))('%s signs in through the form and lands on their home', async (role, email) => {
		const c = new Client();
		const res = await c.form('/sign-in', { email, password: DEMO_PASSWORD });
		expect(res.status).toBe(303);
		const home = { owner: '/studio', engineer: '/plan', accountant: '/accounts', artist: '/bookings', artist2: '/bookings' }[
			role
		];
		expect(res.headers.get('location')).toBe(home);
		const page = await c.fetch(home!);
		expect(page.status).toBe(200);
	});

	it('gives one message for a wrong password and an unknown e-mail', async () => {
		const wrong = await new Client().form('/sign-in', { email: DEMO.owner, password: 'not-the-password' });
		const unknown = await new Client().form('/sign-in', { email: 'nobody@slateroom.test', password: 'not-the-password' });
		expect(wrong.status).toBe(400);
		expect(unknown.status).toBe(400);
		const a = await wrong.text();
		const b = await unknown.text();
		expect(a).toContain('That e-mail and password do not match');
		expect(b).toContain('That e-mail and password do not match');
	});

	it('answers 429 after repeated failures on one account (OWASP ASVS 6.3.1)', async () => {
		const email = `target-${Date.now()}@slateroom.test`;
		const statuses: number[] = [];
		for (let i = 0; i < 7; i++)
			statuses.push((await new Client().form('/sign-in', { email, password: 'wrong-password-1' })).status);
		expect(statuses.slice(0, 5)).toEqual([400, 400, 400, 400, 400]);
		expect(statuses.slice(5)).toEqual([429, 429]);
	});

	it('sign-out ends the session on the server (OWASP ASVS 7.4.1)', async () => {
		const c = await signedIn(DEMO.artist);
		const cookie = c.cookieHeader();
		expect((await c.fetch('/bookings')).status).toBe(200);
		expect((await c.form('/sign-out', {})).status).toBe(303);
		// The old cookie, replayed, no longer opens anything.
		const replay = await fetch(`${c.base}/bookings`, { headers: { cookie }, redirect: 'manual' });
		expect(replay.status).toBe(303);
		expect(replay.headers.get('location')).toContain('/sign-in');
	});
});

describe('sign-up', () => {
	it('makes an artist in no studio team, whatever role the body asks for (OWASP ASVS 15.3.3)', async () => {
		const email = `new-${Date.now()}@slateroom.test`;
		const res = await new Client().form('/sign-up', { name: 'Test Band', email, password: 'a-long-enough-pass', role: 'owner' });
		expect(res.status).toBe(303);
		// better-auth's own sign-up route is closed (tests/integration/auth-hardening.test.ts).
		const viaApi = await new Client().json('/api/auth/sign-up/email', {
			name: 'Other Band',
			email: `api-${email}`,
			password: 'a-long-enough-pass',
			role: 'owner'
		});
		expect(viaApi.status).toBe(404);
		const rows = await db.select({ id: t.user.id, email: t.user.email }).from(t.user).where(eq(t.user.email, email));
		expect(rows.map((r) => r.email)).toEqual([email]);
		// Roles belong to a studio's team: a new account is in none.
		expect(await db.select().from(t.member).where(eq(t.member.userId, rows[0]!.id))).toEqual([]);
		const apiRows = await db
			.select({ id: t.user.id })
			.from(t.user)
			.where(eq(t.user.email, `api-${email}`));
		expect(apiRows).toEqual([]);
	});

	it('refuses a weak password and a duplicate address with clear words', async () => {
		const weak = await new Client().form('/sign-up', {
			name: 'Weak',
			email: `weak-${Date.now()}@slateroom.test`,
			password: 'short'
		});
		expect(weak.status).toBe(400);
		expect(await weak.text()).toContain('at least 10 characters');
		const dup = await new Client().form('/sign-up', { name: 'Dup', email: DEMO.artist, password: 'a-long-enough-pass' });
		expect(dup.status).toBe(400);
		expect(await dup.text()).toContain('We could not create an account with these details');
	});
});

describe('role zones', () => {
	const pages: [string, string, number][] = [
		// [page, who, expected status]
		['/studio', DEMO.artist, 403],
		['/studio', DEMO.engineer, 403],
		['/studio', DEMO.accountant, 403],
		['/studio', DEMO.owner, 200],
		['/studio/people', DEMO.owner, 200],
		['/plan', DEMO.engineer, 200],
		['/plan', DEMO.artist, 403],
		['/plan', DEMO.accountant, 403],
		['/accounts', DEMO.accountant, 200],
		['/accounts', DEMO.artist, 403],
		['/accounts', DEMO.engineer, 403],
		['/bookings', DEMO.artist, 200]
	];
	it.each(pages)('%s as %s gives %i', async (path, who, status) => {
		const c = await signedIn(who);
		const res = await c.fetch(path, { headers: { accept: 'text/html' } });
		const html = await res.text();
		expect(res.status).toBe(status);
		// A refused page is the site's own 403 page and says why; an allowed one is not.
		if (status === 403) expect(html).toContain('Not part of your role');
		else expect(html).not.toContain('Not part of your role');
	});

	it('sends an anonymous visitor to sign-in with the page to come back to', async () => {
		const res = await new Client().fetch('/bookings');
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe('/sign-in?next=%2Fbookings');
	});

	it('lets only the owner change roles, and never through sign-up', async () => {
		const artist = await signedIn(DEMO.artist);
		const [target] = await db.select().from(t.user).where(eq(t.user.email, DEMO.artist2));
		const res = await artist.form('/studio/people?/setRole', { userId: target!.id, role: 'owner' });
		await expectRefusedPage(res, 403, /Your role does not give access/, [DEMO.artist2, target!.id]);
		expect(await db.select().from(t.member).where(eq(t.member.userId, target!.id))).toEqual([]);
	});
});

// Setting up a studio over the API: anyone signed in creates one and becomes its owner, the short
// name is checked by its rule (src/lib/domain/studio-slug.ts) and is one studio's only, the zone
// must exist (IANA tz database) and the currency be one Stripe charges in. Only published studios
// are listed.
import { afterAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { testDb } from '../support/db';
import { Client } from '../support/http';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

async function newPerson(name: string): Promise<Client> {
	return new Client().signUp(name, `setup-${crypto.randomUUID()}@slateroom.test`, 'a-long-enough-pass');
}

const studio = (over: Record<string, unknown> = {}) => ({
	name: 'Birch Loft Recorders',
	slug: 'birch-loft',
	country: 'SE',
	timeZone: 'Europe/Stockholm',
	currency: 'SEK',
	...over
});

async function fields(res: Response): Promise<Record<string, string[]>> {
	const body = (await res.json()) as { error: string; fields?: Record<string, string[]> };
	return body.fields ?? {};
}

async function listed(): Promise<{ slug: string; name: string; country: string; currency: string; timeZone: string }[]> {
	const res = await new Client().json('/api/studios');
	expect(res.status).toBe(200);
	return ((await res.json()) as { studios: [] }).studios;
}

describe('POST /api/studios', () => {
	it('asks a stranger to sign in (401) and makes nothing', async () => {
		const res = await new Client().json('/api/studios', studio({ slug: 'stranger-studio' }));
		expect(res.status).toBe(401);
		expect(await db.select().from(t.organization).where(eq(t.organization.slug, 'stranger-studio'))).toEqual([]);
	});

	it('creates the studio (201) with its creator as owner, working in it, unpublished and unlisted', async () => {
		const maker = await newPerson('Ilona Birch');
		const res = await maker.json('/api/studios', studio());
		expect(res.status).toBe(201);
		expect(res.headers.get('location')).toBe('/birch-loft');
		expect(await res.json()).toEqual({
			slug: 'birch-loft',
			name: 'Birch Loft Recorders',
			country: 'SE',
			currency: 'SEK',
			timeZone: 'Europe/Stockholm'
		});

		const [org] = await db.select().from(t.organization).where(eq(t.organization.slug, 'birch-loft'));
		const [row] = await db.select().from(t.studio).where(eq(t.studio.id, org!.id));
		expect(row).toMatchObject({ published: false, currency: 'SEK', timeZone: 'Europe/Stockholm', referencePrefix: 'BLR' });
		expect(row!.openingHours.length).toBeGreaterThan(0);
		expect(row!.cancellation.length).toBeGreaterThan(0);

		const session = (await (await maker.fetch('/api/auth/get-session')).json()) as {
			user: { id: string };
			session: { id: string };
		};
		const members = await db.select().from(t.member).where(eq(t.member.organizationId, org!.id));
		expect(members.map((m) => [m.userId, m.role])).toEqual([[session.user.id, 'owner']]);
		const [s] = await db.select().from(t.session).where(eq(t.session.id, session.session.id));
		expect(s!.activeOrganizationId).toBe(org!.id);

		// Half set up: not listed.
		expect((await listed()).map((x) => x.slug)).not.toContain('birch-loft');
	});

	it('refuses a short name already taken (409), also when two people ask for the same one at once', async () => {
		const [first, second, third] = await Promise.all([newPerson('Taker One'), newPerson('Taker Two'), newPerson('Taker Three')]);
		const taken = await first.json('/api/studios', studio({ slug: 'hollow-pine' }));
		expect(taken.status).toBe(409);
		expect((await fields(taken)).slug).toEqual(['That short name is taken; choose another.']);

		const answers = await Promise.all([
			second.json('/api/studios', studio({ slug: 'twin-race', name: 'Twin Race One' })),
			third.json('/api/studios', studio({ slug: 'twin-race', name: 'Twin Race Two' }))
		]);
		expect(answers.map((r) => r.status).sort()).toEqual([201, 409]);
		const orgs = await db.select().from(t.organization).where(eq(t.organization.slug, 'twin-race'));
		expect(orgs).toHaveLength(1);
		// The one refused made nothing: no second team, no second settings row.
		const owners = await db
			.select()
			.from(t.member)
			.where(and(eq(t.member.organizationId, orgs[0]!.id), eq(t.member.role, 'owner')));
		expect(owners).toHaveLength(1);
	});

	it.each([
		['a reserved short name', { slug: 'admin' }, 'slug', 'That short name is kept for Slateroom itself; choose another.'],
		['a malformed short name', { slug: 'Bad--Name' }, 'slug', 'Use lower-case letters only.'],
		['a short name too short', { slug: 'ab' }, 'slug', 'Use at least 3 characters.'],
		[
			'a zone that does not exist',
			{ timeZone: 'Europe/Atlantis' },
			'timeZone',
			'Choose a time zone from the list, such as Europe/Helsinki.'
		],
		['an unknown currency', { currency: 'ZZZ' }, 'currency', 'Choose a currency by its three-letter ISO 4217 code, such as EUR.'],
		[
			'a currency Stripe cannot charge',
			{ currency: 'VES' },
			'currency',
			'Card payments cannot be taken in VES; choose another currency.'
		],
		['a missing name', { name: undefined }, 'name', 'Name the studio.'],
		[
			'an unknown country',
			{ country: 'QQ' },
			'country',
			'We cannot set up a studio in that country yet: we have no calendar of its public holidays.'
		]
	])('refuses %s with a field error (422) and makes nothing', async (_what, change, field, message) => {
		const maker = await newPerson('Refused Maker');
		const slug = `refused-${crypto.randomUUID().slice(0, 8)}`;
		const body = studio({ slug, ...change });
		const res = await maker.json('/api/studios', body);
		expect(res.status).toBe(422);
		expect((await fields(res))[field]).toEqual([message]);
		expect(await db.select().from(t.organization).where(eq(t.organization.slug, body.slug))).toEqual([]);
	});
});

describe('GET /api/studios', () => {
	it('lists only published studios, by name, with what anyone may know of them', async () => {
		const maker = await newPerson('Lister');
		expect((await maker.json('/api/studios', studio({ slug: 'aspen-attic', name: 'Aspen Attic' }))).status).toBe(201);
		const before = await listed();
		expect(before.map((s) => s.slug)).not.toContain('aspen-attic');
		expect(before.find((s) => s.slug === 'hollow-pine')).toEqual({
			slug: 'hollow-pine',
			name: 'Hollow Pine Studio',
			country: 'FI',
			currency: 'EUR',
			timeZone: 'Europe/Helsinki'
		});

		const [org] = await db.select().from(t.organization).where(eq(t.organization.slug, 'aspen-attic'));
		await db.update(t.studio).set({ published: true }).where(eq(t.studio.id, org!.id));
		try {
			const after = await listed();
			expect(after.map((s) => s.slug)).toContain('aspen-attic');
			const slugs = after.map((s) => s.slug);
			expect(slugs.indexOf('aspen-attic')).toBeLessThan(slugs.indexOf('hollow-pine'));
			expect(Object.keys(after[0]!).sort()).toEqual(['country', 'currency', 'name', 'slug', 'timeZone']);
		} finally {
			await db.update(t.studio).set({ published: false }).where(eq(t.studio.id, org!.id));
		}
	});
});

describe('the set-up and publishing', () => {
	it('publishes only with an address and a bookable room, then lists the studio until its owner unpublishes it', async () => {
		const owner = await newPerson('Publishing Owner');
		expect((await owner.json('/api/studios', studio({ slug: 'larch-cellar', name: 'Larch Cellar' }))).status).toBe(201);
		const slugs = async () => (await listed()).map((s) => s.slug);

		// Nothing yet: the set-up says what is missing and publishes nothing.
		const early = await owner.form('/studio/setup?/publish', { confirm: 'publish' });
		expect(early.status).toBe(422);
		const earlyPage = await (await owner.fetch('/studio/setup?step=review')).text();
		expect(earlyPage).toContain('at least one bookable room');
		expect(await slugs()).not.toContain('larch-cellar');

		// A bad address keeps what was typed and saves nothing.
		const bad = await owner.form('/studio/setup?/address', {
			street: 'Lärkgatan 3',
			postalCode: '11122',
			city: '',
			country: 'SE',
			vatId: ''
		});
		expect(bad.status).toBe(422);
		const badPage = await bad.text();
		expect(badPage).toContain('Give the town or city.');
		expect(badPage).toContain('Lärkgatan 3');

		const saved = await owner.form('/studio/setup?/address', {
			street: 'Lärkgatan 3',
			postalCode: '11122',
			city: 'Stockholm',
			country: 'SE',
			vatId: 'se556677889901'
		});
		expect(saved.status).toBe(303);
		expect(saved.headers.get('location')).toBe('/studio/setup?step=vat');
		const added = await owner.form('/studio/setup?/room', {
			id: '',
			name: 'Cellar room',
			description: '',
			hourly: '400',
			halfDay: '1400',
			fullDay: '2600',
			active: 'on'
		});
		expect(added.status).toBe(200);
		const [org] = await db.select().from(t.organization).where(eq(t.organization.slug, 'larch-cellar'));
		const [row] = await db.select().from(t.studio).where(eq(t.studio.id, org!.id));
		expect(row).toMatchObject({ street: 'Lärkgatan 3', postalCode: '11122', city: 'Stockholm', vatId: 'SE556677889901' });
		expect(row!.setupDone).toEqual(['address']);
		const rooms = await db.select().from(t.room).where(eq(t.room.studioId, org!.id));
		expect(rooms.map((r) => [r.slug, r.hourly, r.halfDay, r.fullDay, r.active])).toEqual([
			['cellar-room', 40000, 140000, 260000, true]
		]);

		// The desk shows the set-up until the studio is published.
		expect(await (await owner.fetch('/studio')).text()).toContain('Set-up: 1 of 8 done');
		// A post without the button's word changes nothing.
		expect((await owner.form('/studio/setup?/publish', {})).status).toBe(400);
		expect(await slugs()).not.toContain('larch-cellar');
		const published = await owner.form('/studio/setup?/publish', { confirm: 'publish' });
		expect(published.status).toBe(303);
		expect(await slugs()).toContain('larch-cellar');
		expect(await (await owner.fetch('/studio')).text()).not.toContain('Set-up:');

		expect((await owner.form('/studio/settings?/unpublish', {})).status).toBe(400);
		expect(await slugs()).toContain('larch-cellar');
		const unpublished = await owner.form('/studio/settings?/unpublish', { confirm: 'unpublish' });
		expect(unpublished.status).toBe(200);
		expect(await slugs()).not.toContain('larch-cellar');
	});
});

// "Get paid": a new studio's owner connects it to a Stripe account of its own on the Stripe fake
// (Connect, Standard accounts: accounts.create once, then an Account Link to onboarding), comes
// back to our return page, which reads the account and copies its state onto the studio; until the
// account can take charges the storefront says bookings open soon and every way of booking answers
// 409 `bookings_not_open` without making a hold. Only the owner reaches any of it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { testDb } from '../support/db';
import { Client, signedIn } from '../support/http';
import { DEMO, STRIPE_API_BASE } from '../support/env';
import { workdaysAhead } from '../support/dates';
import { firstFree } from '../support/slots';
import { expectRefusedPage } from '../support/refusal';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

const DAYS = workdaysAhead(30, 3);
const run = crypto.randomUUID().slice(0, 8);

interface Made {
	id: string;
	slug: string;
	owner: Client;
	roomSlug: string;
}

/** A studio of this file's own, made as a person makes one, with a room, published. */
async function newStudio(label: string): Promise<Made> {
	const owner = await new Client().signUp(`Owner ${label}`, `getpaid-${label}-${run}@slateroom.test`, 'a-long-enough-pass');
	const slug = `paid-${label}-${run}`;
	const res = await owner.json('/api/studios', {
		name: `Kiln Street Tapes ${label}`,
		slug,
		country: 'FI',
		timeZone: 'Europe/Helsinki',
		currency: 'EUR'
	});
	expect(res.status).toBe(201);
	const [org] = await db.select().from(t.organization).where(eq(t.organization.slug, slug));
	const roomSlug = `kiln-${label}`;
	await db
		.insert(t.room)
		.values({ studioId: org!.id, slug: roomSlug, name: 'Kiln room', hourly: 4000, halfDay: 14000, fullDay: 24000 });
	await db
		.update(t.studio)
		.set({ published: true, street: 'Uunikatu 3', postalCode: '33100', city: 'Tampere' })
		.where(eq(t.studio.id, org!.id));
	return { id: org!.id, slug, owner, roomSlug };
}

async function studioRow(id: string) {
	const [row] = await db.select().from(t.studio).where(eq(t.studio.id, id));
	return row!;
}

/** The fake's own record of the accounts it holds (its test control). */
async function fakeAccounts(): Promise<{ id: string; email?: string; metadata?: Record<string, string> }[]> {
	const res = await fetch(`${STRIPE_API_BASE}/_control/accounts`);
	expect(res.status).toBe(200);
	const body = (await res.json()) as unknown;
	return (
		Array.isArray(body)
			? body
			: ((body as { data?: unknown[]; accounts?: unknown[] }).data ?? (body as { accounts: unknown[] }).accounts)
	) as {
		id: string;
		email?: string;
		metadata?: Record<string, string>;
	}[];
}

async function completeOnFake(accountId: string) {
	const res = await fetch(`${STRIPE_API_BASE}/_control/accounts/${accountId}/complete`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: '{}'
	});
	expect(res.status).toBe(200);
	await res.body?.cancel();
}

const SLOTS = [
	['10:00', '14:00'],
	['15:00', '19:00']
] as const;

function tryHold(artist: Client, s: Made) {
	return firstFree<{ id: string }>(DAYS, SLOTS, async ({ start, end }) => {
		const res = await artist.json(`/api/studios/${s.slug}/bookings`, { room: s.roomSlug, start, end });
		return { status: res.status, body: () => res.json() };
	});
}

const bookingsOf = async (studioId: string) =>
	db.select({ id: t.booking.id }).from(t.booking).where(eq(t.booking.studioId, studioId));

describe('starting Get paid', () => {
	it('makes one account for the studio even when the button is pressed twice at once, and sends the owner to onboarding', async () => {
		const s = await newStudio('twice');
		const [a, b] = await Promise.all([s.owner.form('/studio/get-paid?/start', {}), s.owner.form('/studio/get-paid?/start', {})]);
		for (const res of [a, b]) {
			expect(res.status).toBe(303);
			expect(res.headers.get('location')).toMatch(new RegExp(`^${STRIPE_API_BASE}/connect/onboard/\\S+$`));
		}
		// Each press has a link of its own (a link is single-use).
		expect(a.headers.get('location')).not.toBe(b.headers.get('location'));

		const row = await studioRow(s.id);
		expect(row.stripeAccountId).toMatch(/^acct_/);
		const mine = (await fakeAccounts()).filter((x) => x.metadata?.studio_id === s.id);
		expect(mine.map((x) => x.id)).toEqual([row.stripeAccountId]);
		// Nothing is taken for granted: the studio cannot take charges until Stripe says so.
		expect(row.chargesEnabled).toBe(false);

		// A third press, later, keeps the same account.
		expect((await s.owner.form('/studio/get-paid?/start', {})).status).toBe(303);
		expect((await studioRow(s.id)).stripeAccountId).toBe(row.stripeAccountId);
	});

	it('renews a used or expired link for the existing account, and makes none without one', async () => {
		const s = await newStudio('renew');
		const none = await s.owner.fetch('/studio/get-paid/refresh');
		expect(none.status).toBe(303);
		expect(none.headers.get('location')).toBe('/studio/get-paid');
		expect((await studioRow(s.id)).stripeAccountId).toBeNull();

		await s.owner.form('/studio/get-paid?/start', {});
		const account = (await studioRow(s.id)).stripeAccountId;
		const again = await s.owner.fetch('/studio/get-paid/refresh');
		expect(again.status).toBe(303);
		expect(again.headers.get('location')).toMatch(/\/connect\/onboard\//);
		expect((await studioRow(s.id)).stripeAccountId).toBe(account);
	});
});

describe('a studio whose account cannot take charges, then can', () => {
	let s: Made;
	let artist: Client;
	beforeAll(async () => {
		s = await newStudio('opens');
		artist = await new Client().signUp('Tin Harbour', `getpaid-artist-${run}@slateroom.test`, 'a-long-enough-pass');
	});

	it('says bookings open soon, shows its rooms and rates, and refuses every booking with 409 before any hold', async () => {
		const home = await (await artist.fetch(`/${s.slug}`)).text();
		expect(home).toContain('Bookings open soon.');
		expect(home).toContain('Kiln room');
		expect(home).not.toContain('Book the kiln room');
		const rooms = await (await artist.fetch(`/${s.slug}/rooms`)).text();
		expect(rooms).toContain('Kiln room');
		expect(rooms).toContain('140.00');
		const book = await (await artist.fetch(`/${s.slug}/book`)).text();
		expect(book).toMatch(/Nothing can be held or paid\s+here until then\./);
		expect(book).not.toContain('Confirm and pay the deposit');

		const api = await artist.json(`/api/studios/${s.slug}/bookings`, {
			room: s.roomSlug,
			start: `${DAYS[0]}T10:00`,
			end: `${DAYS[0]}T14:00`
		});
		expect(api.status).toBe(409);
		expect(await api.json()).toEqual({
			error: 'bookings_not_open',
			message: expect.stringContaining('not taking bookings yet') as string
		});
		const form = await artist.form(`/${s.slug}/book`, { room: s.roomSlug, date: DAYS[0]!, start: '10:00', kind: 'half' });
		expect(form.status).toBe(409);
		expect(await form.text()).toContain('not taking bookings yet');
		expect(await bookingsOf(s.id)).toEqual([]);

		// The owner's desk says what is missing and where to go.
		const desk = await (await s.owner.fetch('/studio')).text();
		expect(desk).toContain('The studio takes no bookings yet');
		expect(desk).toContain('href="/studio/get-paid"');
	});

	it('comes back from onboarding unfinished: the return page reads the account and says what is missing', async () => {
		const start = await s.owner.form('/studio/get-paid?/start', {});
		expect(start.status).toBe(303);
		const before = await studioRow(s.id);
		expect(before.accountEventAt).toBeNull();

		const back = await s.owner.fetch('/studio/get-paid/return');
		expect(back.status).toBe(200);
		const page = await back.text();
		expect(page).toContain('Payments are not set up yet');
		// The fake's new account still needs what Stripe asks of a new one; the page says it in words.
		const after = await studioRow(s.id);
		expect(after.accountEventAt).not.toBeNull();
		const account = (await (
			await fetch(`${STRIPE_API_BASE}/v1/accounts/${after.stripeAccountId}`, {
				headers: { authorization: `Bearer ${process.env.STRIPE_SECRET_KEY ?? 'sk_test_slateroom_test'}` }
			})
		).json()) as { requirements: { currently_due: string[] } };
		expect(after.accountRequirements).toEqual(account.requirements.currently_due);
		expect(after.accountRequirements.length).toBeGreaterThan(0);
		expect(page).toContain('Stripe still needs:');
		expect(after.chargesEnabled).toBe(false);
		const desk = await (await s.owner.fetch('/studio')).text();
		expect(desk).toContain('Finish setting up payments');
	});

	it('once the account can take charges (read on the return page), takes bookings through the API and the form', async () => {
		const accountId = (await studioRow(s.id)).stripeAccountId!;
		await completeOnFake(accountId);
		const back = await (await s.owner.fetch('/studio/get-paid/return')).text();
		expect(back).toContain('Payments are set up');
		const row = await studioRow(s.id);
		expect(row).toMatchObject({ chargesEnabled: true, accountRequirements: [] });

		const home = await (await artist.fetch(`/${s.slug}`)).text();
		expect(home).not.toContain('Bookings open soon');
		expect(home).toContain('Book the kiln room');
		expect(await (await artist.fetch(`/${s.slug}/book`)).text()).toContain('Confirm and pay the deposit');
		expect(await (await s.owner.fetch('/studio')).text()).not.toContain('The studio takes no bookings yet');

		const held = await tryHold(artist, s);
		expect(held.id).toMatch(/^[0-9a-f-]{36}$/);
		expect((await bookingsOf(s.id)).map((b) => b.id)).toEqual([held.id]);
	});
});

describe('who reaches Get paid', () => {
	it('is the owner only: engineers, accountants and artists are refused and nothing is made', async () => {
		const demoId = (await db.select().from(t.organization).where(eq(t.organization.slug, 'hollow-pine')))[0]!.id;
		const accountBefore = (await studioRow(demoId)).stripeAccountId;
		for (const who of [DEMO.engineer, DEMO.accountant, DEMO.artist]) {
			const c = await signedIn(who);
			for (const path of ['/studio/get-paid', '/studio/get-paid/return']) {
				await expectRefusedPage(
					await c.fetch(path, { headers: { accept: 'text/html' } }),
					403,
					/not give access|not in a studio/i
				);
			}
			expect((await c.fetch('/studio/get-paid/refresh')).status).toBe(403);
			expect((await c.form('/studio/get-paid?/start', {})).status).toBe(403);
		}
		const visitor = await new Client().fetch('/studio/get-paid');
		expect(visitor.status).toBe(303);
		expect(visitor.headers.get('location')).toMatch(/^\/sign-in/);
		expect((await studioRow(demoId)).stripeAccountId).toBe(accountBefore);
	});
});

// Each studio's storefront and API live under its short name (/SLUG/…, /api/studios/SLUG/…). An
// unknown name, a reserved word and a studio not published yet are the same 404 to anyone outside
// its team (OWASP ASVS 8.2.2: a refusal that does not tell what exists); its team sees it. Staff
// read a studio's plan and books by its address only when they are in that studio's team, and a
// booking at one studio's address can take none of another's rooms or gear.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, inArray, sql } from 'drizzle-orm';
import { DEMO_STUDIO_SLUG, studioIdOf, testDb } from '../support/db';
import { DEMO } from '../support/env';
import { Client, signedIn } from '../support/http';
import { workdaysAhead } from '../support/dates';
import { expectRefused, expectRefusedPage } from '../support/refusal';
import * as t from '../../src/lib/server/db/schema';
import { connectStudio, settingsOf } from '../support/team';

const { db, client } = testDb();
const [DAY] = workdaysAhead(110, 1);
const NOT_FOUND_PAGE = /This page is not here/;

interface MadeStudio {
	id: string;
	slug: string;
	name: string;
	room: string;
	roomSlug: string;
	roomName: string;
	gear: string;
}
/** Not published: only its team sees it. */
let hidden: MadeStudio;
/** Published, with a team the demo staff are not in. */
let other: MadeStudio;
let hiddenOwner: Client;
let visitor: Client;
let artist: Client;

/** A studio beside the demo one: a copy of its settings, one room in use and one piece of gear for hire. */
async function makeStudio(label: string, published: boolean): Promise<MadeStudio> {
	const id = crypto.randomUUID();
	const slug = `${label}-${id.slice(0, 8)}`;
	const name = `${label[0]!.toUpperCase()}${label.slice(1)} Test Studio ${id.slice(0, 4)}`;
	await db.insert(t.organization).values({ id, name, slug });
	const [demo] = await db
		.select()
		.from(t.studio)
		.where(eq(t.studio.id, await studioIdOf(db)));
	await db.insert(t.studio).values({ ...settingsOf(demo!), id, name, published });
	await connectStudio(db, id);
	const roomSlug = `${label}-room`;
	const roomName = `${label} room ${id.slice(0, 6)}`;
	const [room] = await db
		.insert(t.room)
		.values({ studioId: id, slug: roomSlug, name: roomName, hourly: 1000, halfDay: 3000, fullDay: 5000, active: true })
		.returning();
	const [gear] = await db
		.insert(t.gearItem)
		.values({
			studioId: id,
			name: `${label} microphone`,
			category: 'microphone',
			homeRoomId: room!.id,
			hireable: true,
			hireFee: 500
		})
		.returning();
	return { id, slug, name, room: room!.id, roomSlug, roomName, gear: gear!.id };
}

beforeAll(async () => {
	hidden = await makeStudio('hidden', false);
	other = await makeStudio('other', true);
	const stamp = crypto.randomUUID().slice(0, 8);
	hiddenOwner = await new Client().signUp('Hidden Owner', `hidden-owner-${stamp}@slateroom.test`, 'hidden-owner-password');
	const [me] = await db
		.select({ id: t.user.id })
		.from(t.user)
		.where(eq(t.user.email, `hidden-owner-${stamp}@slateroom.test`));
	await db.insert(t.member).values({ id: crypto.randomUUID(), organizationId: hidden.id, userId: me!.id, role: 'owner' });
	visitor = new Client();
	artist = await signedIn(DEMO.artist);
});

afterAll(async () => {
	try {
		const ids = [hidden.id, other.id];
		await db.delete(t.booking).where(inArray(t.booking.studioId, ids));
		await db.delete(t.gearItem).where(inArray(t.gearItem.studioId, ids));
		await db.delete(t.room).where(inArray(t.room.studioId, ids));
		await db.delete(t.member).where(inArray(t.member.organizationId, ids));
		await db.delete(t.studio).where(inArray(t.studio.id, ids));
		await db.delete(t.organization).where(inArray(t.organization.id, ids));
	} finally {
		await client.end();
	}
});

const pages = (slug: string) => [`/${slug}`, `/${slug}/calendar`, `/${slug}/rooms`, `/${slug}/book`];

/** Every studio endpoint, as [method, path, body]. */
function endpoints(s: { slug: string; roomSlug: string }): [string, string, unknown][] {
	const base = `/api/studios/${s.slug}`;
	const booking = { room: s.roomSlug, start: `${DAY}T10:00`, end: `${DAY}T12:00` };
	return [
		['GET', `${base}/rooms`, undefined],
		['GET', `${base}/availability?room=${s.roomSlug}&from=${DAY}&to=${DAY}`, undefined],
		['POST', `${base}/quote`, booking],
		['POST', `${base}/bookings`, booking],
		['GET', `${base}/plan?date=${DAY}`, undefined],
		['GET', `${base}/invoices?month=${DAY!.slice(0, 7)}`, undefined],
		['GET', `${base}/invoices/export?month=${DAY!.slice(0, 7)}&format=csv`, undefined]
	];
}

const bookingCount = async () => Number((await db.execute<{ n: string }>(sql`select count(*)::text as n from booking`))[0]!.n);

describe('an address without a studio', () => {
	it.each([
		['an unknown short name', 'no-such-studio-here'],
		['a reserved word', 'admin'],
		['a reserved word that was a page', 'calendar']
	])('is a 404 for %s, on its pages and its API', async (_what, slug) => {
		for (const path of pages(slug)) await expectRefusedPage(await visitor.fetch(path), 404, NOT_FOUND_PAGE);
		const before = await bookingCount();
		for (const [method, path, body] of endpoints({ slug, roomSlug: 'live-room' })) {
			await expectRefused(await artist.json(path, body, method), 404);
		}
		expect(await bookingCount()).toBe(before);
	});

	it('the old addresses are gone: the pages are 404, and POST /api/bookings is not a way to book', async () => {
		for (const path of ['/rooms', '/calendar', '/book?room=live-room']) {
			await expectRefusedPage(await visitor.fetch(path), 404, NOT_FOUND_PAGE);
		}
		for (const path of ['/api/rooms', '/api/plan', '/api/invoices']) expect((await artist.fetch(path)).status).toBe(404);
		const before = await bookingCount();
		const res = await artist.json('/api/bookings', { room: 'live-room', start: `${DAY}T10:00`, end: `${DAY}T12:00` });
		expect(res.status).toBe(405);
		expect(await bookingCount()).toBe(before);
	});
});

describe('a studio not published yet', () => {
	it('is a 404 to a visitor and to an artist, on every page and every endpoint, and nothing is booked', async () => {
		const before = await bookingCount();
		for (const who of [visitor, artist]) {
			for (const path of pages(hidden.slug)) {
				await expectRefusedPage(await who.fetch(path), 404, NOT_FOUND_PAGE, [hidden.name, hidden.roomName]);
			}
			// The booking form's action too (it runs before any load).
			const form = await who.form(`/${hidden.slug}/book`, { room: hidden.roomSlug, kind: 'half', date: DAY!, start: '10:00' });
			expect(form.status).toBe(404);
			for (const [method, path, body] of endpoints(hidden)) {
				await expectRefused(await who.json(path, body, method), 404, { secrets: [hidden.name, hidden.roomName] });
			}
		}
		expect(await bookingCount()).toBe(before);
	});

	it('is a 404 to the staff of another studio too', async () => {
		for (const email of [DEMO.owner, DEMO.engineer, DEMO.accountant]) {
			const staff = await signedIn(email);
			await expectRefusedPage(await staff.fetch(`/${hidden.slug}`), 404, NOT_FOUND_PAGE, [hidden.name]);
			await expectRefused(await staff.fetch(`/api/studios/${hidden.slug}/plan?date=${DAY}`), 404);
			await expectRefused(await staff.fetch(`/api/studios/${hidden.slug}/invoices`), 404);
		}
	});

	it('is seen by its own team, with a banner saying only the team sees it', async () => {
		for (const path of pages(hidden.slug)) {
			const res = await hiddenOwner.fetch(path, { headers: { accept: 'text/html' } });
			const html = await res.text();
			expect(res.status, path).toBe(200);
			expect(html).toContain('data-testid="unpublished-banner"');
			expect(html).toMatch(/Not published yet:.*only your team sees this/s);
			expect(html).toContain(hidden.name);
		}
		const rooms = await hiddenOwner.fetch(`/api/studios/${hidden.slug}/rooms`);
		expect(rooms.status).toBe(200);
		expect(rooms.headers.get('cache-control')).toBe('private, no-store');
		expect(((await rooms.json()) as { rooms: { slug: string }[] }).rooms.map((r) => r.slug)).toEqual([hidden.roomSlug]);
		const plan = await hiddenOwner.fetch(`/api/studios/${hidden.slug}/plan?date=${DAY}`);
		expect(plan.status).toBe(200);
		expect(JSON.stringify(await plan.json())).toContain(hidden.roomName);
		expect((await hiddenOwner.fetch(`/api/studios/${hidden.slug}/invoices`)).status).toBe(200);
		// A published studio's storefront carries no banner.
		const demo = await (await hiddenOwner.fetch(`/${DEMO_STUDIO_SLUG}`)).text();
		expect(demo).not.toContain('data-testid="unpublished-banner"');
	});
});

describe("a studio's staff endpoints are its own team's", () => {
	it("the staff of one studio are refused another's plan and books, with nothing of it in the answer", async () => {
		const month = DAY!.slice(0, 7);
		for (const email of [DEMO.owner, DEMO.engineer, DEMO.accountant]) {
			const staff = await signedIn(email);
			for (const path of [
				`/api/studios/${other.slug}/plan?date=${DAY}`,
				`/api/studios/${other.slug}/invoices?month=${month}`,
				`/api/studios/${other.slug}/invoices/export?month=${month}&format=csv`
			]) {
				await expectRefused(await staff.fetch(path), 403, { secrets: [other.name, other.roomName, other.roomSlug] });
			}
		}
		// Their own studio's by its address, as before.
		expect((await (await signedIn(DEMO.engineer)).fetch(`/api/studios/${DEMO_STUDIO_SLUG}/plan?date=${DAY}`)).status).toBe(200);
		expect((await (await signedIn(DEMO.accountant)).fetch(`/api/studios/${DEMO_STUDIO_SLUG}/invoices`)).status).toBe(200);
	});

	it('a person in two teams reads either studio by its address, whichever they work in now', async () => {
		const [engineer] = await db.select({ id: t.user.id }).from(t.user).where(eq(t.user.email, DEMO.engineer));
		const membership = crypto.randomUUID();
		await db.insert(t.member).values({ id: membership, organizationId: other.id, userId: engineer!.id, role: 'engineer' });
		try {
			const staff = await signedIn(DEMO.engineer);
			const theirs = await staff.fetch(`/api/studios/${other.slug}/plan?date=${DAY}`);
			expect(theirs.status).toBe(200);
			expect(JSON.stringify(await theirs.json())).toContain(other.roomName);
			const demo = await staff.fetch(`/api/studios/${DEMO_STUDIO_SLUG}/plan?date=${DAY}`);
			expect(demo.status).toBe(200);
			expect(JSON.stringify(await demo.json())).not.toContain(other.roomName);
			// An engineer in both teams is still no accountant in either.
			await expectRefused(await staff.fetch(`/api/studios/${other.slug}/invoices`), 403);
		} finally {
			await db.delete(t.member).where(eq(t.member.id, membership));
		}
	});
});

describe("a booking at one studio's address", () => {
	it("can take none of another studio's rooms or gear, and inserts nothing", async () => {
		const [demoGear] = await db
			.select({ id: t.gearItem.id })
			.from(t.gearItem)
			.where(eq(t.gearItem.studioId, await studioIdOf(db)))
			.limit(1);
		const before = await bookingCount();
		const at = `/api/studios/${other.slug}`;
		const demoRoom = { room: 'live-room', start: `${DAY}T10:00`, end: `${DAY}T12:00` };
		for (const path of [`${at}/bookings`, `${at}/quote`]) {
			const res = await artist.json(path, demoRoom);
			expect(res.status, path).toBe(422);
			expect(((await res.json()) as { fields: Record<string, string[]> }).fields.room).toEqual([
				'There is no room by that name.'
			]);
			const gear = await artist.json(path, { ...demoRoom, room: other.roomSlug, gear: [demoGear!.id] });
			expect(gear.status, path).toBe(422);
			const { fields } = (await gear.json()) as { fields: Record<string, string[]> };
			expect(fields.gear).toEqual(['Some of the chosen gear cannot be hired.']);
			expect(fields.room).toBeUndefined();
		}
		// The booking form at its address, naming the demo studio's room.
		const form = await artist.form(`/${other.slug}/book`, { room: 'live-room', kind: 'half', date: DAY!, start: '10:00' });
		expect(form.status).toBe(422);
		expect(await bookingCount()).toBe(before);
		// The demo studio's own room at the demo studio's address is priced as before.
		expect((await artist.json(`/api/studios/${DEMO_STUDIO_SLUG}/quote`, demoRoom)).status).toBe(200);
	});
});

// Existing bookings are read through their own studio (OWASP ASVS 8.2.2): an artist sees their
// own sessions at every studio, each in its studio's zone; a studio's staff see its bookings and
// nothing of another studio's (404, as for what does not exist); a person on one studio's team is
// an artist at another. Uses the two seeded demo studios (scripts/seed.ts, scripts/seed-second.ts)
// and a session this file makes for the first studio's engineer at the second.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, inArray } from 'drizzle-orm';
import { studioIdOf, testDb } from '../support/db';
import { DEMO } from '../support/env';
import { signedIn, type Client } from '../support/http';
import { expectRefused, expectRefusedPage } from '../support/refusal';
import { waitFor } from '../support/wait';
import { addDays } from '../support/dates';
import * as t from '../../src/lib/server/db/schema';
import { DEMO_BOOKING_IDS } from '../../src/lib/domain/demo';
import { SECOND_BOOKING_IDS, SECOND_POLICY, SECOND_ROOMS, SECOND_STUDIO } from '../../src/lib/domain/demo-second';
import { isoInZone, localDateOf, localToInstant } from '../../src/lib/domain/time';
import { quoteBooking } from '../../src/lib/domain/pricing';

const { db, client } = testDb();
const B = { owner: 'owner2@slateroom.test', engineer: 'engineer2@slateroom.test', accountant: 'accountant2@slateroom.test' };

interface Item {
	id: string;
	reference: string;
	start: string;
	end: string;
	studio: { slug: string; name: string; timeZone: string };
	room: { slug: string; name: string };
	currency: string;
	total: number;
}

async function list(who: Client, query = ''): Promise<Item[]> {
	const res = await who.fetch(`/api/bookings${query}`);
	expect(res.status).toBe(200);
	return ((await res.json()) as { bookings: Item[] }).bookings;
}

const html = (who: Client, path: string) => who.fetch(path, { headers: { accept: 'text/html' } });

/** The first studio's engineer's own session at the second studio, made here and removed after. */
let engineersOwn = '';
let bUpload = '';
let bInvoice = '';

beforeAll(async () => {
	const studioB = await studioIdOf(db, SECOND_STUDIO.slug);
	const [engineer] = await db.select({ id: t.user.id }).from(t.user).where(eq(t.user.email, DEMO.engineer));
	const [room] = await db
		.select({ id: t.room.id })
		.from(t.room)
		.where(eq(t.room.studioId, studioB))
		.orderBy(t.room.sortOrder)
		.limit(1);
	// Ninety days ahead, not a Sunday: clear of the seeded sessions.
	let ymd = addDays(localDateOf(new Date(), SECOND_POLICY.timeZone), 90);
	while (new Date(`${ymd}T12:00:00Z`).getUTCDay() === 0) ymd = addDays(ymd, 1);
	const instant = (minute: number) => {
		const r = localToInstant(ymd, minute, SECOND_POLICY.timeZone);
		if (r.kind === 'gap') throw new Error('no such time');
		return r.instant;
	};
	const start = instant(11 * 60);
	const end = instant(13 * 60);
	const quote = quoteBooking({
		start,
		end,
		room: SECOND_ROOMS[0]!,
		engineer: false,
		gear: [],
		policy: SECOND_POLICY,
		holidays: () => false
	});
	engineersOwn = crypto.randomUUID();
	await db.insert(t.booking).values({
		id: engineersOwn,
		studioId: studioB,
		reference: `X-${engineersOwn.slice(0, 6)}`,
		roomId: room!.id,
		artistId: engineer!.id,
		startsAt: start,
		endsAt: end,
		busyUntil: end,
		status: 'confirmed',
		project: 'A side project',
		quote,
		currency: quote.currency,
		total: quote.total,
		deposit: quote.deposit
	});
	// A file on a seeded session of the second studio (its row is enough: access is decided first).
	const [u] = await db
		.insert(t.upload)
		.values({
			studioId: studioB,
			bookingId: SECOND_BOOKING_IDS[2],
			uploaderId: engineer!.id,
			originalName: 'guide.txt',
			storageKey: `${SECOND_BOOKING_IDS[2]}/${crypto.randomUUID()}`,
			contentType: 'text/plain',
			sizeBytes: 4,
			sha256: '0'.repeat(64)
		})
		.returning({ id: t.upload.id });
	bUpload = u!.id;
	// The app writes the demo's money history once it starts: wait for the second studio's first document.
	bInvoice = await waitFor(async () => {
		const [doc] = await db.select({ id: t.invoice.id }).from(t.invoice).where(eq(t.invoice.studioId, studioB)).limit(1);
		return doc?.id;
	}, 'a document of the second demo studio');
});

afterAll(async () => {
	await db.delete(t.upload).where(eq(t.upload.id, bUpload));
	await db.delete(t.booking).where(eq(t.booking.id, engineersOwn));
	await client.end();
});

describe('an artist with sessions at two studios', () => {
	it('gets both from GET /api/bookings, each with its studio and its times in that studio’s zone', async () => {
		const items = await list(await signedIn(DEMO.artist2));
		const atA = items.find((b) => b.id === DEMO_BOOKING_IDS[1]);
		const atB = items.find((b) => b.id === SECOND_BOOKING_IDS[2]);
		expect(atA?.studio).toEqual({ slug: 'hollow-pine', name: 'Hollow Pine Studio', timeZone: 'Europe/Helsinki' });
		expect(atB?.studio).toEqual({ slug: 'tallbacken', name: SECOND_STUDIO.name, timeZone: 'Europe/Stockholm' });
		expect(atB?.currency).toBe('SEK');
		const rows = await db
			.select({ id: t.booking.id, startsAt: t.booking.startsAt })
			.from(t.booking)
			.where(inArray(t.booking.id, [atA!.id, atB!.id]));
		const startOf = (id: string) => rows.find((r) => r.id === id)!.startsAt;
		expect(atA!.start).toBe(isoInZone(startOf(atA!.id), 'Europe/Helsinki'));
		expect(atB!.start).toBe(isoInZone(startOf(atB!.id), 'Europe/Stockholm'));
		// Helsinki is always an hour ahead of Stockholm: the offsets differ.
		expect(atA!.start.slice(-6)).not.toBe(atB!.start.slice(-6));
	});

	it('sees both on My bookings, each with its studio’s name and zone', async () => {
		const res = await html(await signedIn(DEMO.artist2), '/bookings');
		expect(res.status).toBe(200);
		const page = await res.text();
		expect(page).toContain(`/bookings/${DEMO_BOOKING_IDS[3]}`);
		expect(page).toContain(`/bookings/${SECOND_BOOKING_IDS[3]}`);
		expect(page).toContain('Hollow Pine Studio · Europe/Helsinki time');
		expect(page).toContain(`${SECOND_STUDIO.name} · Europe/Stockholm time`);
	});
});

describe('GET /api/bookings?studio=', () => {
	it('gives a studio’s staff that studio’s bookings, and nothing of another studio', async () => {
		const items = await list(await signedIn(B.engineer), '?studio=tallbacken');
		expect(items.map((b) => b.id)).toEqual(expect.arrayContaining([...SECOND_BOOKING_IDS]));
		expect(items.every((b) => b.studio.slug === 'tallbacken' && b.currency === 'SEK')).toBe(true);
		const ofA = await list(await signedIn(DEMO.owner), '?studio=hollow-pine');
		expect(ofA.map((b) => b.id)).toEqual(expect.arrayContaining([...DEMO_BOOKING_IDS]));
		expect(ofA.some((b) => (SECOND_BOOKING_IDS as readonly string[]).includes(b.id))).toBe(false);
	});

	it('is a 404 for a studio outside the caller’s teams or none at all, a 422 for a malformed short name', async () => {
		for (const who of [DEMO.owner, DEMO.engineer]) {
			await expectRefused(await (await signedIn(who)).fetch('/api/bookings?studio=tallbacken'), 404);
		}
		await expectRefused(await (await signedIn(B.owner)).fetch('/api/bookings?studio=hollow-pine'), 404);
		await expectRefused(await (await signedIn(DEMO.artist2)).fetch('/api/bookings?studio=tallbacken'), 404);
		const owner = await signedIn(DEMO.owner);
		await expectRefused(await owner.fetch('/api/bookings?studio=no-such-studio-here'), 404);
		const bad = await owner.fetch('/api/bookings?studio=Not_A_Slug');
		expect(bad.status).toBe(422);
		expect(((await bad.json()) as { fields: Record<string, string[]> }).fields.studio).toHaveLength(1);
		expect((await (await signedIn(B.accountant)).fetch('/api/bookings?studio=tallbacken')).status).toBe(403);
	});
});

describe('the first studio’s staff and a booking of the second', () => {
	const id = SECOND_BOOKING_IDS[2];

	it('is a 404 on its page, in the API, its cancellation, its files and its documents', async () => {
		for (const who of [DEMO.owner, DEMO.engineer, DEMO.accountant]) {
			const c = await signedIn(who);
			await expectRefusedPage(await html(c, `/bookings/${id}`), 404, /This page is not here/, ['Pale Orchard']);
			await expectRefused(await c.fetch(`/api/bookings/${id}`), 404);
			await expectRefused(await c.fetch(`/api/bookings/${id}/uploads`), 404);
			await expectRefused(await c.fetch(`/uploads/${bUpload}`), 404);
			await expectRefused(await c.fetch(`/invoices/${bInvoice}/pdf`), 404);
		}
		const owner = await signedIn(DEMO.owner);
		await expectRefused(await owner.fetch(`/api/bookings/${id}/cancellation`), 404);
		await expectRefused(await owner.json(`/api/bookings/${id}/cancel`, {}), 404);
		await expectRefused(await owner.json(`/api/bookings/${id}/cancel/retry`, {}), 404);
		await expectRefused(await owner.json(`/api/bookings/${id}/pay`, {}), 404);
		await expectRefused(
			await (await signedIn(DEMO.engineer)).json(`/api/bookings/${id}/close`, { actualEnd: '2030-01-01T10:00' }),
			404
		);
		const [row] = await db.select({ status: t.booking.status }).from(t.booking).where(eq(t.booking.id, id));
		expect(row!.status).toBe('confirmed');
	});

	it('opens for the second studio’s own staff, in its zone', async () => {
		const engineer = await signedIn(B.engineer);
		const page = await html(engineer, `/bookings/${id}`);
		expect(page.status).toBe(200);
		expect(await page.text()).toContain('studio time Europe/Stockholm');
		expect((await engineer.fetch(`/api/bookings/${id}/uploads`)).status).toBe(200);
		// The day plan carries over only this studio's recall sheets: the artist's sheet from the
		// first studio stays there.
		const item = (await list(engineer, '?studio=tallbacken')).find((b) => b.id === id)!;
		const plan = (await (await engineer.fetch(`/api/studios/tallbacken/plan?date=${item.start.slice(0, 10)}`)).json()) as {
			rooms: { sessions: { id: string; recall: unknown }[] }[];
		};
		const session = plan.rooms.flatMap((r) => r.sessions).find((s) => s.id === id);
		expect(session?.recall).toBeNull();
		const pdf = await (await signedIn(B.accountant)).fetch(`/invoices/${bInvoice}/pdf`);
		expect(pdf.status).toBe(200);
		expect(pdf.headers.get('content-type')).toBe('application/pdf');
	});
});

describe('the first studio’s engineer booked as an artist at the second', () => {
	it('sees their own session there as its artist, not as an engineer', async () => {
		const me = await signedIn(DEMO.engineer);
		const mine = await list(me);
		expect(mine.find((b) => b.id === engineersOwn)?.studio.slug).toBe('tallbacken');
		const res = await html(me, `/bookings/${engineersOwn}`);
		expect(res.status).toBe(200);
		const page = await res.text();
		// The artist's way back, not the engineer's day plan; no recording of the session's end.
		expect(page).toContain('href="/bookings"');
		expect(page).not.toContain('href="/plan?date=');
		expect(page).not.toContain('Record the end of the session');
		expect(page).toContain('studio time Europe/Stockholm');
		// As its artist they may preview cancelling; closing the session is the studio's.
		expect((await me.fetch(`/api/bookings/${engineersOwn}/cancellation`)).status).toBe(200);
		await expectRefused(await me.json(`/api/bookings/${engineersOwn}/close`, { actualEnd: '2030-01-01T10:00' }), 403);
		// The second studio's engineer reads it too; the first studio's owner does not.
		expect((await (await signedIn(B.engineer)).fetch(`/api/bookings/${engineersOwn}`)).status).toBe(200);
		await expectRefused(await (await signedIn(DEMO.owner)).fetch(`/api/bookings/${engineersOwn}`), 404);
	});
});

// What each role may reach, over real HTTP against the production build:
// - the accountant reads the accounts and the bookings in them, and nothing else: no booking page,
//   no holds, no payments, no cancelling, no files, no day plan (OWASP ASVS 8.2.1, 8.2.2);
// - every internal link on a role's pages leads somewhere that role may go (no 403, no 404);
// - a booking shows one balance figure: the quote's before the final invoice, the invoice's
//   amount due after it, and none once cancelled.
// This file books the control room 09:00–11:00 on working weekdays from 60 days ahead.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { Client, signedIn } from '../support/http';
import { DEMO } from '../support/env';
import { testDb } from '../support/db';
import { weekdayAhead, workdaysAhead } from '../support/dates';
import { bookAndPay, holdFirstFree, type Held } from '../support/booking';
import { moveIntoPast } from '../support/started';
import * as t from '../../src/lib/server/db/schema';
import { HOME_FOR_ROLE } from '../../src/lib/roles';
import { formatMoney } from '../../src/lib/domain/money';

const { db, client } = testDb();
afterAll(() => client.end());

/** This file's days: working weekdays from 60 days ahead, tried in order. */
const DAYS = workdaysAhead(60, 28);
/** The control room 09:00–11:00 on the first free one of this file's days. */
const WISH = { room: 'control-room', days: DAYS, slots: [['09:00', '11:00']] } as const;

const hold = (who: Client) => holdFirstFree(who, WISH);
const confirmed = (who: Client) => bookAndPay(db, who, WISH);

const html = async (who: Client, path: string) => {
	const res = await who.fetch(path, { headers: { accept: 'text/html' } });
	return { status: res.status, body: await res.text() };
};
const count = (text: string, needle: string) => text.split(needle).length - 1;

let artist: Client;
let accountant: Client;
/** Confirmed, with its deposit invoice: in the accounts. */
let paid: Held;
/** Held, nothing paid: not in the accounts. */
let unpaid: Held;
let uploadId: string;

beforeAll(async () => {
	[artist, accountant] = await Promise.all([signedIn(DEMO.artist), signedIn(DEMO.accountant)]);
	paid = await confirmed(artist);
	unpaid = await hold(artist);
	const form = new FormData();
	form.set('file', new Blob(['Verse one\nChorus\n'], { type: 'text/plain' }), 'lyrics.txt');
	const up = await artist.fetch(`/api/bookings/${paid.id}/uploads`, { method: 'POST', body: form });
	expect(up.status).toBe(201);
	uploadId = ((await up.json()) as { id: string }).id;
});

describe('the accountant is read-only outside the accounts', () => {
	it('gets no booking page and makes no hold, by page or API', async () => {
		const before = await db
			.select({ id: t.booking.id })
			.from(t.booking)
			.where(eq(t.booking.artistId, await accountantId()));
		const page = await html(accountant, '/hollow-pine/book?room=control-room');
		expect(page.status).toBe(403);
		expect(page.body).toContain('does not book sessions');

		const day = weekdayAhead(95);
		const viaForm = await accountant.form('/hollow-pine/book', {
			room: 'control-room',
			date: day,
			start: '13:00',
			kind: 'hourly',
			hours: '2'
		});
		expect(viaForm.status).toBe(403);
		const viaApi = await accountant.json('/api/studios/hollow-pine/bookings', {
			room: 'control-room',
			start: `${day}T13:00`,
			end: `${day}T15:00`
		});
		expect(viaApi.status).toBe(403);
		expect(await viaApi.json()).toMatchObject({ error: 'forbidden' });
		const after = await db
			.select({ id: t.booking.id })
			.from(t.booking)
			.where(eq(t.booking.artistId, await accountantId()));
		expect(after).toEqual(before);
	});

	it('cannot list bookings, pay, cancel, close, retry refunds or see a cancellation preview', async () => {
		expect((await accountant.fetch('/api/bookings?studio=hollow-pine')).status).toBe(403);
		// Without a studio, the list is their own sessions as an artist: none of the studio's.
		const own = (await (await accountant.fetch('/api/bookings')).json()) as { bookings: { id: string }[] };
		expect(own.bookings.map((b) => b.id)).not.toContain(paid.id);
		expect((await html(accountant, '/bookings')).status).toBe(403);
		for (const id of [paid.id, unpaid.id]) {
			expect((await accountant.json(`/api/bookings/${id}/pay`, { kind: 'deposit' })).status).toBe(403);
			expect((await accountant.json(`/api/bookings/${id}/cancel`, {})).status).toBe(403);
			expect((await accountant.fetch(`/api/bookings/${id}/cancellation`)).status).toBe(403);
			expect((await accountant.json(`/api/bookings/${id}/close`, { actualEnd: `${paid.day}T11:00` })).status).toBe(403);
			expect((await accountant.json(`/api/bookings/${id}/cancel/retry`, {})).status).toBe(403);
		}
		const [row] = await db.select().from(t.booking).where(eq(t.booking.id, unpaid.id));
		expect(row!.status).toBe('held');
		const payments = await db.select().from(t.payment).where(eq(t.payment.bookingId, unpaid.id));
		expect(payments).toHaveLength(1); // the artist's own checkout, nothing added
	});

	it('cannot list, add, download or remove the artists’ files', async () => {
		expect((await accountant.fetch(`/api/bookings/${paid.id}/uploads`)).status).toBe(403);
		const form = new FormData();
		form.set('file', new Blob(['Not mine\n'], { type: 'text/plain' }), 'note.txt');
		expect((await accountant.fetch(`/api/bookings/${paid.id}/uploads`, { method: 'POST', body: form })).status).toBe(403);
		const pageForm = new FormData();
		pageForm.set('file', new Blob(['Not mine\n'], { type: 'text/plain' }), 'note.txt');
		const viaPage = await accountant.fetch(`/bookings/${paid.id}?/upload`, {
			method: 'POST',
			body: pageForm,
			headers: { accept: 'application/json' }
		});
		// SvelteKit answers an action asked for JSON with the failure's status inside.
		expect(((await viaPage.json()) as { type: string; status: number }).status).toBe(403);
		expect((await accountant.fetch(`/uploads/${uploadId}`)).status).toBe(403);
		expect((await accountant.fetch(`/api/bookings/${paid.id}/uploads/${uploadId}`, { method: 'DELETE' })).status).toBe(403);
		expect(await db.select().from(t.upload).where(eq(t.upload.bookingId, paid.id))).toHaveLength(1);
	});

	it('cannot open the day plan, its recall sheets or its calendar feed', async () => {
		expect((await html(accountant, '/plan')).status).toBe(403);
		expect((await accountant.fetch(`/api/studios/hollow-pine/plan?date=${paid.day}`)).status).toBe(403);
		expect((await accountant.form('/plan?/feed', {})).status).toBe(403);
		expect((await html(accountant, '/studio')).status).toBe(403);
	});

	it('reads a booking that is in the accounts, without anything to do on it, and no other', async () => {
		const page = await html(accountant, `/bookings/${paid.id}`);
		expect(page.status).toBe(200);
		expect(page.body).toContain('data-testid="money-panel"');
		for (const absent of ['pay-deposit', 'pay-balance', 'data-testid="cancel"', 'record-end', '?/upload', 'lyrics.txt']) {
			expect(page.body).not.toContain(absent);
		}
		expect(page.body).toMatch(/href="\/accounts\?month=\d{4}-\d{2}"/);
		expect((await accountant.fetch(`/api/bookings/${paid.id}`)).status).toBe(200);

		expect((await html(accountant, `/bookings/${unpaid.id}`)).status).toBe(404);
		expect((await accountant.fetch(`/api/bookings/${unpaid.id}`)).status).toBe(404);
	});
});

async function accountantId(): Promise<string> {
	const [u] = await db.select({ id: t.user.id }).from(t.user).where(eq(t.user.email, DEMO.accountant));
	return u!.id;
}

// ---- links ---------------------------------------------------------------------------------------

const UUID = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/gi;
/** Links of one shape (same path with ids blanked, same query names) are followed this many times. */
const PER_SHAPE = 3;
const MAX_PAGES = 150;
/**
 * The month's ZIP is built whole before it answers (a minute and more for a month full of test
 * documents); exports.test.ts covers who may have it, and the same handler answers the CSV and
 * UBL links this crawl does follow.
 */
const SKIPPED = (url: URL) =>
	url.pathname === '/api/studios/hollow-pine/invoices/export' && url.searchParams.get('format') === 'zip';

function shapeOf(url: URL): string {
	return `${url.pathname.replace(UUID, ':id')}?${[...url.searchParams.keys()].sort().join('&')}`;
}

function linksIn(page: string, base: URL): URL[] {
	const out: URL[] = [];
	for (const m of page.matchAll(/<a\b[^>]*?\shref="([^"]+)"/g)) {
		const href = m[1]!.replaceAll('&amp;', '&');
		if (/^(mailto:|tel:|#)/.test(href)) continue;
		const url = new URL(href, base);
		if (url.origin !== base.origin) continue;
		url.hash = '';
		out.push(url);
	}
	return out;
}

/**
 * Follows every internal link from the role's home (the site's front page and the role's landing
 * page), one shape of link at most PER_SHAPE times, and gives each link that answered 403, 404
 * or a server error, with the page it was found on.
 */
async function brokenLinks(who: Client, starts: string[]): Promise<string[]> {
	const base = new URL(who.base);
	const queue: { url: URL; from: string }[] = starts.map((s) => ({ url: new URL(s, base), from: '(start)' }));
	const seen = new Set<string>();
	const perShape = new Map<string, number>();
	const broken: string[] = [];
	let pages = 0;
	while (queue.length && pages < MAX_PAGES) {
		const { url, from } = queue.shift()!;
		const key = url.pathname + url.search;
		if (seen.has(key) || SKIPPED(url)) continue;
		seen.add(key);
		const shape = shapeOf(url);
		const n = perShape.get(shape) ?? 0;
		if (n >= PER_SHAPE) continue;
		perShape.set(shape, n + 1);
		pages++;
		const res = await who.fetch(key, { headers: { accept: 'text/html' } });
		if (res.status === 403 || res.status === 404 || res.status >= 500) broken.push(`${res.status} ${key} (linked from ${from})`);
		const type = res.headers.get('content-type') ?? '';
		if (res.status === 200 && type.startsWith('text/html')) {
			for (const link of linksIn(await res.text(), url)) queue.push({ url: link, from: key });
		} else await res.body?.cancel();
	}
	expect(pages).toBeGreaterThan(3);
	if (process.env.CRAWL_REPORT) console.info(`crawl: ${pages} links followed from ${starts.join(', ')}`);
	return broken;
}

describe('every link leads somewhere its viewer may go', () => {
	it.each([
		['visitor', null],
		['artist', DEMO.artist],
		['engineer', DEMO.engineer],
		['accountant', DEMO.accountant],
		['owner', DEMO.owner]
	] as const)(
		'for the %s',
		async (role, email) => {
			const who = email ? await signedIn(email) : new Client();
			// The platform's front page and the demo studio's storefront.
			const starts = ['/', '/hollow-pine'];
			if (role !== 'visitor') starts.push(HOME_FOR_ROLE[role]);
			// A booking page of each kind the role can open: the engineer's and owner's lists start from
			// the plan and the desk; the artist's own and the accountant's through the accounts.
			if (role !== 'visitor') starts.push(`/bookings/${paid.id}`);
			expect(await brokenLinks(who, starts)).toEqual([]);
		},
		180_000
	);
});

// ---- one balance -----------------------------------------------------------------------------

describe('one balance figure per booking', () => {
	it('shows the quoted balance before the final invoice, the invoice’s amount due after it, never both', async () => {
		const b = await confirmed(artist);
		const before = (await html(artist, `/bookings/${b.id}`)).body;
		expect(count(before, 'data-testid="quote-balance"')).toBe(1);
		expect(count(before, 'data-testid="money-balance"')).toBe(0);

		await moveIntoPast(db, b.id);
		const [row] = await db.select().from(t.booking).where(eq(t.booking.id, b.id));
		const owner = await signedIn(DEMO.owner);
		const end = new Intl.DateTimeFormat('sv-SE', {
			timeZone: 'Europe/Helsinki',
			year: 'numeric',
			month: '2-digit',
			day: '2-digit',
			hour: '2-digit',
			minute: '2-digit'
		})
			.format(new Date(row!.endsAt.getTime() + 20 * 60_000))
			.replace(' ', 'T');
		const closed = await owner.json(`/api/bookings/${b.id}/close`, { actualEnd: end });
		expect(closed.status).toBe(200);
		const { invoice } = (await closed.json()) as { invoice: { amountDue: number } };
		expect(invoice.amountDue).not.toBe(b.quote.balance); // overtime: the quote's balance is no longer the figure

		for (const who of [artist, owner]) {
			const after = (await html(who, `/bookings/${b.id}`)).body;
			expect(count(after, 'data-testid="quote-balance"')).toBe(0);
			expect(count(after, 'data-testid="money-balance"')).toBe(1);
			const shown = after.match(/data-testid="money-balance"[^>]*>([^<]+)</)![1]!;
			expect(shown).toBe(formatMoney(invoice.amountDue, 'EUR'));
		}
	}, 90_000);

	it('shows no balance to pay on a cancelled booking', async () => {
		// The booking the links above were followed from, cancelled last of all.
		const b = paid;
		expect((await artist.json(`/api/bookings/${b.id}/cancel`, {})).status).toBe(200);
		const page = (await html(artist, `/bookings/${b.id}`)).body;
		expect(page).not.toContain('data-testid="quote-balance"');
		expect(page).not.toContain('data-testid="money-balance"');
		expect(page).not.toContain('pay-balance');
	}, 90_000);
});

// With PostgreSQL stopped the app says so plainly (503 with Retry-After) and quickly, and it
// serves again by itself, without a restart, soon after the database is back. Runs last: it
// stops the test cluster for a moment. Prints the two figures it measures: the longest answer
// while the database is down, and the time from the database being ready to the app's first
// success.
import { execFile, execFileSync } from 'node:child_process';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';
import postgres from 'postgres';
import Stripe from 'stripe';
import { APP_URL, DATABASE_URL, DEMO } from '../support/env';
import { weekdayAhead } from '../support/dates';
import { signedIn } from '../support/http';
import { sleep } from '../support/wait';

const port = process.env.PG_PORT ?? '5434';
const pgSync = (cmd: 'start' | 'stop') => execFileSync('bash', ['scripts/pg.sh', cmd, 'test', port], { stdio: 'pipe' });
const pgAsync = (cmd: 'start' | 'stop') => promisify(execFile)('bash', ['scripts/pg.sh', cmd, 'test', port]);

// Goals, with room for a busy shared machine: while the database is down every request answers
// within this time (the server refuses connections at once; nothing should wait on it)…
const DOWN_ANSWER_LIMIT_MS = 3000;
// …and after it is ready again the app serves within this time.
const RECOVERY_LIMIT_MS = 2000;

const day = weekdayAhead(90);
const quoteBody = JSON.stringify({ room: 'live-room', start: `${day}T10:00`, end: `${day}T12:00` });
const quote = () =>
	fetch(`${APP_URL}/api/studios/hollow-pine/quote`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: quoteBody
	});
const rooms = (signal?: AbortSignal) => fetch(`${APP_URL}/api/studios/hollow-pine/rooms`, { signal });
/** An event Stripe might send, signed as Stripe signs it (SDK generateTestHeaderString, offline). */
function webhook() {
	const payload = JSON.stringify({
		id: `evt_outage_${Date.now()}_${Math.random().toString(36).slice(2)}`,
		object: 'event',
		type: 'payment_intent.created',
		data: { object: { id: 'pi_outage' } }
	});
	const signature = new Stripe('sk_test_outage').webhooks.generateTestHeaderString({
		payload,
		secret: process.env.STRIPE_WEBHOOK_SECRET ?? 'whsec_slateroom_test'
	});
	return fetch(`${APP_URL}/api/stripe/webhook`, {
		method: 'POST',
		headers: { 'content-type': 'application/json', 'stripe-signature': signature },
		body: payload
	});
}

/** Runs a request and measures how long its answer took, body included. */
async function timed(label: string, send: () => Promise<Response>) {
	const started = performance.now();
	const res = await send();
	const text = await res.text();
	return { label, status: res.status, retryAfter: res.headers.get('retry-after'), text, ms: performance.now() - started };
}

/** Does PostgreSQL itself answer a fresh connection? (Not through the app.) */
async function databaseReady(): Promise<boolean> {
	const probe = postgres(DATABASE_URL, { max: 1, connect_timeout: 2, onnotice: () => {} });
	try {
		await probe`select 1`;
		return true;
	} catch {
		return false;
	} finally {
		await probe.end({ timeout: 1 }).catch(() => {});
	}
}

describe('database outage', () => {
	it('answers 503 fast while the database is down and serves again within 2 s of its return', async () => {
		// Signed in before the outage: reading the session needs the database.
		const artist = await signedIn(DEMO.artist);
		expect((await rooms()).status).toBe(200);
		const answers: Awaited<ReturnType<typeof timed>>[] = [];
		let readyAt = 0;
		let servedAt = 0;
		let lastFailureAfterReady = 0;
		let startAsked = false;
		pgSync('stop');
		try {
			const health = await timed('GET /api/health', () => fetch(`${APP_URL}/api/health`));
			answers.push(health);
			expect(health.status).toBe(503);
			expect(JSON.parse(health.text)).toEqual({ ok: false, db: 'down' });
			const page = await timed('GET /hollow-pine/rooms', () =>
				fetch(`${APP_URL}/hollow-pine/rooms`, { headers: { accept: 'text/html' } })
			);
			answers.push(page);
			expect(page.status).toBe(503);
			expect(page.text).toContain('not answering');
			// JSON endpoints: the same 503 and error shape as /api/health's status, never a 500.
			const api = [
				await timed('GET /api/studios/hollow-pine/rooms', () => rooms()),
				await timed('POST /api/studios/hollow-pine/quote', quote),
				await timed('GET /api/auth/get-session', () => artist.fetch('/api/auth/get-session')),
				await timed('GET /api/bookings', () => artist.fetch('/api/bookings')),
				await timed('POST /api/stripe/webhook', webhook)
			];
			// More at once than the pool has connections: each fails on its own, none waits for the others.
			const burst = await Promise.all(
				Array.from({ length: 30 }, (_, i) =>
					i % 3 === 0
						? timed('burst GET /api/bookings', () => artist.fetch('/api/bookings'))
						: i % 3 === 1
							? timed('burst POST /api/studios/hollow-pine/quote', quote)
							: timed('burst GET /api/studios/hollow-pine/rooms', () => rooms())
				)
			);
			for (const res of [...api, ...burst]) {
				answers.push(res);
				expect(res.status, `${res.label}: ${res.text}`).toBe(503);
				expect(JSON.parse(res.text)).toEqual({
					error: 'unavailable',
					message: expect.stringContaining('not answering') as string
				});
				expect(Number(res.retryAfter), `${res.label} Retry-After`).toBeGreaterThan(0);
			}
			// The database stays down a while longer; requests keep failing fast, one after another.
			const until = performance.now() + 2000;
			while (performance.now() < until) {
				const res = await timed('GET /api/studios/hollow-pine/rooms (loop)', () => rooms());
				answers.push(res);
				expect(res.status).toBe(503);
			}

			// Back up: PostgreSQL starts while this test watches it directly and polls the app, both
			// every 25 ms, so the recovery time does not hang on how often anyone asks.
			startAsked = true;
			const starting = pgAsync('start');
			const deadline = performance.now() + 60_000;
			const watchDatabase = (async () => {
				while (!readyAt && performance.now() < deadline) {
					if (await databaseReady()) readyAt = performance.now();
					else await sleep(25);
				}
			})();
			const watchApp = (async () => {
				while (!servedAt && performance.now() < deadline) {
					const res = await rooms(AbortSignal.timeout(10_000)).catch(() => null);
					const at = performance.now();
					await res?.body?.cancel();
					if (res?.status === 200) servedAt = at;
					else {
						if (readyAt) lastFailureAfterReady = at;
						await sleep(25);
					}
				}
			})();
			await Promise.all([starting, watchDatabase, watchApp]);
		} finally {
			// A failed check above must not leave the database stopped for the rest of the run.
			if (!startAsked) pgSync('start');
		}
		const slowest = answers.reduce((a, b) => (b.ms > a.ms ? b : a));
		expect(readyAt, 'the database came back').toBeGreaterThan(0);
		expect(servedAt, 'the app served again').toBeGreaterThan(0);
		// Negative when the app's poll got through before this test's own probe did.
		const recoveryMs = servedAt - readyAt;

		console.log(
			`[outage] slowest answer while the database was down: ${Math.round(slowest.ms)} ms (${slowest.label}, ` +
				`${answers.length} requests); first success ${Math.round(recoveryMs)} ms after the database was ready` +
				(lastFailureAfterReady ? `; last failed poll ${Math.round(lastFailureAfterReady - readyAt)} ms after ready` : '')
		);
		expect(slowest.ms, `slowest answer while down: ${slowest.label}`).toBeLessThan(DOWN_ANSWER_LIMIT_MS);
		expect(recoveryMs, 'time from the database being ready to the first success').toBeLessThanOrEqual(RECOVERY_LIMIT_MS);

		// Everything works again, the session that was open before included.
		const health = await fetch(`${APP_URL}/api/health`);
		expect(health.status).toBe(200);
		expect(await health.json()).toEqual({ ok: true, db: 'up' });
		const roomsPage = await fetch(`${APP_URL}/hollow-pine/rooms`);
		expect(roomsPage.status).toBe(200);
		const priced = await quote();
		expect(priced.status).toBe(200);
		expect(await priced.json()).toHaveProperty('total');
		const session = await artist.fetch('/api/auth/get-session');
		expect(session.status).toBe(200);
		expect(((await session.json()) as { user: { email: string } }).user.email).toBe(DEMO.artist);
		expect((await webhook()).status).toBe(200);
	}, 120_000);
});

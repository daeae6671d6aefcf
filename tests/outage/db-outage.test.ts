// With PostgreSQL stopped the app says so plainly (503), and it recovers by itself, without a
// restart, once the database is back. Runs last: it stops the test cluster for a moment.
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { APP_URL, DEMO } from '../support/env';
import { weekdayAhead } from '../support/dates';
import { signedIn } from '../support/http';

const port = process.env.PG_PORT ?? '5434';
const pg = (cmd: 'start' | 'stop') => execFileSync('bash', ['scripts/pg.sh', cmd, 'test', port], { stdio: 'pipe' });

async function waitFor(check: () => Promise<boolean>, ms = 20_000) {
	const until = Date.now() + ms;
	while (Date.now() < until) {
		if (await check()) return true;
		await new Promise((r) => setTimeout(r, 250));
	}
	return false;
}

const day = weekdayAhead(90);
const quoteBody = JSON.stringify({ room: 'live-room', start: `${day}T10:00`, end: `${day}T12:00` });
const quote = () =>
	fetch(`${APP_URL}/api/quote`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: quoteBody });
const rooms = () => fetch(`${APP_URL}/api/rooms`);
/** An event Stripe might send, signed as Stripe signs it (SDK generateTestHeaderString, offline). */
function webhook() {
	const payload = JSON.stringify({
		id: `evt_outage_${Date.now()}`,
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

describe('database outage', () => {
	it('answers 503 while the database is down and recovers when it returns', async () => {
		// Signed in before the outage: reading the session needs the database.
		const artist = await signedIn(DEMO.artist);
		pg('stop');
		try {
			const health = await fetch(`${APP_URL}/api/health`);
			expect(health.status).toBe(503);
			expect(await health.json()).toEqual({ ok: false, db: 'down' });
			const page = await fetch(`${APP_URL}/rooms`, { headers: { accept: 'text/html' } });
			expect(page.status).toBe(503);
			expect(await page.text()).toContain('not answering');
			// JSON endpoints: the same 503 and error shape as /api/health's status, never a 500.
			const answers = [
				await rooms(),
				await quote(),
				await artist.fetch('/api/auth/get-session'),
				await artist.fetch('/api/bookings'),
				await webhook()
			];
			for (const res of answers) {
				expect(res.status).toBe(503);
				expect(await res.json()).toEqual({ error: 'unavailable', message: expect.stringContaining('not answering') });
			}
		} finally {
			pg('start');
		}
		const back = await waitFor(async () => (await fetch(`${APP_URL}/api/health`)).status === 200);
		expect(back).toBe(true);
		const roomsPage = await fetch(`${APP_URL}/rooms`);
		expect(roomsPage.status).toBe(200);
		expect((await rooms()).status).toBe(200);
		const priced = await quote();
		expect(priced.status).toBe(200);
		expect(await priced.json()).toHaveProperty('total');
		const session = await artist.fetch('/api/auth/get-session');
		expect(session.status).toBe(200);
		expect(((await session.json()) as { user: { email: string } }).user.email).toBe(DEMO.artist);
		expect((await webhook()).status).toBe(200);
	}, 60_000);
});

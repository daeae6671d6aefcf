// With PostgreSQL stopped the app says so plainly (503), and it recovers by itself, without a
// restart, once the database is back. Runs last: it stops the test cluster for a moment.
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { APP_URL } from '../support/env';

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

describe('database outage', () => {
	it('answers 503 while the database is down and recovers when it returns', async () => {
		pg('stop');
		try {
			const health = await fetch(`${APP_URL}/api/health`);
			expect(health.status).toBe(503);
			expect(await health.json()).toEqual({ ok: false, db: 'down' });
			const page = await fetch(`${APP_URL}/rooms`, { headers: { accept: 'text/html' } });
			expect(page.status).toBe(503);
			expect(await page.text()).toContain('not answering');
		} finally {
			pg('start');
		}
		const back = await waitFor(async () => (await fetch(`${APP_URL}/api/health`)).status === 200);
		expect(back).toBe(true);
		const rooms = await fetch(`${APP_URL}/rooms`);
		expect(rooms.status).toBe(200);
	}, 60_000);
});

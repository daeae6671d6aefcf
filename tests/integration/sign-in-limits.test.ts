// Sign-in limits count wrong passwords per account and client address together: a stranger's
// guesses never lock the owner out, the guesser is refused, and an address that tries many
// accounts is slowed. Each client here connects from its own loopback address (127.0.0.x: all of
// 127.0.0.0/8 reaches the test server), so the app sees different addresses on real sockets,
// exactly as it would from different machines, without trusting any header.
import http from 'node:http';
import { afterAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { Client } from '../support/http';
import { APP_URL } from '../support/env';
import { testDb } from '../support/db';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

const stamp = Date.now();
let serial = 0;
const freshEmail = (what: string) => `${what}-${stamp}-${++serial}@slateroom.test`;
const PASSWORD = 'the-right-password-42';

/** Posts the sign-in form from `localAddress`, as a browser there would. */
function signInFrom(localAddress: string, email: string, password: string): Promise<{ status: number; body: string }> {
	const url = new URL('/sign-in', APP_URL);
	const body = new URLSearchParams({ email, password }).toString();
	return new Promise((resolve, reject) => {
		const req = http.request(
			{
				host: url.hostname,
				port: url.port,
				path: url.pathname,
				method: 'POST',
				localAddress,
				agent: false,
				headers: {
					'content-type': 'application/x-www-form-urlencoded',
					'content-length': Buffer.byteLength(body),
					accept: 'text/html',
					origin: APP_URL
				}
			},
			(res) => {
				let text = '';
				res.setEncoding('utf8');
				res.on('data', (c: string) => (text += c));
				res.on('end', () => resolve({ status: res.statusCode ?? 0, body: text }));
			}
		);
		req.on('error', reject);
		req.end(body);
	});
}

async function freshAccount(what: string) {
	const email = freshEmail(what);
	await new Client().signUp('Limits Band', email, PASSWORD);
	return email;
}

/** The addresses of this file: a block of 127.0.0.0/8 no other spec uses. */
const address = (n: number) => `127.0.77.${n}`;

describe('a stranger’s guesses do not lock the owner out (OWASP ASVS 6.3.1)', () => {
	it('after six wrong passwords from address A, the owner signs in from address B', async () => {
		const email = await freshAccount('owner');
		const stranger = address(1);
		const statuses: number[] = [];
		for (let i = 0; i < 6; i++) statuses.push((await signInFrom(stranger, email, `wrong-guess-${i}`)).status);
		expect(statuses).toEqual([400, 400, 400, 400, 400, 429]);
		const owner = await signInFrom(address(2), email, PASSWORD);
		expect(owner.status).toBe(303);
	});

	it('address A itself is refused for that account, even with the right password, but may try others', async () => {
		const email = await freshAccount('guessed');
		const other = await freshAccount('other');
		const guesser = address(3);
		for (let i = 0; i < 5; i++) expect((await signInFrom(guesser, email, `wrong-${i}`)).status).toBe(400);
		const refused = await signInFrom(guesser, email, PASSWORD);
		expect(refused.status).toBe(429);
		expect(refused.body).toMatch(/Too many wrong passwords for this account/);
		expect((await signInFrom(guesser, other, PASSWORD)).status).toBe(303);
	});

	it('the counts live in the database, one row per account and address, with an expiry', async () => {
		const email = await freshAccount('rows');
		for (let i = 0; i < 2; i++) await signInFrom(address(4), email, `wrong-${i}`);
		const rows = await db
			.select()
			.from(t.authLimit)
			.where(and(eq(t.authLimit.kind, 'sign_in'), eq(t.authLimit.account, email)));
		expect(rows).toHaveLength(1);
		expect(rows[0]).toMatchObject({ address: address(4), count: 2 });
		expect(rows[0]!.expiresAt.getTime()).toBeGreaterThan(Date.now());
		// The right password from that address forgets its failures.
		expect((await signInFrom(address(4), email, PASSWORD)).status).toBe(303);
		expect(await db.select().from(t.authLimit).where(eq(t.authLimit.account, email))).toEqual([]);
	});
});

describe('an address that tries many accounts is slowed', () => {
	it('past its limit, each attempt from it waits; other addresses do not', async () => {
		const email = await freshAccount('sprayed');
		const sprayer = address(5);
		// The limit for the suite is high (AUTH_RATE_LIMIT_PER_IP, scripts/test.sh), so the many
		// accounts this address already failed on are written directly: one failure on each.
		const perAddress = Number(process.env.AUTH_RATE_LIMIT_PER_IP ?? 30);
		const now = new Date();
		// Ten failures past the limit: the pause after each further failure is at its longest (5 minutes).
		await db.insert(t.authLimit).values(
			Array.from({ length: perAddress }, (_, i) => ({
				kind: 'sign_in',
				address: sprayer,
				account: `sprayed-${stamp}-${i}@slateroom.test`,
				count: i === 0 ? 11 : 1,
				windowStartedAt: now,
				lastAt: now,
				expiresAt: new Date(now.getTime() + 20 * 60_000)
			}))
		);
		const slowed = await signInFrom(sprayer, email, PASSWORD);
		expect(slowed.status).toBe(429);
		expect(slowed.body).toMatch(/Too many failed sign-ins from your network/);
		// Anyone else signs in to the same account at once.
		expect((await signInFrom(address(6), email, PASSWORD)).status).toBe(303);
		// Slowed, not locked: once the pause after its last failure is over, it may try again.
		await db
			.update(t.authLimit)
			.set({ lastAt: sql`${t.authLimit.lastAt} - interval '10 minutes'` })
			.where(eq(t.authLimit.address, sprayer));
		const wrong = await signInFrom(sprayer, email, 'still-guessing');
		expect(wrong.status).toBe(400);
		// That failure was one more: the next attempt waits again, the full pause this time.
		expect((await signInFrom(sprayer, email, PASSWORD)).status).toBe(429);
	});
});

// Brute-force limits on signing in and up (OWASP ASVS 6.3.1), kept in PostgreSQL so that every
// app instance counts the same attempts. The rules (what counts, windows, when to refuse, the
// pauses) are in src/lib/domain/sign-in-limits.ts; this module reads and writes the counts.
//
// A check and the count after it are two statements, so a burst of attempts sent at the same
// instant can each pass the check before any is counted: at most one attempt per request in
// flight gets past a limit, each still paying for a full password check.
import { and, eq, gt, lte, sql } from 'drizzle-orm';
import { env } from '$env/dynamic/private';
import {
	accountKey,
	addressKey,
	judgeSignIn,
	judgeSignUp,
	limitConfig,
	type Counter,
	type LimitVerdict,
	type SignInLimitConfig
} from '$lib/domain/sign-in-limits';
import { db } from './db';
import { authLimit } from './db/schema';

export function signInLimits(): SignInLimitConfig {
	return limitConfig(env);
}

type Kind = 'sign_in' | 'sign_up';

const asCounter = (row: { count: number; windowStartedAt: Date; lastAt: Date }): Counter => ({
	count: row.count,
	windowStartedAt: row.windowStartedAt.getTime(),
	lastAt: row.lastAt.getTime()
});

async function readCounter(kind: Kind, address: string, account: string): Promise<Counter | null> {
	const [row] = await db
		.select({ count: authLimit.count, windowStartedAt: authLimit.windowStartedAt, lastAt: authLimit.lastAt })
		.from(authLimit)
		.where(and(eq(authLimit.kind, kind), eq(authLimit.address, address), eq(authLimit.account, account)));
	return row ? asCounter(row) : null;
}

/** Is another sign-in attempt allowed for this address and this e-mail? Only looks; counts nothing. */
export async function checkSignInLimit(ip: string, email: string, now = new Date()): Promise<LimitVerdict> {
	const config = signInLimits();
	const address = addressKey(ip);
	const windowOpenSince = new Date(now.getTime() - config.windowMs);
	const [pair, [spread]] = await Promise.all([
		readCounter('sign_in', address, accountKey(email)),
		db
			.select({
				failures: sql<string | null>`sum(${authLimit.count})`,
				last: sql<Date | string | null>`max(${authLimit.lastAt})`
			})
			.from(authLimit)
			.where(and(eq(authLimit.kind, 'sign_in'), eq(authLimit.address, address), gt(authLimit.windowStartedAt, windowOpenSince)))
	]);
	const last = spread?.last ? new Date(spread.last).getTime() : null;
	return judgeSignIn({ pair, address: { failures: Number(spread?.failures ?? 0), lastFailureAt: last } }, config, now.getTime());
}

/**
 * Counts one event for the key in one statement: a row whose window has ended starts again at 1,
 * so concurrent writers (several instances) never lose a count.
 */
async function countOne(kind: Kind, address: string, account: string, config: SignInLimitConfig, now: Date) {
	const windowOpenSince = new Date(now.getTime() - config.windowMs);
	const windowEndFromNow = new Date(now.getTime() + config.windowMs);
	const pauseEnd = new Date(now.getTime() + config.backoffMaxMs);
	// Instants go into raw SQL as ISO 8601 text; the driver takes Date objects only for typed columns.
	const closed = sql`${authLimit.windowStartedAt} <= ${windowOpenSince.toISOString()}::timestamptz`;
	const startedAt = sql`case when ${closed} then ${now.toISOString()}::timestamptz else ${authLimit.windowStartedAt} end`;
	await db
		.insert(authLimit)
		.values({
			kind,
			address,
			account,
			count: 1,
			windowStartedAt: now,
			lastAt: now,
			expiresAt: new Date(Math.max(windowEndFromNow.getTime(), pauseEnd.getTime()))
		})
		.onConflictDoUpdate({
			target: [authLimit.kind, authLimit.address, authLimit.account],
			set: {
				count: sql`case when ${closed} then 1 else ${authLimit.count} + 1 end`,
				windowStartedAt: startedAt,
				lastAt: now,
				expiresAt: sql`greatest(${startedAt} + make_interval(secs => ${config.windowMs / 1000}), ${pauseEnd.toISOString()}::timestamptz)`
			}
		});
	sweepNow(now);
}

export async function recordSignInFailure(ip: string, email: string, now = new Date()) {
	await countOne('sign_in', addressKey(ip), accountKey(email), signInLimits(), now);
}

/** The right password from this address: its failures on this account are forgotten (others' stay). */
export async function recordSignInSuccess(ip: string, email: string) {
	await db
		.delete(authLimit)
		.where(and(eq(authLimit.kind, 'sign_in'), eq(authLimit.address, addressKey(ip)), eq(authLimit.account, accountKey(email))));
}

/** Sign-ups from one address: checks, and counts this one when it is allowed. */
export async function checkAndCountSignUp(ip: string, now = new Date()): Promise<LimitVerdict> {
	const config = signInLimits();
	const address = addressKey(ip);
	const verdict = judgeSignUp(await readCounter('sign_up', address, ''), config, now.getTime());
	if (verdict.allowed) await countOne('sign_up', address, '', config, now);
	return verdict;
}

const SWEEP_EVERY_MS = 60_000;
let lastSweep = 0;

/** Deletes the rows that can no longer refuse or slow anyone; at most once a minute per instance. */
function sweepNow(now: Date) {
	if (now.getTime() - lastSweep < SWEEP_EVERY_MS) return;
	lastSweep = now.getTime();
	void sweepExpiredLimits(now).catch((e: unknown) => console.warn('[auth] could not sweep sign-in limits:', (e as Error).name));
}

export async function sweepExpiredLimits(now = new Date()): Promise<number> {
	const gone = await db.delete(authLimit).where(lte(authLimit.expiresAt, now)).returning({ kind: authLimit.kind });
	return gone.length;
}

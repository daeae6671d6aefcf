// Limits on guessing passwords (OWASP ASVS 6.3.1, and the OWASP Authentication Cheat Sheet's
// advice that lockouts must not hand an attacker a way to lock people out). Plain rules, no I/O:
// src/lib/server/rate-limit.ts keeps the counts in PostgreSQL.
//
// - Failures are counted per account *and* client address together. After `perAccount` wrong
//   passwords for one account from one address, that address may not try that account again
//   until the window (15 minutes from the first failure) ends, whatever password it sends.
//   Nobody else is affected: the owner of the account signs in from their own address as usual.
// - An address that fails on many accounts is slowed: past `perAddress` failures in the window
//   (summed over all accounts it tried), each further attempt from it must wait a pause that
//   doubles with every further failure, up to `backoffMaxMs`. It is never locked out for good,
//   so people behind the same address (an office, a mobile network) only ever wait a little.
// - Sign-ups are counted per address: `signUpsPerAddress` in each window.
// Refused attempts are not counted: they check no password.

export const MINUTE_MS = 60_000;

export interface SignInLimitConfig {
	/** Wrong passwords for one account from one address before that pair is refused. */
	perAccount: number;
	/** Wrong passwords from one address, over all accounts, before it is slowed. */
	perAddress: number;
	/** Sign-ups from one address in a window. */
	signUpsPerAddress: number;
	windowMs: number;
	/** The first pause for an address past its limit; each further failure doubles it. */
	backoffBaseMs: number;
	backoffMaxMs: number;
}

export const DEFAULT_LIMITS: SignInLimitConfig = {
	perAccount: 5,
	perAddress: 30,
	signUpsPerAddress: 30,
	windowMs: 15 * MINUTE_MS,
	backoffBaseMs: 2_000,
	backoffMaxMs: 5 * MINUTE_MS
};

/**
 * The limits from the environment: AUTH_RATE_LIMIT_PER_ACCOUNT (wrong passwords per account and
 * address) and AUTH_RATE_LIMIT_PER_IP (wrong passwords per address before it is slowed, and
 * sign-ups per address). Anything that is not a positive whole number keeps the default.
 */
export function limitConfig(env: Record<string, string | undefined>): SignInLimitConfig {
	const perAccount = positive(env.AUTH_RATE_LIMIT_PER_ACCOUNT) ?? DEFAULT_LIMITS.perAccount;
	const perAddress = positive(env.AUTH_RATE_LIMIT_PER_IP) ?? DEFAULT_LIMITS.perAddress;
	return { ...DEFAULT_LIMITS, perAccount, perAddress, signUpsPerAddress: perAddress };
}

function positive(raw: string | undefined): number | undefined {
	const n = Number(raw);
	return raw !== undefined && raw.trim() !== '' && Number.isSafeInteger(n) && n > 0 ? n : undefined;
}

/** A count in its window (times in ms since the epoch). */
export interface Counter {
	count: number;
	windowStartedAt: number;
	lastAt: number;
}

export interface SignInState {
	/** This account's failures from this address, if any are counted. */
	pair: Counter | null;
	/** This address's failures over every account, in windows still open. */
	address: { failures: number; lastFailureAt: number | null };
}

export type LimitVerdict =
	{ allowed: true } | { allowed: false; reason: 'account' | 'address' | 'sign-up'; retryAfterSeconds: number };

/** May this address try this account now? */
export function judgeSignIn(state: SignInState, config: SignInLimitConfig, now: number): LimitVerdict {
	const { pair, address } = state;
	if (pair && isLive(pair, config, now) && pair.count >= config.perAccount) {
		return refuse('account', windowEnd(pair, config) - now);
	}
	if (address.failures >= config.perAddress && address.lastFailureAt !== null) {
		const until = address.lastFailureAt + addressPause(address.failures, config);
		if (until > now) return refuse('address', until - now);
	}
	return { allowed: true };
}

/** How long an address with this many failures waits after its last one. */
export function addressPause(failures: number, config: SignInLimitConfig): number {
	if (failures < config.perAddress) return 0;
	const doublings = Math.min(failures - config.perAddress, 30);
	return Math.min(config.backoffMaxMs, config.backoffBaseMs * 2 ** doublings);
}

/** May this address sign up again? `counter` is its sign-ups so far. */
export function judgeSignUp(counter: Counter | null, config: SignInLimitConfig, now: number): LimitVerdict {
	if (counter && isLive(counter, config, now) && counter.count >= config.signUpsPerAddress) {
		return refuse('sign-up', windowEnd(counter, config) - now);
	}
	return { allowed: true };
}

/** The counter after one more event: a closed window starts again from this event. */
export function countOne(counter: Counter | null, config: SignInLimitConfig, now: number): Counter {
	if (!counter || !isLive(counter, config, now)) return { count: 1, windowStartedAt: now, lastAt: now };
	return { count: counter.count + 1, windowStartedAt: counter.windowStartedAt, lastAt: now };
}

export function windowEnd(counter: Counter, config: SignInLimitConfig): number {
	return counter.windowStartedAt + config.windowMs;
}

/** When a stored counter can be deleted: its window is over and it can no longer slow anyone. */
export function expiresAt(counter: Counter, config: SignInLimitConfig): number {
	return Math.max(windowEnd(counter, config), counter.lastAt + config.backoffMaxMs);
}

function isLive(counter: Counter, config: SignInLimitConfig, now: number): boolean {
	return windowEnd(counter, config) > now;
}

function refuse(reason: 'account' | 'address' | 'sign-up', ms: number): LimitVerdict {
	return { allowed: false, reason, retryAfterSeconds: Math.max(1, Math.ceil(ms / 1000)) };
}

/** "Wait 3 minutes" / "Wait 40 seconds": how long, in words a person reads. */
export function waitWords(seconds: number): string {
	if (seconds < 60) return `${seconds} second${seconds === 1 ? '' : 's'}`;
	const minutes = Math.ceil(seconds / 60);
	return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}

/** The account as counted: e-mail addresses differ in case only in how they are typed. */
export function accountKey(email: string): string {
	return email.trim().toLowerCase();
}

/**
 * The client as counted. An IPv4 address (also inside IPv6 as ::ffff:a.b.c.d) counts alone; an
 * IPv6 address counts by its /64 network, since one subscriber usually holds a whole /64 and
 * could otherwise take a fresh address for every guess (RFC 6177 on end-site prefixes).
 */
export function addressKey(ip: string): string {
	const raw = ip
		.trim()
		.toLowerCase()
		.replace(/^\[|\]$/g, '')
		.replace(/%.*$/, '');
	const mapped = /^::ffff:(\d{1,3}(?:\.\d{1,3}){3})$/.exec(raw);
	if (mapped) return mapped[1]!;
	if (!raw.includes(':')) return raw;
	const groups = expandIpv6(raw);
	return groups ? `${groups.slice(0, 4).join(':')}::/64` : raw;
}

function expandIpv6(ip: string): string[] | null {
	const halves = ip.split('::');
	if (halves.length > 2) return null;
	const head = halves[0] ? halves[0].split(':') : [];
	const tail = halves.length === 2 && halves[1] ? halves[1].split(':') : [];
	if (tail.some((g) => g.includes('.')) || head.some((g) => g.includes('.'))) return null;
	const missing = 8 - head.length - tail.length;
	if (halves.length === 1 ? missing !== 0 : missing < 0) return null;
	const groups = [...head, ...Array<string>(missing).fill('0'), ...tail];
	if (!groups.every((g) => /^[0-9a-f]{1,4}$/.test(g))) return null;
	return groups.map((g) => g.replace(/^0+(?=.)/, ''));
}

// Brute-force limits on sign-in (OWASP ASVS 6.3.1). One process serves the studio, so counting
// in memory is enough; a restart forgets the counts, which only ever helps the legitimate user.
import { env } from '$env/dynamic/private';

interface Bucket {
	count: number;
	resetAt: number;
}

/**
 * Fixed-window counters by key, with bounded memory. Every bucket lives for the same window and
 * is (re)inserted when its window opens, so the Map's insertion order is also the order of
 * expiry: each `hit` drops the expired buckets at the front, and past `maxEntries` the oldest
 * buckets (the ones closest to expiring anyway) make room. Only `hit` makes a bucket; a look
 * (`peek`) never does.
 */
export class RateLimitStore {
	private readonly buckets = new Map<string, Bucket>();

	constructor(
		readonly windowMs: number,
		readonly maxEntries: number
	) {}

	get size() {
		return this.buckets.size;
	}

	/** The live bucket for a key, if there is one; makes none. */
	peek(key: string, now = Date.now()): Readonly<Bucket> | undefined {
		const b = this.buckets.get(key);
		if (b && b.resetAt <= now) {
			this.buckets.delete(key);
			return undefined;
		}
		return b;
	}

	/** Counts one more event for the key, opening a new window when there is none. */
	hit(key: string, now = Date.now()): Readonly<Bucket> {
		this.dropExpired(now);
		let b = this.peek(key, now) as Bucket | undefined;
		if (!b) {
			for (const oldest of this.buckets.keys()) {
				if (this.buckets.size < this.maxEntries) break;
				this.buckets.delete(oldest);
			}
			b = { count: 0, resetAt: now + this.windowMs };
			this.buckets.set(key, b);
		}
		b.count++;
		return b;
	}

	delete(key: string) {
		this.buckets.delete(key);
	}

	clear() {
		this.buckets.clear();
	}

	private dropExpired(now: number) {
		for (const [key, b] of this.buckets) {
			if (b.resetAt > now) break;
			this.buckets.delete(key);
		}
	}
}

const WINDOW_MS = 15 * 60 * 1000;
// About 10 MB at most. Every bucket needs a failed attempt that was not itself limited, so one
// address can open at most its per-address limit of account buckets per window.
const MAX_BUCKETS = 50_000;

/** Failed sign-ins allowed per account and per address, and sign-ups per address, in each window. */
export function signInLimits() {
	return { perAccount: Number(env.AUTH_RATE_LIMIT_PER_ACCOUNT ?? 5), perIp: Number(env.AUTH_RATE_LIMIT_PER_IP ?? 30) };
}

const store = new RateLimitStore(WINDOW_MS, MAX_BUCKETS);

/** How many buckets are held (for tests and diagnostics). */
export function trackedBuckets(): number {
	return store.size;
}

/** Forgets every count (for tests). */
export function resetRateLimits() {
	store.clear();
}

export interface LimitResult {
	limited: boolean;
	retryAfterSeconds: number;
}

function over(b: Readonly<Bucket> | undefined, max: number): b is Readonly<Bucket> {
	return !!b && b.count >= max;
}

/** Is another sign-in attempt allowed for this address and this e-mail? Only looks; counts nothing. */
export function checkSignInLimit(ip: string, email: string, now = Date.now()): LimitResult {
	const byIp = store.peek(`ip:${ip}`, now);
	const byAccount = store.peek(`acct:${email.toLowerCase()}`, now);
	const { perAccount, perIp } = signInLimits();
	const ipOver = over(byIp, perIp);
	const accountOver = over(byAccount, perAccount);
	if (!ipOver && !accountOver) return { limited: false, retryAfterSeconds: 0 };
	const resetAt = Math.max(ipOver ? byIp.resetAt : 0, accountOver ? byAccount.resetAt : 0);
	return { limited: true, retryAfterSeconds: Math.ceil((resetAt - now) / 1000) };
}

export function recordSignInFailure(ip: string, email: string, now = Date.now()) {
	store.hit(`ip:${ip}`, now);
	store.hit(`acct:${email.toLowerCase()}`, now);
}

export function recordSignInSuccess(email: string) {
	store.delete(`acct:${email.toLowerCase()}`);
}

/** Sign-ups from one address. */
export function checkAndCountSignUp(ip: string, now = Date.now()): LimitResult {
	const b = store.peek(`signup:${ip}`, now);
	if (over(b, signInLimits().perIp)) return { limited: true, retryAfterSeconds: Math.ceil((b.resetAt - now) / 1000) };
	store.hit(`signup:${ip}`, now);
	return { limited: false, retryAfterSeconds: 0 };
}

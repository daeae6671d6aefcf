// Brute-force limits on sign-in (OWASP ASVS 6.3.1). One process serves the studio, so counting
// in memory is enough; a restart forgets the counts, which only ever helps the legitimate user.
import { env } from '$env/dynamic/private';

interface Bucket {
	count: number;
	resetAt: number;
}

const buckets = new Map<string, Bucket>();

function bucket(key: string, windowMs: number, now: number): Bucket {
	let b = buckets.get(key);
	if (!b || b.resetAt <= now) {
		b = { count: 0, resetAt: now + windowMs };
		buckets.set(key, b);
	}
	return b;
}

const WINDOW_MS = 15 * 60 * 1000;
const PER_ACCOUNT = () => Number(env.AUTH_RATE_LIMIT_PER_ACCOUNT ?? 5);
const PER_IP = () => Number(env.AUTH_RATE_LIMIT_PER_IP ?? 30);

export interface LimitResult {
	limited: boolean;
	retryAfterSeconds: number;
}

/** Is another sign-in attempt allowed for this address and this e-mail? */
export function checkSignInLimit(ip: string, email: string, now = Date.now()): LimitResult {
	const byIp = bucket(`ip:${ip}`, WINDOW_MS, now);
	const byAccount = bucket(`acct:${email.toLowerCase()}`, WINDOW_MS, now);
	const limited = byIp.count >= PER_IP() || byAccount.count >= PER_ACCOUNT();
	const resetAt = Math.max(byIp.count >= PER_IP() ? byIp.resetAt : 0, byAccount.count >= PER_ACCOUNT() ? byAccount.resetAt : 0);
	return { limited, retryAfterSeconds: limited ? Math.ceil((resetAt - now) / 1000) : 0 };
}

export function recordSignInFailure(ip: string, email: string, now = Date.now()) {
	bucket(`ip:${ip}`, WINDOW_MS, now).count++;
	bucket(`acct:${email.toLowerCase()}`, WINDOW_MS, now).count++;
}

export function recordSignInSuccess(email: string) {
	buckets.delete(`acct:${email.toLowerCase()}`);
}

/** Sign-ups from one address. */
export function checkAndCountSignUp(ip: string, now = Date.now()): LimitResult {
	const b = bucket(`signup:${ip}`, WINDOW_MS, now);
	if (b.count >= PER_IP()) return { limited: true, retryAfterSeconds: Math.ceil((b.resetAt - now) / 1000) };
	b.count++;
	return { limited: false, retryAfterSeconds: 0 };
}

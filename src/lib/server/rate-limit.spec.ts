import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import {
	RateLimitStore,
	checkAndCountSignUp,
	checkSignInLimit,
	recordSignInFailure,
	recordSignInSuccess,
	resetRateLimits,
	signInLimits,
	trackedBuckets
} from './rate-limit';

const MINUTE = 60_000;
const WINDOW = 15 * MINUTE;

beforeEach(() => {
	vi.useFakeTimers();
	vi.setSystemTime(new Date('2030-03-04T10:00:00Z'));
	resetRateLimits();
});
afterEach(() => {
	vi.useRealTimers();
});

describe('RateLimitStore', () => {
	it('counts within a window and starts again after it', () => {
		const store = new RateLimitStore(WINDOW, 100);
		store.hit('k');
		store.hit('k');
		expect(store.peek('k')?.count).toBe(2);
		vi.advanceTimersByTime(WINDOW - 1);
		expect(store.hit('k').count).toBe(3);
		vi.advanceTimersByTime(1);
		expect(store.peek('k')).toBeUndefined();
		expect(store.hit('k').count).toBe(1);
	});

	it('makes no bucket when only looking', () => {
		const store = new RateLimitStore(WINDOW, 100);
		for (let i = 0; i < 50; i++) expect(store.peek(`look-${i}`)).toBeUndefined();
		expect(store.size).toBe(0);
	});

	it('drops expired buckets as time passes, without being asked about them', () => {
		const store = new RateLimitStore(WINDOW, 10_000);
		for (let i = 0; i < 1000; i++) store.hit(`old-${i}`);
		vi.advanceTimersByTime(5 * MINUTE);
		for (let i = 0; i < 10; i++) store.hit(`newer-${i}`);
		expect(store.size).toBe(1010);
		vi.advanceTimersByTime(WINDOW - 5 * MINUTE);
		store.hit('fresh');
		// The first thousand have expired; the ten from five minutes later are still counting.
		expect(store.size).toBe(11);
		vi.advanceTimersByTime(5 * MINUTE);
		store.hit('fresh-2');
		expect(store.size).toBe(2);
	});

	it('never holds more than its cap, letting the oldest go first', () => {
		const store = new RateLimitStore(WINDOW, 3);
		for (const k of ['a', 'b', 'c']) {
			store.hit(k);
			vi.advanceTimersByTime(1000);
		}
		store.hit('d');
		expect(store.size).toBe(3);
		expect(store.peek('a')).toBeUndefined();
		expect(['b', 'c', 'd'].map((k) => store.peek(k)?.count)).toEqual([1, 1, 1]);
		for (let i = 0; i < 10_000; i++) store.hit(`flood-${i}`);
		expect(store.size).toBe(3);
	});

	it('keeps counting an existing bucket when full', () => {
		const store = new RateLimitStore(WINDOW, 2);
		store.hit('a');
		store.hit('b');
		expect(store.hit('b').count).toBe(2);
		expect(store.size).toBe(2);
		expect(store.peek('a')?.count).toBe(1);
	});
});

describe('sign-in limits', () => {
	const ip = '203.0.113.7';

	it('limits an account after its failures and lets it go when the window ends', () => {
		const { perAccount } = signInLimits();
		for (let i = 0; i < perAccount; i++) {
			expect(checkSignInLimit(ip, 'Band@Example.test').limited).toBe(false);
			recordSignInFailure(ip, 'Band@Example.test');
		}
		const limited = checkSignInLimit('198.51.100.9', 'band@example.test');
		expect(limited.limited).toBe(true);
		expect(limited.retryAfterSeconds).toBe(WINDOW / 1000);
		vi.advanceTimersByTime(WINDOW);
		expect(checkSignInLimit(ip, 'band@example.test').limited).toBe(false);
	});

	it('forgets an account’s failures on a successful sign-in', () => {
		recordSignInFailure(ip, 'x@example.test');
		recordSignInSuccess('x@example.test');
		expect(trackedBuckets()).toBe(1); // the address's count stays
	});

	it('checks without keeping anything, so guessing e-mails from a limited address costs no memory', () => {
		const { perIp } = signInLimits();
		for (let i = 0; i < perIp; i++) recordSignInFailure(ip, `guess-${i}@example.test`);
		const before = trackedBuckets();
		for (let i = 0; i < 5000; i++) expect(checkSignInLimit(ip, `more-${i}@example.test`).limited).toBe(true);
		expect(trackedBuckets()).toBe(before);
	});

	it('holds nothing once every window has ended', () => {
		for (let i = 0; i < 200; i++) recordSignInFailure(`198.51.100.${i}`, `someone-${i}@example.test`);
		expect(trackedBuckets()).toBe(400);
		vi.advanceTimersByTime(WINDOW);
		recordSignInFailure(ip, 'late@example.test');
		expect(trackedBuckets()).toBe(2);
	});

	it('limits sign-ups per address', () => {
		const { perIp } = signInLimits();
		for (let i = 0; i < perIp; i++) expect(checkAndCountSignUp(ip).limited).toBe(false);
		expect(checkAndCountSignUp(ip)).toEqual({ limited: true, retryAfterSeconds: WINDOW / 1000 });
		expect(checkAndCountSignUp('198.51.100.1').limited).toBe(false);
		vi.advanceTimersByTime(WINDOW);
		expect(checkAndCountSignUp(ip).limited).toBe(false);
	});
});

import { describe, expect, it } from 'vitest';
import {
	DEFAULT_LIMITS,
	MINUTE_MS,
	accountKey,
	addressKey,
	addressPause,
	countOne,
	expiresAt,
	judgeSignIn,
	judgeSignUp,
	limitConfig,
	waitWords,
	type Counter,
	type SignInState
} from './sign-in-limits';

const config = DEFAULT_LIMITS;
const T0 = Date.parse('2030-03-04T10:00:00Z');
const clean: SignInState = { pair: null, address: { failures: 0, lastFailureAt: null } };

function failures(n: number, start = T0): Counter {
	let c: Counter | null = null;
	for (let i = 0; i < n; i++) c = countOne(c, config, start + i * 1000);
	return c!;
}

describe('one account from one address', () => {
	it('allows the first five wrong passwords and refuses the sixth attempt until the window ends', () => {
		const pair = failures(4);
		expect(judgeSignIn({ ...clean, pair }, config, T0 + 5000)).toEqual({ allowed: true });
		const five = failures(5);
		const now = T0 + 10_000;
		const refused = judgeSignIn({ ...clean, pair: five }, config, now);
		expect(refused).toEqual({ allowed: false, reason: 'account', retryAfterSeconds: (15 * MINUTE_MS - 10_000) / 1000 });
		expect(judgeSignIn({ ...clean, pair: five }, config, T0 + 15 * MINUTE_MS).allowed).toBe(true);
	});

	it('starts counting again once the window has ended', () => {
		const old = failures(5);
		const later = countOne(old, config, T0 + 16 * MINUTE_MS);
		expect(later).toEqual({ count: 1, windowStartedAt: T0 + 16 * MINUTE_MS, lastAt: T0 + 16 * MINUTE_MS });
	});

	it('knows nothing of other addresses: a clean address is always let through', () => {
		// What the store hands over for address B when only address A guessed: nothing.
		expect(judgeSignIn(clean, config, T0)).toEqual({ allowed: true });
	});
});

describe('one address over many accounts', () => {
	it('is slowed past its limit, with a pause that doubles up to the cap, and never locked for good', () => {
		expect(addressPause(29, config)).toBe(0);
		expect(addressPause(30, config)).toBe(2000);
		expect(addressPause(31, config)).toBe(4000);
		expect(addressPause(40, config)).toBe(5 * MINUTE_MS);
		expect(addressPause(10_000, config)).toBe(5 * MINUTE_MS);
		const state = { pair: null, address: { failures: 32, lastFailureAt: T0 } };
		expect(judgeSignIn(state, config, T0 + 1000)).toEqual({ allowed: false, reason: 'address', retryAfterSeconds: 7 });
		expect(judgeSignIn(state, config, T0 + 8000)).toEqual({ allowed: true });
	});

	it('is not slowed below its limit', () => {
		expect(judgeSignIn({ pair: null, address: { failures: 29, lastFailureAt: T0 } }, config, T0).allowed).toBe(true);
	});

	it('the account rule comes first when both apply', () => {
		const verdict = judgeSignIn({ pair: failures(5), address: { failures: 50, lastFailureAt: T0 } }, config, T0 + 10_000);
		expect(verdict).toMatchObject({ allowed: false, reason: 'account' });
	});
});

describe('sign-ups', () => {
	it('allows a number per address in each window', () => {
		const c = failures(30);
		expect(judgeSignUp(failures(29), config, T0 + 30_000).allowed).toBe(true);
		expect(judgeSignUp(c, config, T0 + 30_000)).toMatchObject({ allowed: false, reason: 'sign-up' });
		expect(judgeSignUp(c, config, T0 + 15 * MINUTE_MS).allowed).toBe(true);
	});
});

describe('storage helpers', () => {
	it('keeps a counter while it can still refuse or slow anyone', () => {
		const c = failures(3);
		expect(expiresAt(c, config)).toBe(Math.max(T0 + 15 * MINUTE_MS, c.lastAt + 5 * MINUTE_MS));
		const late: Counter = { count: 40, windowStartedAt: T0, lastAt: T0 + 14 * MINUTE_MS };
		expect(expiresAt(late, config)).toBe(T0 + 19 * MINUTE_MS);
	});

	it('reads the environment knobs, keeping defaults for nonsense', () => {
		expect(limitConfig({})).toMatchObject({ perAccount: 5, perAddress: 30, signUpsPerAddress: 30 });
		expect(limitConfig({ AUTH_RATE_LIMIT_PER_ACCOUNT: '3', AUTH_RATE_LIMIT_PER_IP: '400' })).toMatchObject({
			perAccount: 3,
			perAddress: 400,
			signUpsPerAddress: 400
		});
		for (const bad of ['', 'x', '0', '-2', '1.5']) {
			expect(limitConfig({ AUTH_RATE_LIMIT_PER_ACCOUNT: bad }).perAccount).toBe(5);
		}
	});

	it('says how long to wait in words', () => {
		expect(waitWords(1)).toBe('1 second');
		expect(waitWords(40)).toBe('40 seconds');
		expect(waitWords(61)).toBe('2 minutes');
		expect(waitWords(60)).toBe('1 minute');
	});

	it('counts an account whatever its case, and an IPv6 client by its /64', () => {
		expect(accountKey(' Band@Example.TEST ')).toBe('band@example.test');
		expect(addressKey('203.0.113.7')).toBe('203.0.113.7');
		expect(addressKey('::ffff:203.0.113.7')).toBe('203.0.113.7');
		expect(addressKey('2001:db8:1:2:aaaa:bbbb:cccc:dddd')).toBe('2001:db8:1:2::/64');
		expect(addressKey('2001:DB8:1:2::99')).toBe('2001:db8:1:2::/64');
		expect(addressKey('2001:0db8:0001:0002:0:0:0:1')).toBe('2001:db8:1:2::/64');
		expect(addressKey('::1')).toBe('0:0:0:0::/64');
		expect(addressKey('fe80::1%eth0')).toBe('fe80:0:0:0::/64');
	});
});

describe('edges of the limits', () => {
	it('slows an address from its 30th failure on: the first pause is 2 s', () => {
		const state: SignInState = { pair: null, address: { failures: 30, lastFailureAt: T0 } };
		expect(judgeSignIn(state, config, T0 + 500)).toEqual({ allowed: false, reason: 'address', retryAfterSeconds: 2 });
		expect(judgeSignIn(state, config, T0 + 1_000)).toEqual({ allowed: false, reason: 'address', retryAfterSeconds: 1 });
		expect(judgeSignIn(state, config, T0 + 2_000)).toEqual({ allowed: true });
	});

	it('tells a refused sign-up to come back when its window ends', () => {
		// 30 sign-ups from T0 on; the window ends at T0 + 15 min, 10 minutes after T0 + 5 min.
		expect(judgeSignUp(failures(30), config, T0 + 5 * MINUTE_MS)).toEqual({
			allowed: false,
			reason: 'sign-up',
			retryAfterSeconds: 600
		});
	});
});

describe('client addresses as counted', () => {
	it('reads an address with spaces, brackets or a zone the same as without', () => {
		expect(addressKey(' 203.0.113.7\n')).toBe('203.0.113.7');
		expect(addressKey('[2001:db8:1:2::99]')).toBe('2001:db8:1:2::/64');
		expect(addressKey('[::1]')).toBe('0:0:0:0::/64');
	});

	it('fills “::” with the zero groups it stands for, wherever it sits (RFC 4291 §2.2)', () => {
		expect(addressKey('1::2:3:4:5:6')).toBe('1:0:0:2::/64');
		expect(addressKey('2001:db8::')).toBe('2001:db8:0:0::/64');
		expect(addressKey('2001:db8:1:2::a:b')).toBe('2001:db8:1:2::/64');
	});

	it('keeps what is not an address as it came, so it still counts alone', () => {
		for (const odd of [
			'1::2::3', // two “::”
			'1:2:3:4:5:6:7', // seven groups
			'1:2:3:4:5:6:7:8:9', // nine
			'1:2:3:4::5:6:7:8:9', // nine around a “::”
			'2001:db8:zz::1', // not hexadecimal
			'2001:db8:x1::1',
			'2001:db8:12345::1', // five digits
			'1::ffff:192.0.2.1', // not the IPv4-mapped prefix
			'::ffff:192.0.2.1234'
		]) {
			expect(addressKey(odd), odd).toBe(odd);
		}
	});
});

import { describe, expect, it } from 'vitest';
import { safeNext } from './auth';

describe('safeNext', () => {
	it.each([
		'/bookings',
		'/book?room=live-room&start=2030-03-04T10%3A00&end=2030-03-04T14%3A00',
		'/bookings/0b6c5d9e-1f0a-4c4e-9d7e-3a1f2b3c4d5e#pay',
		'/studio/people?q=a%2Fb',
		'/calendar?month=2030-03'
	])('keeps the same-site path %j', (next) => {
		expect(safeNext(next)).toBe(next);
	});

	it.each([
		['nothing', ''],
		['a missing value', null],
		['an absolute URL', 'https://evil.test/'],
		['a scheme', 'javascript:alert(1)'],
		['a relative path', 'bookings'],
		['a protocol-relative URL', '//evil.test'],
		['a backslash after the slash', '/\\evil.test'],
		['a backslash later on', '/a\\..\\\\evil.test'],
		['a tab after the slash', '/\t/evil.test'],
		['a newline after the slash', '/\n/evil.test'],
		['a carriage return', '/\r/evil.test'],
		['a NUL', '/\u0000/evil.test'],
		['DEL', '/\u007f/evil.test'],
		['an encoded tab', '/%09/evil.test'],
		['an encoded newline', '/%0a/evil.test'],
		['encoded slashes', '/%2F%2Fevil.test'],
		['an encoded backslash', '/%5Cevil.test'],
		['a dot segment collapsing to //', '/.//evil.test'],
		['a parent segment collapsing to //', '/..//evil.test'],
		['broken percent-encoding', '/%E0%A4%A'],
		['something too long', `/${'a'.repeat(600)}`]
	])('refuses %s', (_what, next) => {
		expect(safeNext(next)).toBeNull();
	});
});

import { describe, expect, it } from 'vitest';
import { judgeRequestOrigin } from './request-origin';

const appOrigin = 'https://studio.example.test';
const base = { method: 'POST', pathname: '/api/bookings/1/cancel', origin: null, secFetchSite: null, appOrigin };

describe('judgeRequestOrigin', () => {
	it('lets the app’s own origin through', () => {
		expect(judgeRequestOrigin({ ...base, origin: appOrigin }).ok).toBe(true);
		expect(judgeRequestOrigin({ ...base, secFetchSite: 'same-origin' }).ok).toBe(true);
	});

	it.each([
		'https://studio.example.test:8443',
		'http://studio.example.test',
		'https://other.example.test',
		'https://studio.example.test.evil.test',
		'null'
	])('refuses Origin %s', (origin) => {
		expect(judgeRequestOrigin({ ...base, origin }).ok).toBe(false);
	});

	it('refuses cross-site and same-site fetch metadata without an Origin', () => {
		for (const site of ['cross-site', 'same-site', 'none']) {
			expect(judgeRequestOrigin({ ...base, secFetchSite: site }).ok).toBe(false);
		}
	});

	it('trusts Origin over fetch metadata', () => {
		expect(judgeRequestOrigin({ ...base, origin: 'https://other.example.test', secFetchSite: 'same-origin' }).ok).toBe(false);
	});

	it('checks every method that may change something, on every API path', () => {
		for (const method of ['POST', 'PUT', 'PATCH', 'DELETE', 'delete']) {
			expect(judgeRequestOrigin({ ...base, method, origin: 'https://other.example.test' }).ok).toBe(false);
		}
		expect(judgeRequestOrigin({ ...base, pathname: '/api/auth/sign-out', origin: 'https://other.example.test' }).ok).toBe(false);
		// A studio's own endpoints, under its short name.
		for (const pathname of ['/api/studios/hollow-pine/bookings', '/api/studios/hollow-pine/quote']) {
			expect(judgeRequestOrigin({ ...base, pathname, origin: 'https://other.example.test' }).ok).toBe(false);
			expect(judgeRequestOrigin({ ...base, pathname, origin: appOrigin }).ok).toBe(true);
		}
	});

	it('leaves safe methods, pages and the signed webhook alone', () => {
		const other = 'https://other.example.test';
		expect(judgeRequestOrigin({ ...base, method: 'GET', origin: other }).ok).toBe(true);
		expect(judgeRequestOrigin({ ...base, method: 'HEAD', origin: other }).ok).toBe(true);
		expect(judgeRequestOrigin({ ...base, pathname: '/apiary', origin: other }).ok).toBe(true);
		expect(judgeRequestOrigin({ ...base, pathname: '/api/stripe/webhook', origin: other }).ok).toBe(true);
		expect(judgeRequestOrigin({ ...base, pathname: '/api/stripe/connect-webhook', origin: other }).ok).toBe(true);
	});

	it('lets a program that sends neither header through (it holds the cookie itself)', () => {
		expect(judgeRequestOrigin(base).ok).toBe(true);
	});
});

import { describe, expect, it } from 'vitest';
import { describeError, redactText, safeLogArgs } from './log-redaction';

const token = 'Qm7tZ2xkLpV9aYwR3cNfH8sJdE4uKbT6';

describe('redactText', () => {
	it('drops a failed query’s parameters and keeps the query', () => {
		const text = `Failed query: select "id", "token" from "session" where "session"."token" = $1\nparams: ${token}`;
		const out = redactText(text);
		expect(out).not.toContain(token);
		expect(out).toContain('from "session" where');
	});

	it('hides cookie and authorization values', () => {
		expect(redactText(`cookie: better-auth.session_token=abc.def; other=1`)).not.toContain('abc.def');
		expect(redactText('Authorization: Bearer short')).not.toContain('short');
		expect(redactText(`{"set-cookie":"x=${token}"}`)).not.toContain(token);
	});

	it('hides long random-looking runs anywhere, such as a feed token in a path', () => {
		const feed = 'q3Zr-8kLw_1yP0aXbVnCmTs4RfGhJuEiOdWq2xYz7kA';
		expect(redactText(`GET /feed/${feed}/sessions.ics`)).toBe('GET /feed/[redacted]/sessions.ics');
		expect(redactText(`token ${token} failed`)).toBe('token [redacted] failed');
	});

	it('keeps words, codes and file paths readable', () => {
		for (const text of [
			'INTERNAL_SERVER_ERROR',
			'FAILED_TO_GET_SESSION',
			'invalid byte sequence for encoding "UTF8": 0x00',
			'at file:///srv/app/build/server/chunks/hooks.server.js:120:15',
			'better-auth.session_token'
		]) {
			expect(redactText(text)).toBe(text);
		}
	});
});

describe('describeError', () => {
	it('names the error, its code and its causes, without the secret in any of them', () => {
		const cause = Object.assign(new Error(`Failed query: select 1 where token = $1\nparams: ${token}`), { code: '22021' });
		const top = new Error('FAILED_TO_GET_SESSION', { cause });
		const text = describeError(top);
		expect(text).not.toContain(token);
		expect(text).toMatch(/^Error: FAILED_TO_GET_SESSION\ncaused by Error \[22021\]: Failed query: select 1 where token = \$1/);
		expect(text).toMatch(/\n\s+at /);
	});

	it('describes what is not an Error without printing it', () => {
		expect(describeError('boom')).toBe('string value');
		expect(safeLogArgs([{ cookie: token }, 3, `x ${token}`])).toEqual(['(Object not logged)', '3', 'x [redacted]']);
	});
});

describe('redactText, rule by rule', () => {
	it('drops everything from “params:” on, in any case, but not inside a longer word', () => {
		expect(redactText('Failed query: select 1\nPARAMS: a,b\nmore\nlines')).toBe('Failed query: select 1\nparams: [redacted]');
		expect(redactText('myparams: kept')).toBe('myparams: kept');
	});

	it('hides a cookie or authorization value to the end of its line, in JSON or header form', () => {
		expect(redactText('Cookie = a=b; c=d\nnext line')).toBe('Cookie = [redacted]\nnext line');
		expect(redactText('Set-Cookie: sid=abc; HttpOnly')).toBe('Set-Cookie: [redacted]');
		expect(redactText('{"authorization": "x y"}')).toBe('{"authorization": [redacted]');
		expect(redactText("'cookie'='v'")).toBe("'cookie'=[redacted]");
		expect(redactText('authorization=abc')).toBe('authorization=[redacted]');
		expect(redactText('cookies are baked')).toBe('cookies are baked');
	});

	it('hides the credential after Bearer or Basic, however spaced', () => {
		expect(redactText('Bearer abc.def')).toBe('Bearer [redacted]');
		expect(redactText('use basic   dXNlcjpw rest')).toBe('use basic [redacted] rest');
		expect(redactText('basically fine')).toBe('basically fine');
	});

	it('hides runs of 16 or more token characters that have a digit or both cases, with base64 padding', () => {
		expect(redactText('Ab345678901234 x')).toBe('Ab345678901234 x'); // 14 characters
		expect(redactText('Ab3456789012345 x')).toBe('Ab3456789012345 x'); // 15
		expect(redactText('Ab34567890123456 x')).toBe('[redacted] x'); // 16
		expect(redactText('abcdefghijklmnop1')).toBe('[redacted]'); // lower case and a digit
		expect(redactText('ABCDEFGHIJKLMNOP1')).toBe('[redacted]'); // upper case and a digit
		expect(redactText('abcdefghijklmnopQ')).toBe('[redacted]'); // both cases
		expect(redactText('abcdefghijklmnopq')).toBe('abcdefghijklmnopq'); // a long word
		expect(redactText('ABCDEFGHIJKLMNOPQ')).toBe('ABCDEFGHIJKLMNOPQ');
		expect(redactText('x=YWJjZGVmZ2hpamtsbW5vcA== y')).toBe('x=[redacted] y');
		expect(redactText('Ab34567890123456=== y')).toBe('[redacted]= y'); // at most two padding characters
		expect(redactText('ab+cd-ef_gh+ij-kl9 y')).toBe('[redacted] y');
		expect(redactText('at 2026-12-03T08:00:00Z')).toBe('at 2026-12-03T08:00:00Z');
	});
});

describe('describeError, part by part', () => {
	const chain = (n: number): unknown => {
		let e: unknown = undefined;
		for (let i = n - 1; i >= 0; i--) e = { name: 'E', message: `m${i}`, cause: e };
		return e;
	};

	it('follows at most five errors down the cause chain', () => {
		expect(describeError(chain(7))).toBe('E: m0\ncaused by E: m1\ncaused by E: m2\ncaused by E: m3\ncaused by E: m4');
		expect(describeError(chain(2))).toBe('E: m0\ncaused by E: m1');
		expect(describeError({ name: 'E', message: 'a', cause: null })).toBe('E: a');
		expect(describeError({ name: 'E', message: 'a', cause: 'str' })).toBe('E: a\ncaused by string value');
		expect(describeError({ name: 'E', message: 'a', cause: 0 })).toBe('E: a\ncaused by number value');
		expect(describeError(null)).toBe('');
		expect(describeError(undefined)).toBe('');
		expect(describeError(42)).toBe('number value');
	});

	it('names an error by its name, else its class, else Error; adds a string or number code', () => {
		class QueryFailure {
			message = 'x';
		}
		expect(describeError(new QueryFailure())).toBe('QueryFailure: x');
		expect(describeError(Object.assign(Object.create(null), { message: 'x' }))).toBe('Error: x');
		expect(describeError({ name: 7, message: 'x' })).toBe('Object: x');
		expect(describeError({ name: 'E', code: 404 })).toBe('E [404]');
		expect(describeError({ name: 'E', code: 'ECONNREFUSED', message: '' })).toBe('E [ECONNREFUSED]');
		expect(describeError({ name: 'E', code: { x: 1 }, message: 5 })).toBe('E');
	});

	it('keeps the first line of a message, at most 300 characters, redacted', () => {
		expect(describeError({ name: 'E', message: 'first\nsecond' })).toBe('E: first');
		expect(describeError({ name: 'E', message: 'y'.repeat(400) })).toBe(`E: ${'y'.repeat(300)}`);
		expect(describeError({ name: 'E', message: `bad ${token}` })).toBe('E: bad [redacted]');
	});

	it('adds the top error’s stack frames only: at most 12, redacted', () => {
		const frames = Array.from({ length: 14 }, (_, i) => `    at f${i} (/srv/app/x.js:${i}:1)`);
		const stack = [`E: secret ${token}`, 'E: failed at step 2', '  not a frame', 'at no indent', '    attack', ...frames].join(
			'\n'
		);
		const cause = { name: 'C', message: 'c', stack: '    at caused (/srv/c.js:1:1)' };
		expect(describeError({ name: 'E', message: 'm', stack, cause })).toBe(
			['E: m', 'caused by C: c', ...frames.slice(0, 12)].join('\n')
		);
		expect(describeError({ name: 'E', message: 'm', stack: `    at /feed/${token}/x.ics` })).toBe(
			'E: m\n    at /feed/[redacted]/x.ics'
		);
		expect(describeError({ name: 'E', message: 'm', stack: 5 })).toBe('E: m');
	});
});

describe('safeLogArgs, by kind', () => {
	it('prints plain values, describes errors and error-like objects, and names everything else', () => {
		const err = Object.assign(new Error('boom'), { stack: undefined });
		expect(safeLogArgs([null, undefined, true, 0, err, { name: 'E', message: 'm' }])).toEqual([
			'null',
			'undefined',
			'true',
			'0',
			'Error: boom',
			'E: m'
		]);
		expect(safeLogArgs([[token], new Map(), () => token, 1n, Symbol('s'), Object.create(null)])).toEqual([
			'(Array not logged)',
			'(Map not logged)',
			'(function not logged)',
			'(bigint not logged)',
			'(symbol not logged)',
			'(object not logged)'
		]);
	});
});

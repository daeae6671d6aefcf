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

import { describe, expect, it } from 'vitest';
import { NonexistentLocalTimeError, TimeInputError } from './errors';
import { parseBookingInstant } from './parse';
import { resolveWallTime } from './zoned';

const HELSINKI = 'Europe/Helsinki';

describe('parseBookingInstant', () => {
	it('takes an explicit offset or Z as the instant (RFC 3339 §5.6)', () => {
		expect(parseBookingInstant('2027-03-28T10:00:00+03:00', HELSINKI).toISOString()).toBe('2027-03-28T07:00:00.000Z');
		expect(parseBookingInstant('2027-03-28T07:00:00Z', HELSINKI).toISOString()).toBe('2027-03-28T07:00:00.000Z');
		expect(parseBookingInstant('2027-03-28T07:00Z', HELSINKI).toISOString()).toBe('2027-03-28T07:00:00.000Z');
		expect(parseBookingInstant('2027-03-28T07:00:00.250-05:30', HELSINKI).toISOString()).toBe('2027-03-28T12:30:00.250Z');
		// The offset wins even for a wall time that does not exist in the studio's zone.
		expect(parseBookingInstant('2027-03-28T03:30:00+02:00', HELSINKI).toISOString()).toBe('2027-03-28T01:30:00.000Z');
	});

	it('reads a local YYYY-MM-DDTHH:MM in the studio zone, with the gap and overlap rules', () => {
		// IANA tz: 10:00 on 2027-03-28 is already EEST (+03:00).
		expect(parseBookingInstant('2027-03-28T10:00', HELSINKI).toISOString()).toBe('2027-03-28T07:00:00.000Z');
		// RFC 5545 §3.3.5: repeated time -> first occurrence.
		expect(parseBookingInstant('2027-10-31T03:30', HELSINKI).toISOString()).toBe('2027-10-31T00:30:00.000Z');
		// Directive 2000/84/EC gap -> refused.
		expect(() => parseBookingInstant('2027-03-28T03:30', HELSINKI)).toThrow(NonexistentLocalTimeError);
	});

	it('errors clearly on anything else', () => {
		const bad = ['', '2027-03-28', '2027-03-28 10:00', '28.03.2027 10:00', '2027-03-28T10:00+0300', 'tomorrow'];
		for (const s of bad) {
			expect(() => parseBookingInstant(s, HELSINKI)).toThrow(/Not a date and time/);
		}
		expect(() => parseBookingInstant('2027-02-30T10:00:00Z', HELSINKI)).toThrow(/calendar date/);
		expect(() => parseBookingInstant('2027-03-28T25:00:00Z', HELSINKI)).toThrow(TimeInputError);
		expect(() => parseBookingInstant('2027-03-28T10:00:00+24:00', HELSINKI)).toThrow(/UTC offset/);
		expect(() => parseBookingInstant('2027-06-30T23:59:60Z', HELSINKI)).toThrow(TimeInputError); // leap seconds are not bookable
	});
});

describe('parseBookingInstant, as the recorded end of a session reads it (ISO 8601; RFC 5545 first occurrence; IANA tz)', () => {
	it('reads an instant with an offset or Z', () => {
		expect(parseBookingInstant('2027-03-02T16:00:00+02:00', HELSINKI)).toEqual(new Date('2027-03-02T14:00:00Z'));
		expect(parseBookingInstant('2027-03-02T14:00Z', HELSINKI)).toEqual(new Date('2027-03-02T14:00:00Z'));
	});

	it("reads a wall time without an offset in the studio's zone", () => {
		expect(parseBookingInstant('2027-07-01T10:00', HELSINKI)).toEqual(new Date('2027-07-01T07:00:00Z')); // summer time, UTC+3
	});

	it('refuses a wall time in the spring-forward gap: 2027-03-28 03:30 does not exist', () => {
		expect(() => parseBookingInstant('2027-03-28T03:30', HELSINKI)).toThrow(
			expect.objectContaining({ code: 'nonexistent-local-time' })
		);
	});

	it('reads a repeated wall time as its first occurrence: 2027-10-31 03:30 is 00:30 UTC', () => {
		expect(parseBookingInstant('2027-10-31T03:30', HELSINKI)).toEqual(new Date('2027-10-31T00:30:00Z'));
		expect(resolveWallTime('2027-10-31', '03:30', HELSINKI).kind).toBe('repeated');
	});

	it('refuses malformed input and impossible dates', () => {
		for (const text of ['2027-02-30T10:00', '2027-03-02 10:00', '2027-03-02T25:00', 'tomorrow', '2027-03-02T10:00+25:00']) {
			expect(() => parseBookingInstant(text, HELSINKI), text).toThrow(TimeInputError);
		}
	});
});

describe('parseBookingInstant at its edges (RFC 3339 offsets, seconds and fractions)', () => {
	const instantOf = (text: string) => {
		try {
			return parseBookingInstant(text, 'Europe/Helsinki').toISOString();
		} catch (e) {
			if (e instanceof TimeInputError) return 'invalid_time';
			throw e;
		}
	};

	it('subtracts a positive offset and adds a negative one, in hours and minutes', () => {
		// By hand: 10:07:30.25 at +05:30 is 04:37:30.250 UTC; at −03:30 it is 13:37:30.250 UTC.
		expect(instantOf('2027-03-02T10:07:30.25+05:30')).toBe('2027-03-02T04:37:30.250Z');
		expect(instantOf('2027-03-02T10:07:30.25-03:30')).toBe('2027-03-02T13:37:30.250Z');
		expect(instantOf('2027-03-02T10:00:30.125Z')).toBe('2027-03-02T10:00:30.125Z');
	});

	it('takes 23:59:59 and refuses an hour of 24, a minute or second of 60, and an offset without its colon', () => {
		expect(instantOf('2027-03-02T23:59:59Z')).toBe('2027-03-02T23:59:59.000Z');
		for (const text of ['2027-03-02T24:00Z', '2027-03-02T10:60Z', '2027-03-02T10:00:60Z', '2027-03-02T10:07+0530']) {
			expect(instantOf(text), text).toBe('invalid_time');
		}
	});

	it('reads nothing around the text', () => {
		expect(instantOf('x2027-03-02T10:00Z')).toBe('invalid_time');
		expect(instantOf('2027-03-02T10:00Zx')).toBe('invalid_time');
	});
});

describe('parseBookingInstant — the edges of the two forms (RFC 3339 §5.6 and the HTML datetime-local value)', () => {
	/** The TimeInputError thrown for `s`, as [code, message]. */
	function refusal(s: unknown): [string, string] {
		try {
			parseBookingInstant(s as string, HELSINKI);
		} catch (e) {
			if (e instanceof TimeInputError) return [e.code, e.message];
			throw e;
		}
		throw new Error(`expected a TimeInputError for ${String(s)}`);
	}

	it('asks for a date and time when none is given', () => {
		expect(refusal(undefined)).toEqual(['invalid-format', 'A date and time is required']);
	});

	it('takes offsets up to ±23:59 (RFC 3339 time-numoffset) and names a larger one', () => {
		expect(parseBookingInstant('2027-03-02T23:59+23:59', HELSINKI).toISOString()).toBe('2027-03-02T00:00:00.000Z');
		expect(parseBookingInstant('2027-03-02T00:00-23:59', HELSINKI).toISOString()).toBe('2027-03-02T23:59:00.000Z');
		expect(refusal('2027-03-02T10:00+24:00')).toEqual(['invalid-offset', 'Not a UTC offset: +24:00 in "2027-03-02T10:00+24:00"']);
		expect(refusal('2027-03-02T10:00+05:60')).toEqual(['invalid-offset', 'Not a UTC offset: +05:60 in "2027-03-02T10:00+05:60"']);
	});

	it('reads a local time only whole, with two-digit seconds, and says what it expected', () => {
		// Helsinki in March 2027 before the change: +02:00.
		expect(parseBookingInstant('2027-03-02T10:00:30', HELSINKI).toISOString()).toBe('2027-03-02T08:00:30.000Z');
		for (const text of ['x2027-03-02T10:00', '2027-03-02T10:00x', '2027-03-02T10:00:3', '2027-03-02T10:00:ab']) {
			expect(refusal(text), text).toEqual([
				'invalid-format',
				`Not a date and time: ${JSON.stringify(text)}; expected e.g. 2027-03-28T10:00:00+03:00, 2027-03-28T07:00:00Z or a local 2027-03-28T10:00`
			]);
		}
	});
});

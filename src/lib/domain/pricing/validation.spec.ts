import { describe, expect, it } from 'vitest';
import { DEMO_POLICY } from '../demo';
import { parseLocalOrOffset, toFieldErrors, validateBookingTimes } from './validation';
import { at, HELSINKI, openAllHours } from '$fixtures/pricing';

// Demo policy (src/lib/domain/demo.ts): open 09:00–23:00, min 2 h, 30-min grid, 24 h notice, 180 days ahead.
const now = at('2027-03-01', '12:00');
const codes = (start: Date, end: Date, policy = DEMO_POLICY, when = now) =>
	validateBookingTimes(start, end, policy, when).map((i) => `${i.field}:${i.code}`);

describe('validateBookingTimes (demo policy)', () => {
	it('accepts a half day on the grid inside opening hours', () => {
		expect(codes(at('2027-03-02', '14:00'), at('2027-03-02', '18:00'))).toEqual([]);
		expect(codes(at('2027-03-02', '19:00'), at('2027-03-02', '23:00'))).toEqual([]); // to closing
	});

	it('refuses an end before the start, and a booking under 2 h', () => {
		expect(codes(at('2027-03-02', '14:00'), at('2027-03-02', '13:00'))).toEqual(['end:end_not_after_start']);
		expect(codes(at('2027-03-02', '14:00'), at('2027-03-02', '15:30'))).toEqual(['end:under_minimum']);
	});

	it('refuses times off the 30-minute local grid', () => {
		expect(codes(at('2027-03-03', '14:15'), at('2027-03-03', '16:30'))).toEqual(['start:off_grid']);
		expect(codes(at('2027-03-03', '14:00'), at('2027-03-03', '16:10'))).toEqual(['end:off_grid']);
		expect(codes(new Date(at('2027-03-03', '14:00').getTime() + 1000), at('2027-03-03', '16:30'))).toEqual(['start:off_grid']);
	});

	it('refuses time outside opening hours', () => {
		expect(codes(at('2027-03-03', '08:00'), at('2027-03-03', '10:00'))).toEqual(['start:outside_opening_hours']);
		expect(codes(at('2027-03-03', '21:00'), at('2027-03-03', '23:30'))).toEqual(['start:outside_opening_hours']);
		// Across midnight is refused by 09:00–23:00 and allowed by a round-the-clock policy.
		expect(codes(at('2027-03-03', '22:00'), at('2027-03-04', '02:00'))).toEqual(['start:outside_opening_hours']);
		expect(codes(at('2027-03-03', '22:00'), at('2027-03-04', '02:00'), openAllHours())).toEqual([]);
	});

	it('supports opening past midnight (closeMinute > 1440)', () => {
		const late = { ...DEMO_POLICY, openingHours: [{ weekday: 2, openMinute: 18 * 60, closeMinute: 26 * 60 }] };
		expect(codes(at('2027-03-02', '22:00'), at('2027-03-03', '02:00'), late)).toEqual([]);
		expect(codes(at('2027-03-02', '23:00'), at('2027-03-03', '02:30'), late)).toEqual(['start:outside_opening_hours']);
	});

	it('refuses less than 24 h notice and more than 180 days ahead', () => {
		expect(codes(at('2027-03-02', '11:30'), at('2027-03-02', '13:30'))).toEqual(['start:under_minimum_notice']);
		expect(codes(at('2027-03-02', '12:00'), at('2027-03-02', '14:00'))).toEqual([]); // exactly 24 h
		// 2027-03-01 + 180 days = 2027-08-28 is the last bookable local date.
		expect(codes(at('2027-08-28', '10:00'), at('2027-08-28', '12:00'))).toEqual([]);
		expect(codes(at('2027-08-29', '10:00'), at('2027-08-29', '12:00'))).toEqual(['start:past_horizon']);
	});

	it('bills DST nights by real time and keeps the local grid (Directive 2000/84/EC)', () => {
		// Round the clock: Sat 2027-03-27 22:00 → Sun 22:00 is 23 real hours and valid.
		expect(codes(at('2027-03-27', '22:00'), at('2027-03-28', '22:00'), openAllHours(), at('2027-03-01', '00:00'))).toEqual([]);
	});

	it('refuses far-off times and over-long bookings from arithmetic alone', () => {
		// A valid start with an end in the year 9999: refused as too long, without walking the calendar.
		expect(codes(at('2027-03-02', '10:00'), new Date('9999-12-31T10:00:00Z'))).toEqual(['end:too_long']);
		expect(codes(at('2027-03-02', '10:00'), new Date('9999-12-31T10:00:00Z'), openAllHours())).toEqual(['end:too_long']);
		// A start in the year 1 or 9999.
		expect(codes(new Date('0001-01-01T10:00:00Z'), at('2027-03-02', '12:00'))).toEqual(['start:out_of_range', 'end:too_long']);
		expect(codes(new Date('9999-12-31T10:00:00Z'), new Date('9999-12-31T12:00:00Z'))).toEqual(['start:out_of_range']);
	});

	it('caps a booking at 72 h even round the clock (past 366 days the block pricing cannot price it)', () => {
		const open = openAllHours({ horizonDays: 800 });
		expect(codes(at('2027-03-03', '10:00'), at('2027-03-06', '10:00'), open)).toEqual([]); // exactly 72 h
		expect(codes(at('2027-03-03', '10:00'), at('2027-03-06', '10:30'), open)).toEqual(['end:too_long']);
		expect(codes(at('2027-03-03', '10:00'), at('2028-03-06', '10:00'), open)).toEqual(['end:too_long']);
	});

	it('turns issues into API field errors, first message per field', () => {
		const issues = validateBookingTimes(at('2027-03-02', '08:15'), at('2027-03-02', '09:00'), DEMO_POLICY, now);
		expect(toFieldErrors(issues)).toEqual({
			start: 'Times go in steps of 30 min from midnight.',
			end: 'A booking lasts at least 2 h.'
		});
		expect(codes(new Date('nonsense'), at('2027-03-02', '09:00'))).toEqual(['start:invalid_time']);
	});
});

describe('parseLocalOrOffset (ISO 8601; RFC 5545 first occurrence; IANA tz)', () => {
	it('reads an instant with an offset or Z', () => {
		const r = parseLocalOrOffset('2027-03-02T16:00:00+02:00', HELSINKI);
		expect(r).toEqual({ ok: true, instant: new Date('2027-03-02T14:00:00Z'), ambiguous: false });
		expect(parseLocalOrOffset('2027-03-02T14:00Z', HELSINKI)).toMatchObject({
			ok: true,
			instant: new Date('2027-03-02T14:00:00Z')
		});
	});

	it("reads a wall time without an offset in the studio's zone", () => {
		expect(parseLocalOrOffset('2027-07-01T10:00', HELSINKI)).toEqual({
			ok: true,
			instant: new Date('2027-07-01T07:00:00Z'), // summer time, UTC+3
			ambiguous: false
		});
	});

	it('refuses a wall time in the spring-forward gap: 2027-03-28 03:30 does not exist', () => {
		expect(parseLocalOrOffset('2027-03-28T03:30', HELSINKI)).toMatchObject({ ok: false, code: 'nonexistent_local_time' });
	});

	it('reads a repeated wall time as its first occurrence: 2027-10-31 03:30 is 00:30 UTC', () => {
		expect(parseLocalOrOffset('2027-10-31T03:30', HELSINKI)).toEqual({
			ok: true,
			instant: new Date('2027-10-31T00:30:00Z'),
			ambiguous: true
		});
	});

	it('refuses malformed input and impossible dates', () => {
		for (const text of ['2027-02-30T10:00', '2027-03-02 10:00', '2027-03-02T25:00', 'tomorrow', '2027-03-02T10:00+25:00']) {
			expect(parseLocalOrOffset(text, HELSINKI)).toMatchObject({ ok: false, code: 'invalid_time' });
		}
	});
});

describe('parseLocalOrOffset at its edges (ISO 8601 offsets, seconds and fractions)', () => {
	const instantOf = (text: string) => {
		const r = parseLocalOrOffset(text, HELSINKI);
		return r.ok ? r.instant.toISOString() : r.code;
	};

	it('subtracts a positive offset and adds a negative one, hours and minutes, with or without a colon', () => {
		// By hand: 10:07:30.25 at +05:30 is 04:37:30.250 UTC; at −03:30 it is 13:37:30.250 UTC.
		expect(instantOf('2027-03-02T10:07:30.25+05:30')).toBe('2027-03-02T04:37:30.250Z');
		expect(instantOf('2027-03-02T10:07:30.25-03:30')).toBe('2027-03-02T13:37:30.250Z');
		expect(instantOf('2027-03-02T10:07+0530')).toBe('2027-03-02T04:37:00.000Z');
		expect(instantOf('2027-03-02T10:00:30.125Z')).toBe('2027-03-02T10:00:30.125Z');
	});

	it('keeps the seconds of a wall time in the studio’s zone (Helsinki is UTC+3 in July)', () => {
		expect(instantOf('2027-07-01T10:00:30.5')).toBe('2027-07-01T07:00:30.500Z');
	});

	it('takes 23:59:59 and offsets up to ±18:00, and nothing beyond', () => {
		expect(instantOf('2027-03-02T23:59:59Z')).toBe('2027-03-02T23:59:59.000Z');
		expect(instantOf('2027-03-02T10:00+18:00')).toBe('2027-03-01T16:00:00.000Z');
		for (const text of ['2027-03-02T24:00Z', '2027-03-02T10:60Z', '2027-03-02T10:00:60Z', '2027-03-02T10:00+18:01']) {
			expect(instantOf(text), text).toBe('invalid_time');
		}
	});

	it('reads the text with spaces around it trimmed, and nothing else around it', () => {
		expect(instantOf(' 2027-03-02T10:00Z ')).toBe('2027-03-02T10:00:00.000Z');
		expect(instantOf('x2027-03-02T10:00Z')).toBe('invalid_time');
		expect(instantOf('2027-03-02T10:00Zx')).toBe('invalid_time');
	});
});

import { describe, expect, it } from 'vitest';
import { startsThatFit } from '../availability';
import { DEMO_POLICY } from '../demo';
import { toFieldErrors, validateBookingTimes } from './validation';
import { at, openAllHours } from '$fixtures/pricing';

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

	it('accepts every start availability offers, also when the opening falls in the spring-forward gap', () => {
		// Directive 2000/84/EC: Helsinki's clocks go from 03:00 to 04:00 on Sunday 2027-03-28, so an
		// opening at 03:30 that day opens when the clocks jump, for the checks as for availability.
		const early = { ...DEMO_POLICY, openingHours: [{ weekday: 7, openMinute: 3 * 60 + 30, closeMinute: 12 * 60 }] };
		const when = at('2027-03-20', '12:00');
		const day = { from: '2027-03-28', to: '2027-03-28', policy: early, busy: [], blackouts: [], now: when };
		const starts = startsThatFit({ ...day, durationMinutes: 120 });
		expect(starts[0]).toEqual(at('2027-03-28', '04:00'));
		expect(starts).toHaveLength(13); // 04:00 … 10:00 every half hour
		for (const s of starts) expect(codes(s, new Date(s.getTime() + 120 * 60_000), early, when)).toEqual([]);
		expect(codes(at('2027-03-28', '02:30'), at('2027-03-28', '06:00'), early, when)).toEqual(['start:outside_opening_hours']);
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

describe('validateBookingTimes — bounds and messages (demo policy, worked by hand)', () => {
	const DAY = 86_400_000;
	const HOUR = 3_600_000;
	const issues = (start: Date, end: Date, policy = DEMO_POLICY, when = now) =>
		validateBookingTimes(start, end, policy, when).map((i) => [i.field, i.code, i.message]);
	const plus = (d: Date, ms: number) => new Date(d.getTime() + ms);

	it('names each invalid time and stops there', () => {
		expect(issues(new Date(Number.NaN), new Date('nonsense'))).toEqual([
			['start', 'invalid_time', 'The start is not a valid time.'],
			['end', 'invalid_time', 'The end is not a valid time.']
		]);
		expect(issues(at('2027-03-02', '14:00'), new Date(Number.NaN))).toEqual([
			['end', 'invalid_time', 'The end is not a valid time.']
		]);
	});

	it('answers from arithmetic alone from 182 days ahead (the 180-day horizon and 2 days to spare), and a year back', () => {
		// now = 2027-03-01 12:00+02:00; 182 × 24 h on is 2027-08-30 13:00+03:00, a grid time in opening hours.
		const edge = plus(now, 182 * DAY);
		expect(edge.toISOString()).toBe('2027-08-30T10:00:00.000Z');
		expect(issues(edge, plus(edge, 2 * HOUR))).toEqual([['start', 'past_horizon', 'Bookings open up to 180 days ahead.']]);
		const beyond = plus(edge, 30 * 60_000);
		expect(issues(beyond, plus(beyond, 2 * HOUR))).toEqual([['start', 'out_of_range', 'Bookings open up to 180 days ahead.']]);
		// 366 × 24 h back is 2026-02-28 12:00+02:00 (the year before has 365 days): in the past (no
		// notice), but not yet "long ago".
		const yearBack = plus(now, -366 * DAY);
		expect(yearBack.toISOString()).toBe('2026-02-28T10:00:00.000Z');
		expect(issues(yearBack, plus(yearBack, 2 * HOUR)).map(([, code]) => code)).toEqual(['under_minimum_notice']);
		const longAgo = plus(yearBack, -30 * 60_000);
		expect(issues(longAgo, plus(longAgo, 2 * HOUR))).toEqual([['start', 'out_of_range', 'That date passed long ago.']]);
	});

	it('explains each refusal in words', () => {
		const start = at('2027-03-02', '14:00');
		expect(issues(start, start)).toEqual([['end', 'end_not_after_start', 'The end must be after the start.']]);
		expect(issues(start, at('2027-03-02', '15:30'))).toEqual([['end', 'under_minimum', 'A booking lasts at least 2 h.']]);
		const open = openAllHours({ horizonDays: 800 });
		expect(issues(start, at('2027-03-05', '14:30'), open)).toEqual([['end', 'too_long', 'A booking lasts at most 72 h.']]);
		expect(issues(at('2027-03-03', '08:00'), at('2027-03-03', '10:00'))).toEqual([
			['start', 'outside_opening_hours', 'The studio is not open for the whole of this time.']
		]);
		expect(issues(at('2027-03-02', '11:30'), at('2027-03-02', '13:30'))).toEqual([
			['start', 'under_minimum_notice', 'Bookings need at least 24 h notice.']
		]);
		expect(issues(at('2027-03-03', '14:10'), at('2027-03-03', '16:10'))).toEqual([
			['start', 'off_grid', 'Times go in steps of 30 min from midnight.'],
			['end', 'off_grid', 'Times go in steps of 30 min from midnight.']
		]);
	});

	it('counts notice to the millisecond and the horizon by local date', () => {
		const start = at('2027-03-02', '12:00');
		expect(issues(start, plus(start, 2 * HOUR), DEMO_POLICY, plus(now, 1)).map(([, code]) => code)).toEqual([
			'under_minimum_notice'
		]);
		// 180 days after 1 March is 28 August (local date): its last half hour is still bookable, 29 August is not.
		expect(issues(at('2027-08-28', '21:00'), at('2027-08-28', '23:00'))).toEqual([]);
		expect(issues(at('2027-08-29', '09:00'), at('2027-08-29', '11:00')).map(([, code]) => code)).toEqual(['past_horizon']);
	});
});

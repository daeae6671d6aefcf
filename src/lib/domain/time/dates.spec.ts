import { describe, expect, it } from 'vitest';
import { Temporal } from 'temporal-polyfill';
import {
	addDays,
	addMonths,
	addWallMinutes,
	clockLabel,
	clockMinutes,
	daysFrom,
	eachDay,
	isoWeekday,
	isYmd,
	maxYmd,
	minYmd,
	mondayOf,
	mustParseYmd,
	parseClock,
	parseYmd
} from './dates';
import { TimeInputError } from './errors';

describe('calendar dates (ISO 8601, proleptic Gregorian)', () => {
	it('knows real days from lookalikes (the Gregorian leap rule)', () => {
		expect(parseYmd('2028-02-29')).toEqual({ year: 2028, month: 2, day: 29 });
		expect(isYmd('2027-02-29')).toBe(false);
		expect(isYmd('2100-02-29')).toBe(false); // a century, not a 400th year
		expect(isYmd('2000-02-29')).toBe(true);
		expect(isYmd('2027-04-31')).toBe(false);
		expect(isYmd('2027-3-1')).toBe(false);
	});

	it('steps by calendar days, over month, year and leap-day ends, as Temporal.PlainDate#add does', () => {
		for (const [from, days] of [
			['2027-12-31', 1],
			['2028-02-28', 1],
			['2027-03-01', -1],
			['2027-03-27', 2],
			['2027-01-01', 400],
			['2027-06-15', -3650]
		] as const) {
			expect(addDays(from, days), `${from} + ${days}`).toBe(Temporal.PlainDate.from(from).add({ days }).toString());
		}
		expect(daysFrom('2027-03-27', '2027-03-29')).toBe(2);
		expect(daysFrom('2028-01-01', '2027-01-01')).toBe(-365);
		expect(() => addDays('2027-02-30', 1)).toThrow(TimeInputError);
	});

	it('gives ISO weekdays and the Monday of each week (2027-03-28 is a Sunday)', () => {
		expect(isoWeekday('2027-03-28')).toBe(7);
		expect(isoWeekday('2027-03-29')).toBe(1);
		expect(mondayOf('2027-03-28')).toBe('2027-03-22');
		expect(mondayOf('2027-03-29')).toBe('2027-03-29');
		expect(mondayOf('2028-01-01')).toBe('2027-12-27');
	});

	it('lists the days of a range, none when it is reversed', () => {
		expect(eachDay('2027-12-30', '2028-01-02')).toEqual(['2027-12-30', '2027-12-31', '2028-01-01', '2028-01-02']);
		expect(eachDay('2027-01-02', '2027-01-01')).toEqual([]);
	});

	it('steps calendar months across a year end', () => {
		expect(addMonths('2027-12', 1)).toBe('2028-01');
		expect(addMonths('2027-01', -1)).toBe('2026-12');
		expect(addMonths('2027-06', -18)).toBe('2025-12');
		expect(() => addMonths('2027-13', 1)).toThrow(RangeError);
	});
});

describe('wall-clock labels', () => {
	it('reads and writes HH:MM', () => {
		expect(clockMinutes('10:30')).toBe(630);
		expect(clockLabel(630)).toBe('10:30');
		expect(clockLabel(0)).toBe('00:00');
		expect(clockLabel(1440)).toBe('24:00'); // the end of a day, as a closing time
		expect(clockLabel(1800)).toBe('06:00');
		expect(parseClock('23:59:59')).toEqual({ hour: 23, minute: 59, second: 59 });
		expect(() => parseClock('24:00')).toThrow(TimeInputError);
		expect(() => parseClock('9:00')).toThrow(/HH:MM/);
	});

	it('adds minutes on the wall clock, across midnight and the year end', () => {
		expect(addWallMinutes('2027-03-28', '10:00', 240)).toBe('2027-03-28T14:00');
		expect(addWallMinutes('2027-12-31', '22:00', 180)).toBe('2028-01-01T01:00');
		expect(addWallMinutes('2027-03-01', '00:30', -60)).toBe('2027-02-28T23:30');
	});
});

describe('the edges of the calendar readers (ISO 8601 extended format, worked by hand)', () => {
	/** The TimeInputError or RangeError thrown by `run`, as its message. */
	function message(run: () => unknown): string {
		try {
			run();
		} catch (e) {
			if (e instanceof Error) return e.message;
		}
		throw new Error('expected an error');
	}

	it('reads a date, a month and a clock only whole', () => {
		for (const text of ['x2027-01-15', '2027-01-15x', ' 2027-01-15', '2027-00-10', '2027-13-01', '2027-01-00']) {
			expect(parseYmd(text), text).toBeNull();
		}
		expect(message(() => mustParseYmd('2027-1-15'))).toBe('Not a calendar date (YYYY-MM-DD): "2027-1-15"');
		for (const text of ['x2027-01', '2027-01x', '2027-00', '2027-13']) {
			expect(
				message(() => addMonths(text, 1)),
				text
			).toBe(`Not a calendar month (YYYY-MM): ${JSON.stringify(text)}`);
		}
		expect(addMonths('2027-12', 1)).toBe('2028-01');
		for (const text of ['x10:00', '10:00x', '10:00:0']) {
			expect(
				message(() => parseClock(text)),
				text
			).toBe(`Not a time of day (HH:MM): ${JSON.stringify(text)}`);
		}
		expect(message(() => parseClock('10:00:60'))).toBe('Not a time of day: "10:00:60"');
		const codeOf = (run: () => unknown) => {
			try {
				run();
			} catch (e) {
				if (e instanceof TimeInputError) return e.code;
			}
			return 'none';
		};
		expect([
			codeOf(() => mustParseYmd('2027-02-29')),
			codeOf(() => parseClock('10.00')),
			codeOf(() => parseClock('25:00'))
		]).toEqual(['invalid-date', 'invalid-format', 'invalid-time']);
	});

	it('picks the earlier and the later of two dates', () => {
		expect(minYmd('2027-01-02', '2027-01-10')).toBe('2027-01-02');
		expect(minYmd('2027-01-10', '2027-01-02')).toBe('2027-01-02');
		expect(maxYmd('2027-01-02', '2027-01-10')).toBe('2027-01-10');
		expect(maxYmd('2027-01-10', '2027-01-02')).toBe('2027-01-10');
		expect(minYmd('2026-12-31', '2027-01-01')).toBe('2026-12-31');
	});

	it('carries wall minutes past midnight into the next date', () => {
		expect(addWallMinutes('2027-01-15', '23:00', 120)).toBe('2027-01-16T01:00');
		expect(addWallMinutes('2027-12-31', '22:30', 24 * 60 + 90)).toBe('2028-01-02T00:00');
	});
});

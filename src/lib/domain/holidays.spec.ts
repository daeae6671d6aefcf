import { describe, expect, it } from 'vitest';
import { isPublicHoliday, publicHolidayChecker, publicHolidayList, publicHolidays } from './holidays';

/**
 * Western (Gregorian) Easter Sunday by the anonymous Gregorian algorithm as published by
 * Meeus ("Astronomical Algorithms", ch. 8) after Butcher (1876) — an independent check on
 * date-holidays.
 */
function meeusButcherEaster(year: number): string {
	const a = year % 19;
	const b = Math.floor(year / 100);
	const c = year % 100;
	const d = Math.floor(b / 4);
	const e = b % 4;
	const f = Math.floor((b + 8) / 25);
	const g = Math.floor((b - f + 1) / 3);
	const h = (19 * a + b - d - g + 15) % 30;
	const i = Math.floor(c / 4);
	const k = c % 4;
	const l = (32 + 2 * e + 2 * i - h - k) % 7;
	const m = Math.floor((a + 11 * h + 22 * l) / 451);
	const month = Math.floor((h + l - 7 * m + 114) / 31);
	const day = ((h + l - 7 * m + 114) % 31) + 1;
	return `${year}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
}

function shift(ymd: string, days: number): string {
	const [y = 0, m = 1, d = 1] = ymd.split('-').map(Number);
	return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}

describe('public holidays (source: date-holidays, data CC BY-SA 3.0)', () => {
	// Published Meeus/Butcher Easter dates (REFERENCES.md).
	const easter: [number, string][] = [
		[2026, '2026-04-05'],
		[2027, '2027-03-28'],
		[2028, '2028-04-16'],
		[2029, '2029-04-01'],
		[2030, '2030-04-21']
	];

	it.each(easter)('Easter %i falls on %s by Meeus/Butcher and in date-holidays', (year, date) => {
		expect(meeusButcherEaster(year)).toBe(date);
		const fi = publicHolidays('FI', year);
		expect(fi).toContain(date); // pääsiäispäivä, Easter Sunday
		expect(fi).toContain(shift(date, -2)); // pitkäperjantai, Good Friday
		expect(fi).toContain(shift(date, 1)); // toinen pääsiäispäivä, Easter Monday
		expect(isPublicHoliday('FI', shift(date, -1))).toBe(false); // Holy Saturday is not
	});

	it('knows Finnish Independence Day, 6 December 2027 (a Monday)', () => {
		expect(isPublicHoliday('FI', '2027-12-06')).toBe(true);
		expect(publicHolidayList('FI', 2027).find((h) => h.date === '2027-12-06')?.name).toBe('Independence Day');
	});

	it("counts only type 'public': Christmas Eve and Midsummer Eve are bank days in the data", () => {
		expect(isPublicHoliday('FI', '2027-12-24')).toBe(false);
		expect(isPublicHoliday('FI', '2027-06-25')).toBe(false); // juhannusaatto
		expect(isPublicHoliday('FI', '2027-06-26')).toBe(true); // juhannuspäivä, Midsummer Day
		expect(isPublicHoliday('FI', '2027-12-25')).toBe(true);
		expect(isPublicHoliday('FI', '2027-03-02')).toBe(false);
	});

	it('lists Finland 2027 in date order: 13 public holidays', () => {
		// New Year, Epiphany, Good Friday, Easter Sunday, Easter Monday, May Day, Ascension,
		// Pentecost, Midsummer Day, All Saints' Day, Independence Day, Christmas, Boxing Day.
		const dates = publicHolidays('FI', 2027);
		expect(dates).toHaveLength(13);
		expect([...dates].sort()).toEqual(dates);
	});

	it('caches per country and year', () => {
		expect(publicHolidayList('FI', 2028)).toBe(publicHolidayList('fi', 2028));
	});

	it('fails loudly on a country the data does not cover, and on bad dates', () => {
		expect(() => publicHolidays('XX', 2027)).toThrow(RangeError);
		expect(() => publicHolidayChecker('XX')).toThrow(RangeError);
		expect(() => isPublicHoliday('FI', '6.12.2027')).toThrow(RangeError);
		expect(publicHolidayChecker('FI')('2027-12-06')).toBe(true);
	});
});

import { describe, expect, it } from 'vitest';
import Holidays from 'date-holidays';
import { HOLIDAY_DATA_ATTRIBUTION, isPublicHoliday, publicHolidayChecker, publicHolidayList, publicHolidays } from './holidays';

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
	// Published Meeus/Butcher Easter dates (Meeus, "Astronomical Algorithms", ch. 8).
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

describe('public holidays of a subdivision (ISO 3166-2), and the messages of a refusal', () => {
	it('adds Bavaria’s own holidays to the national ones (Bavarian public holidays act, Art. 1: Epiphany, Corpus Christi, All Saints)', () => {
		// Corpus Christi is the Thursday 60 days after Easter Sunday (Meeus/Butcher: 1 April 2029).
		const corpusChristi = shift(meeusButcherEaster(2029), 60);
		expect(corpusChristi).toBe('2029-05-31');
		const bavaria = publicHolidays('de-by', 2029);
		const germany = publicHolidays('DE', 2029);
		for (const date of ['2029-01-06', corpusChristi, '2029-11-01']) {
			expect(bavaria).toContain(date);
			expect(germany).not.toContain(date);
		}
		// German Unity Day (3 October) is national.
		expect(bavaria).toContain('2029-10-03');
		expect(germany).toContain('2029-10-03');
		expect(publicHolidayList('DE-BY', 2029).find((h) => h.date === '2029-01-06')?.name).toBe('Epiphany');
		expect(publicHolidayChecker('de-by')('2029-11-01')).toBe(true);
		expect(isPublicHoliday('DE', '2029-11-01')).toBe(false);
	});

	it('keeps the list in date order when last year’s holiday spills into January (Eswatini 2029)', () => {
		// Incwala 2028 runs six days from 28 December, so 2 January 2029 is a holiday carried over
		// from 2028's data, read after all of 2029's own holidays.
		const list = publicHolidayList('SZ', 2029);
		expect(list.slice(0, 3).map((h) => h.date)).toEqual(['2029-01-01', '2029-01-02', '2029-03-30']);
		const dates = list.map((h) => h.date);
		expect(dates).toEqual([...dates].sort());
	});

	it('names the data and its licence for the attribution line (CC BY-SA 3.0 asks for it)', () => {
		expect(HOLIDAY_DATA_ATTRIBUTION).toBe(
			'Public holiday data: date-holidays (github.com/commenthol/date-holidays), CC BY-SA 3.0'
		);
	});

	it('says which country or date it cannot read', () => {
		expect(() => publicHolidays('XX', 2029)).toThrow('date-holidays has no public holidays for country "XX"');
		expect(() => publicHolidayChecker('QQ-1')).toThrow('date-holidays has no public holidays for country "QQ-1"');
		expect(() => isPublicHoliday('FI', '2029-1-06')).toThrow('expected a local date YYYY-MM-DD, got "2029-1-06"');
		expect(() => isPublicHoliday('FI', ' 2029-01-06')).toThrow(RangeError);
		expect(() => isPublicHoliday('FI', '2029-01-06T00:00')).toThrow(RangeError);
	});
});

/** Local dates covered by [start, end), walked hour by hour in `timeZone` (independent of holidays.ts). */
function datesCovered(start: Date, end: Date, timeZone: string): string[] {
	const format = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
	const dates = new Set<string>();
	for (let t = start.getTime(); t < end.getTime(); t += 3_600_000) dates.add(format.format(new Date(t)));
	return [...dates];
}

describe('public holidays that last several days (other countries than Finland)', () => {
	it('counts every day of the Russian New Year holidays, 1 to 8 January (Labour Code of the Russian Federation, Article 112)', () => {
		// 1–6 and 8 January are the New Year holidays, 7 January is Christmas.
		const january = publicHolidays('RU', 2027).filter((d) => d.startsWith('2027-01'));
		expect(january).toEqual(['01', '02', '03', '04', '05', '06', '07', '08'].map((d) => `2027-01-${d}`));
		expect(isPublicHoliday('RU', '2027-01-05')).toBe(true);
		expect(isPublicHoliday('RU', '2027-01-09')).toBe(false);
		expect(publicHolidayList('RU', 2027).find((h) => h.date === '2027-01-04')?.name).toBe('New Year Holiday');
	});

	it('Armenia: New Year over 1–2 January and the pre-Christmas days 3–5 January, Christmas on the 6th', () => {
		const january = publicHolidays('AM', 2028).filter((d) => d.startsWith('2028-01-0'));
		expect(january).toEqual(['2028-01-01', '2028-01-02', '2028-01-03', '2028-01-04', '2028-01-05', '2028-01-06']);
		expect(publicHolidayList('AM', 2028).find((h) => h.date === '2028-01-02')?.name).toBe("New Year's Day");
	});

	it('Vietnam: the five days of Tết from the eve of the lunar new year (6 February 2027)', () => {
		for (const d of ['05', '06', '07', '08', '09']) expect(isPublicHoliday('VN', `2027-02-${d}`), d).toBe(true);
		expect(isPublicHoliday('VN', '2027-02-04')).toBe(false);
		expect(isPublicHoliday('VN', '2027-02-10')).toBe(false);
	});

	it('Eswatini: Incwala, six days from 28 December, runs into the next year under that year', () => {
		expect(publicHolidays('SZ', 2027).filter((d) => d >= '2027-12-28')).toEqual([
			'2027-12-28',
			'2027-12-29',
			'2027-12-30',
			'2027-12-31'
		]);
		expect(isPublicHoliday('SZ', '2028-01-01')).toBe(true); // New Year's Day, and Incwala
		expect(isPublicHoliday('SZ', '2028-01-02')).toBe(true); // the last day of 2027's Incwala
		expect(isPublicHoliday('SZ', '2028-01-03')).toBe(false);
		const list = publicHolidayList('SZ', 2028);
		expect(list.find((h) => h.date === '2028-01-01')?.name).toBe("New Year's Day"); // the year's own name first
		expect(list.find((h) => h.date === '2028-01-02')?.name).toBe('Incwala Festival');
		expect(list.every((h) => h.date.startsWith('2028-'))).toBe(true);
	});

	it('a holiday of 23 or 25 hours (a daylight-saving day) is one date: Slovenia, Easter Sunday and Reformation Day 2027', () => {
		expect(isPublicHoliday('SI', '2027-03-28')).toBe(true);
		expect(isPublicHoliday('SI', '2027-03-29')).toBe(true); // Easter Monday, a holiday of its own
		expect(isPublicHoliday('SI', '2027-03-30')).toBe(false);
		expect(isPublicHoliday('SI', '2027-10-31')).toBe(true);
		expect(publicHolidayList('SI', 2027).find((h) => h.date === '2027-11-01')?.name).toBe('Day of Remembrance for the Dead');
	});

	it.each(['RU', 'AM', 'VN', 'CX', 'LC', 'MD', 'RO', 'SC', 'SZ', 'GA', 'KR'])(
		'%s: every local date a public holiday of the data covers, hour by hour in the country’s zone, is a holiday',
		(country) => {
			const data = new Holidays(country);
			const timeZone = data.getTimezones()[0]!;
			let multiDay = 0;
			for (const year of [2027, 2028]) {
				for (const holiday of data.getHolidays(year, 'en')) {
					if (holiday.type !== 'public') continue;
					const dates = datesCovered(holiday.start, holiday.end, timeZone);
					// Holidays of the Islamic calendar start at sunset the evening before their date;
					// the product counts them from their date, so the walk is only a reference for the rest.
					if (dates[0] !== holiday.date.slice(0, 10)) continue;
					if (dates.length > 1) multiDay++;
					for (const date of dates) expect(isPublicHoliday(country, date), `${holiday.name} on ${date}`).toBe(true);
				}
			}
			expect(multiDay).toBeGreaterThan(0);
		}
	);
});

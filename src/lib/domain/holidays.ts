/**
 * Public holidays of the studio's country, as local calendar dates 'YYYY-MM-DD'.
 *
 * Source: the `date-holidays` package (code ISC). Its holiday data is licensed under
 * CC BY-SA 3.0 (Creative Commons Attribution-ShareAlike 3.0), © commenthol and the
 * date-holidays contributors, https://github.com/commenthol/date-holidays — attribution is
 * required wherever the dates are shown or exported.
 *
 * Only holidays of type 'public' count (not 'bank', 'school', 'optional' or 'observance'): in
 * Finland that makes Christmas Eve and Midsummer Eve ordinary days, as the data marks them 'bank'.
 */
import Holidays from 'date-holidays';
import { addDays } from './time';

/** Attribution line to show beside holiday dates (CC BY-SA 3.0 asks for it). */
export const HOLIDAY_DATA_ATTRIBUTION = 'Public holiday data: date-holidays (github.com/commenthol/date-holidays), CC BY-SA 3.0';

export interface PublicHoliday {
	/** Local calendar date, 'YYYY-MM-DD'. */
	date: string;
	/** English name where the data has one, otherwise the country's own. */
	name: string;
}

const calendars = new Map<string, Holidays>();
const byYear = new Map<string, readonly PublicHoliday[]>();
const dateSets = new Map<string, ReadonlySet<string>>();

/** `country` is ISO 3166-1 alpha-2 ('FI'), optionally with a subdivision ('DE-BY'). */
function calendarFor(country: string): Holidays {
	const key = country.toUpperCase();
	const cached = calendars.get(key);
	if (cached) return cached;
	const [countryCode = '', state] = key.split('-');
	const supported = new Holidays().getCountries();
	if (!(countryCode in supported)) {
		throw new RangeError(`date-holidays has no public holidays for country "${country}"`);
	}
	const calendar = state ? new Holidays(countryCode, state) : new Holidays(countryCode);
	calendars.set(key, calendar);
	return calendar;
}

/** Public holidays of `country` in `year`, each local date once, in date order. Cached. */
export function publicHolidayList(country: string, year: number): readonly PublicHoliday[] {
	const key = `${country.toUpperCase()}:${year}`;
	const cached = byYear.get(key);
	if (cached) return cached;
	const seen = new Map<string, PublicHoliday>();
	const calendar = calendarFor(country);
	// The year's own holidays first (they name its dates), then the previous year's, whose last
	// one can run into this year (Eswatini's Incwala: six days from 28 December).
	for (const holiday of [...calendar.getHolidays(year, 'en'), ...calendar.getHolidays(year - 1, 'en')]) {
		if (holiday.type !== 'public') continue;
		// `date` is the local date of the holiday ("YYYY-MM-DD hh:mm:ss [±hhmm]"). A few holidays
		// in the data last several days (e.g. 72 h): count each local date they cover.
		const first = holiday.date.slice(0, 10);
		const hours = (holiday.end.getTime() - holiday.start.getTime()) / 3_600_000;
		const days = Math.max(1, Math.round(hours / 24));
		for (let i = 0; i < days; i++) {
			const date = addDays(first, i);
			if (date.startsWith(String(year)) && !seen.has(date)) {
				seen.set(date, { date, name: holiday.name });
			}
		}
	}
	const list = Object.freeze([...seen.values()].sort((a, b) => a.date.localeCompare(b.date)));
	byYear.set(key, list);
	return list;
}

/** Local dates 'YYYY-MM-DD' of the public holidays of `country` in `year`. Cached. */
export function publicHolidays(country: string, year: number): string[] {
	return publicHolidayList(country, year).map((h) => h.date);
}

/** Is the local date `ymd` ('YYYY-MM-DD') a public holiday in `country`? */
export function isPublicHoliday(country: string, ymd: string): boolean {
	const year = Number(ymd.slice(0, 4));
	if (!/^\d{4}-\d{2}-\d{2}$/.test(ymd) || !Number.isInteger(year)) {
		throw new RangeError(`expected a local date YYYY-MM-DD, got "${ymd}"`);
	}
	const key = `${country.toUpperCase()}:${year}`;
	let set = dateSets.get(key);
	if (!set) {
		set = new Set(publicHolidays(country, year));
		dateSets.set(key, set);
	}
	return set.has(ymd);
}

/** Does date-holidays know the public holidays of `country` (ISO 3166-1 alpha-2)? */
export function hasPublicHolidayCalendar(country: string): boolean {
	return country.toUpperCase() in new Holidays().getCountries();
}

/** A `(ymd) => boolean` for one country, the shape the pricing engine takes. */
export function publicHolidayChecker(country: string): (ymd: string) => boolean {
	calendarFor(country); // fail early on an unknown country
	return (ymd) => isPublicHoliday(country, ymd);
}

/**
 * Calendar-date arithmetic on 'YYYY-MM-DD' strings (proleptic Gregorian calendar, ISO 8601).
 *
 * No time zone is involved here: a calendar date is a label, not an instant, so adding a day is
 * always exactly one label step even when that local day has 23 or 25 hours. Turning a date into
 * instants is done in zoned.ts with @date-fns/tz.
 */

const DAY_MS = 86_400_000;
const YMD_RE = /^(\d{4})-(\d{2})-(\d{2})$/;

export interface CalendarDate {
	year: number;
	/** 1..12 */
	month: number;
	day: number;
}

/** Days in a month of the Gregorian calendar (leap rule: every 4th year, not centuries, but every 400th). */
export function daysInMonth(year: number, month: number): number {
	if (month === 2) {
		const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
		return leap ? 29 : 28;
	}
	return [4, 6, 9, 11].includes(month) ? 30 : 31;
}

/** Parses 'YYYY-MM-DD' (ISO 8601 calendar date, extended format); null when malformed or not a real day. */
export function parseYmd(ymd: string): CalendarDate | null {
	const m = YMD_RE.exec(ymd);
	if (!m) return null;
	const year = Number(m[1]);
	const month = Number(m[2]);
	const day = Number(m[3]);
	if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return null;
	return { year, month, day };
}

export function isYmd(ymd: string): boolean {
	return parseYmd(ymd) !== null;
}

function pad(n: number, width = 2): string {
	return String(n).padStart(width, '0');
}

export function formatYmd(d: CalendarDate): string {
	return `${pad(d.year, 4)}-${pad(d.month)}-${pad(d.day)}`;
}

/** Days since 1970-01-01 of a calendar date (a pure count; the UTC reading is only arithmetic). */
export function dayNumber(d: CalendarDate): number {
	const probe = new Date(0);
	// setUTCFullYear, not Date.UTC: Date.UTC maps years 0..99 to 1900..1999.
	probe.setUTCFullYear(d.year, d.month - 1, d.day);
	return Math.round(probe.getTime() / DAY_MS);
}

export function fromDayNumber(n: number): CalendarDate {
	const probe = new Date(n * DAY_MS);
	return { year: probe.getUTCFullYear(), month: probe.getUTCMonth() + 1, day: probe.getUTCDate() };
}

function mustParse(ymd: string): CalendarDate {
	const d = parseYmd(ymd);
	if (!d) throw new RangeError(`Not a calendar date (YYYY-MM-DD): ${JSON.stringify(ymd)}`);
	return d;
}

export function addDays(ymd: string, days: number): string {
	return formatYmd(fromDayNumber(dayNumber(mustParse(ymd)) + days));
}

/** ISO 8601 weekday: 1 = Monday .. 7 = Sunday. 1970-01-01 was a Thursday (4). */
export function isoWeekday(ymd: string): number {
	const n = dayNumber(mustParse(ymd));
	return ((((n + 3) % 7) + 7) % 7) + 1;
}

/** Every date from `from` to `to` inclusive (empty when to < from). */
export function eachDay(from: string, to: string): string[] {
	const a = dayNumber(mustParse(from));
	const b = dayNumber(mustParse(to));
	const out: string[] = [];
	for (let n = a; n <= b; n++) out.push(formatYmd(fromDayNumber(n)));
	return out;
}

/** 'YYYY-MM-DD' strings with four-digit years compare correctly as strings. */
export function minYmd(a: string, b: string): string {
	return a <= b ? a : b;
}

export function maxYmd(a: string, b: string): string {
	return a >= b ? a : b;
}

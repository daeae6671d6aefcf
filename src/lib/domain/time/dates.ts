/**
 * Calendar-date arithmetic on 'YYYY-MM-DD' strings (ISO 8601 calendar dates, extended format, in
 * the proleptic Gregorian calendar), and wall-clock labels ('HH:MM') read as plain numbers.
 *
 * No time zone is involved here: a calendar date is a label, not an instant, so adding a day is
 * always exactly one label step even when that local day has 23 or 25 hours. Turning a date into
 * instants is zoned.ts's job.
 */
import { TimeInputError } from './errors';

const DAY_MS = 86_400_000;
const MINUTE_MS = 60_000;
const YMD_RE = /^(\d{4})-(\d{2})-(\d{2})$/;
const YM_RE = /^(\d{4})-(\d{2})$/;

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

/** The calendar date of 'YYYY-MM-DD'; throws TimeInputError('invalid-date') on anything that is not a real day. */
export function mustParseYmd(ymd: string): CalendarDate {
	const d = parseYmd(ymd);
	if (!d) throw new TimeInputError('invalid-date', `Not a calendar date (YYYY-MM-DD): ${JSON.stringify(ymd)}`);
	return d;
}

/** 'YYYY-MM-DD' plus `days` calendar days (negative: before). */
export function addDays(ymd: string, days: number): string {
	return formatYmd(fromDayNumber(dayNumber(mustParseYmd(ymd)) + days));
}

/** Whole calendar days from `from` to `to` (negative when `to` comes first). */
export function daysFrom(from: string, to: string): number {
	return dayNumber(mustParseYmd(to)) - dayNumber(mustParseYmd(from));
}

/** ISO 8601 weekday: 1 = Monday .. 7 = Sunday. 1970-01-01 was a Thursday (4). */
export function isoWeekday(ymd: string): number {
	const n = dayNumber(mustParseYmd(ymd));
	return ((((n + 3) % 7) + 7) % 7) + 1;
}

/** The Monday of the week a date falls in (ISO 8601 weeks start on Monday). */
export function mondayOf(ymd: string): string {
	return addDays(ymd, 1 - isoWeekday(ymd));
}

/** Every date from `from` to `to` inclusive (empty when to < from). */
export function eachDay(from: string, to: string): string[] {
	const a = dayNumber(mustParseYmd(from));
	const b = dayNumber(mustParseYmd(to));
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

/** A calendar month 'YYYY-MM' plus `months` (negative: before): '2027-12' + 1 is '2028-01'. */
export function addMonths(yearMonth: string, months: number): string {
	const m = YM_RE.exec(yearMonth);
	const month = Number(m?.[2]);
	if (!m || month < 1 || month > 12) throw new RangeError(`Not a calendar month (YYYY-MM): ${JSON.stringify(yearMonth)}`);
	const index = Number(m[1]) * 12 + month - 1 + months;
	return `${pad(Math.floor(index / 12), 4)}-${pad((index % 12) + 1)}`;
}

const CLOCK_RE = /^(\d{2}):(\d{2})(?::(\d{2}))?$/;

/**
 * Reads a time of day 'HH:MM' or 'HH:MM:SS' (ISO 8601 extended format); throws TimeInputError
 * on anything else. 24:00 is refused: ISO 8601 allows it only as an end-of-day marker, which is
 * not a start.
 */
export function parseClock(time: string): { hour: number; minute: number; second: number } {
	const m = CLOCK_RE.exec(time);
	if (!m) throw new TimeInputError('invalid-format', `Not a time of day (HH:MM): ${JSON.stringify(time)}`);
	const hour = Number(m[1]);
	const minute = Number(m[2]);
	const second = m[3] === undefined ? 0 : Number(m[3]);
	if (hour > 23 || minute > 59 || second > 59) {
		throw new TimeInputError('invalid-time', `Not a time of day: ${JSON.stringify(time)}`);
	}
	return { hour, minute, second };
}

/** '10:00' → 600: the minutes past midnight a wall-clock label 'HH:MM' names. */
export function clockMinutes(hhmm: string): number {
	const [h = 0, m = 0] = hhmm.split(':').map(Number);
	return h * 60 + m;
}

/**
 * 600 → '10:00': a minute of the day as a wall-clock label. 1440 is '24:00', the end of the day
 * (ISO 8601 allows 24:00 for the end of a day, as a closing time); later minutes wrap past midnight.
 */
export function clockLabel(minuteOfDay: number): string {
	if (minuteOfDay === 1440) return '24:00';
	const m = ((minuteOfDay % 1440) + 1440) % 1440;
	return `${pad(Math.floor(m / 60))}:${pad(m % 60)}`;
}

/**
 * The wall time `minutes` after a local date and time, as 'YYYY-MM-DDTHH:MM' with no offset.
 * Plain calendar arithmetic on the wall clock (a booking from 10:00 for 4 h ends at 14:00 on the
 * wall clock, which is what the artist reads on the studio's clock that day).
 */
export function addWallMinutes(ymd: string, hhmm: string, minutes: number): string {
	const total = dayNumber(mustParseYmd(ymd)) * 1440 + clockMinutes(hhmm) + minutes;
	const day = Math.floor(total / 1440);
	return `${formatYmd(fromDayNumber(day))}T${clockLabel(total - day * 1440)}`;
}

/** A wall-clock reading (a date and a minute of its day) as if it were UTC, in ms: a plain number for wall-clock arithmetic. */
export function naiveWallMs(d: CalendarDate, minuteOfDay: number): number {
	return dayNumber(d) * DAY_MS + minuteOfDay * MINUTE_MS;
}

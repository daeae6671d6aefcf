/**
 * Instants and lengths of time as people and other programs read them: in the studio's zone,
 * only at the edges (pages, e-mails, documents, the JSON API).
 */
import { addDays, clockLabel } from './dates';
import { localParts, offsetMsAt } from './zoned';

const pad = (n: number, width = 2) => String(n).padStart(width, '0');

/**
 * An instant as ISO 8601 with the zone's offset at it (e.g. 2027-03-28T10:00:00+03:00), the
 * format date-fns' formatISO gives a TZDate ("Z" for a zero offset; seconds kept, milliseconds
 * dropped). Written out by hand from the zone's offset, which offsetMsAt remembers: the
 * availability endpoint formats every free and busy boundary of a month, and building a TZDate
 * for each was a large part of its time (measured with --cpu-prof under `npm run bench`).
 */
export function isoInZone(instant: Date, timeZone: string): string {
	const ms = instant.getTime();
	const offset = offsetMsAt(timeZone, ms - (ms % 60_000));
	const local = new Date(ms + offset);
	const date = `${pad(local.getUTCFullYear(), 4)}-${pad(local.getUTCMonth() + 1)}-${pad(local.getUTCDate())}`;
	const time = `${pad(local.getUTCHours())}:${pad(local.getUTCMinutes())}:${pad(local.getUTCSeconds())}`;
	if (offset === 0) return `${date}T${time}Z`;
	const minutes = Math.abs(offset) / 60_000;
	return `${date}T${time}${offset < 0 ? '-' : '+'}${pad(Math.floor(minutes / 60))}:${pad(minutes % 60)}`;
}

/** The local date and time of an instant in a zone: { date: 'YYYY-MM-DD', time: 'HH:MM' }. */
export function wallClock(instant: string | Date | number, timeZone: string): { date: string; time: string } {
	const p = localParts(typeof instant === 'string' ? Date.parse(instant) : instant, timeZone);
	return { date: p.ymd, time: clockLabel(p.minuteOfDay) };
}

/**
 * The local date and time of an instant as 'YYYY-MM-DDTHH:MM' (seconds dropped): the value of an
 * <input type="datetime-local">, which parseBookingInstant reads back in the same zone.
 */
export function wallDateTime(instant: string | Date | number, timeZone: string): string {
	const { date, time } = wallClock(instant, timeZone);
	return `${date}T${time}`;
}

export function formatDateTime(iso: string | Date, timeZone: string, locale = 'en-GB'): string {
	return new Intl.DateTimeFormat(locale, {
		timeZone,
		weekday: 'short',
		day: 'numeric',
		month: 'short',
		year: 'numeric',
		hour: '2-digit',
		minute: '2-digit'
	}).format(new Date(iso));
}

export function formatTime(iso: string | Date, timeZone: string, locale = 'en-GB'): string {
	return new Intl.DateTimeFormat(locale, { timeZone, hour: '2-digit', minute: '2-digit' }).format(new Date(iso));
}

export function formatDate(iso: string | Date, timeZone: string, locale = 'en-GB'): string {
	return new Intl.DateTimeFormat(locale, { timeZone, weekday: 'long', day: 'numeric', month: 'long', year: 'numeric' }).format(
		new Date(iso)
	);
}

/**
 * The end of a span of time as a time of day. A span that ends at the midnight after the day it
 * began ends at 24:00 on a 24-hour clock (ISO 8601's end of the day, as clockLabel writes it), not
 * at 00:00 of the next day; a 12-hour clock has no 24:00 and keeps its own midnight.
 */
export function formatEndTime(start: string | Date, end: string | Date, timeZone: string, locale = 'en-GB'): string {
	const options: Intl.DateTimeFormatOptions = { timeZone, hour: '2-digit', minute: '2-digit' };
	const plain = new Intl.DateTimeFormat(locale, options);
	const last = localParts(new Date(end), timeZone);
	const endsTheDay = last.minuteOfDay === 0 && last.ymd === addDays(localParts(new Date(start), timeZone).ymd, 1);
	if (endsTheDay && plain.resolvedOptions().hourCycle === 'h23') {
		return new Intl.DateTimeFormat(locale, { ...options, hourCycle: 'h24' }).format(new Date(end));
	}
	return plain.format(new Date(end));
}

/** A span's times of day, 'HH:MM–HH:MM' (the end as formatEndTime gives it). */
export function formatTimes(start: string | Date, end: string | Date, timeZone: string, locale = 'en-GB'): string {
	return `${formatTime(start, timeZone, locale)}–${formatEndTime(start, end, timeZone, locale)}`;
}

export function formatRange(start: string | Date, end: string | Date, timeZone: string, locale = 'en-GB'): string {
	return `${formatDateTime(start, timeZone, locale)} – ${formatEndTime(start, end, timeZone, locale)}`;
}

/**
 * A calendar date 'YYYY-MM-DD' in words ('Sunday 28 March'), the same wherever the code runs: a
 * date is not an instant, so no zone applies; it is formatted as noon UTC of that date with the
 * formatter set to UTC, which prints the date given.
 */
export function formatCalendarDate(
	ymd: string,
	options: Pick<Intl.DateTimeFormatOptions, 'weekday' | 'day' | 'month' | 'year'>,
	locale = 'en-GB'
): string {
	return new Intl.DateTimeFormat(locale, { ...options, timeZone: 'UTC' }).format(new Date(`${ymd}T12:00:00Z`));
}

/** 120 → "2 h", 150 → "2 h 30 min", 45 → "45 min", 0 → "0 min". */
export function formatDuration(minutes: number): string {
	const h = Math.floor(minutes / 60);
	const m = minutes % 60;
	if (h === 0) return `${m} min`;
	return m === 0 ? `${h} h` : `${h} h ${m} min`;
}

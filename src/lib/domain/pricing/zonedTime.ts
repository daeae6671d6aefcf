/**
 * Wall-clock arithmetic in the studio's IANA time zone (IANA tz database as shipped in Node's ICU,
 * read through `tzOffset` of @date-fns/tz). Instants are UTC; a local date and minute of the day
 * are derived from the instant's UTC offset at that instant, so a day with a daylight-saving
 * change has 23 or 25 real hours (Directive 2000/84/EC: EU summer time starts and ends at
 * 01:00 UTC on the last Sundays of March and October).
 */
import { tzOffset } from '@date-fns/tz';

const MINUTE = 60_000;
const DAY = 86_400_000;

export interface LocalParts {
	/** Local calendar date 'YYYY-MM-DD'. */
	ymd: string;
	/** ISO weekday of the local date: 1 Monday … 7 Sunday. */
	isoWeekday: number;
	/** Local minutes since midnight, 0..1439 (seconds dropped). */
	minuteOfDay: number;
	/** Whole seconds and milliseconds past the local minute (0 for instants on a minute). */
	subMinuteMs: number;
	/** UTC offset in minutes at that instant (Helsinki: 120 in winter, 180 in summer). */
	offsetMinutes: number;
}

function offsetAt(timeZone: string, ms: number): number {
	const offset = tzOffset(timeZone, new Date(ms));
	if (!Number.isFinite(offset)) throw new RangeError(`Unknown time zone: ${timeZone}`);
	return offset;
}

function ymdOfDayNumber(dayNumber: number): string {
	return new Date(dayNumber * DAY).toISOString().slice(0, 10);
}

/** ISO weekday of a day count since 1970-01-01 (a Thursday). */
function isoWeekdayOfDayNumber(dayNumber: number): number {
	return ((((dayNumber + 3) % 7) + 7) % 7) + 1;
}

/** The local date, weekday and minute of the day of an instant in `timeZone`. */
export function localParts(instant: Date, timeZone: string): LocalParts {
	const ms = instant.getTime();
	const offsetMinutes = offsetAt(timeZone, ms);
	const local = ms + offsetMinutes * MINUTE;
	const dayNumber = Math.floor(local / DAY);
	const msOfDay = local - dayNumber * DAY;
	return {
		ymd: ymdOfDayNumber(dayNumber),
		isoWeekday: isoWeekdayOfDayNumber(dayNumber),
		minuteOfDay: Math.floor(msOfDay / MINUTE),
		subMinuteMs: msOfDay % MINUTE,
		offsetMinutes
	};
}

/** ISO weekday (1 Monday … 7 Sunday) of a calendar date 'YYYY-MM-DD'. */
export function isoWeekdayOf(ymd: string): number {
	return isoWeekdayOfDayNumber(Math.floor(parseYmd(ymd) / DAY));
}

/** 'YYYY-MM-DD' plus `days` calendar days. */
export function addDaysToYmd(ymd: string, days: number): string {
	return ymdOfDayNumber(Math.floor(parseYmd(ymd) / DAY) + days);
}

/** Whole calendar days from `a` to `b` (both 'YYYY-MM-DD'). */
export function daysBetweenYmd(a: string, b: string): number {
	return Math.round((parseYmd(b) - parseYmd(a)) / DAY);
}

/** UTC midnight of a calendar date, as ms; throws on anything but a real 'YYYY-MM-DD'. */
export function parseYmd(ymd: string): number {
	const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(ymd);
	if (!match) throw new RangeError(`expected YYYY-MM-DD, got "${ymd}"`);
	const [, y, m, d] = match.map(Number) as [number, number, number, number];
	const ms = Date.UTC(y, m - 1, d);
	if (new Date(ms).toISOString().slice(0, 10) !== ymd) throw new RangeError(`no such date: ${ymd}`);
	return ms;
}

export interface ResolvedLocalTime {
	instant: Date;
	/**
	 * 'unique': the wall time occurs once. 'ambiguous': it occurs twice (autumn fall-back) and the
	 * first occurrence is returned, as RFC 5545 §3.3.5 prescribes for iCalendar. 'gap': it does not
	 * exist (spring-forward); the instant returned is the wall time read with the offset in force
	 * before the gap, i.e. pushed forward by the gap (03:30 → 04:30 in Helsinki on 2027-03-28).
	 */
	kind: 'unique' | 'ambiguous' | 'gap';
}

/**
 * The instant of a local wall time: `minuteOfDay` minutes after local midnight of `ymd`, where
 * minuteOfDay may run past 1440 into the next days (an overnight closing time).
 */
export function localToInstant(ymd: string, minuteOfDay: number, timeZone: string): ResolvedLocalTime {
	const wall = parseYmd(ymd) + minuteOfDay * MINUTE; // wall clock read as if it were UTC
	const before = offsetAt(timeZone, wall - DAY);
	const candidates = new Set([before, offsetAt(timeZone, wall), offsetAt(timeZone, wall + DAY)]);
	const valid = [...candidates]
		.map((offset) => wall - offset * MINUTE)
		.filter((ms) => offsetAt(timeZone, ms) * MINUTE === wall - ms)
		.sort((a, b) => a - b);
	const [first] = valid;
	if (first === undefined) return { instant: new Date(wall - before * MINUTE), kind: 'gap' };
	return { instant: new Date(first), kind: valid.length > 1 ? 'ambiguous' : 'unique' };
}

/** A run of real minutes that share one local date and one UTC offset. */
export interface LocalSegment {
	/** Instant of the segment's first minute, ms since the epoch. */
	startMs: number;
	/** Real elapsed minutes in the segment. */
	minutes: number;
	ymd: string;
	isoWeekday: number;
	/** Local minute of the day at the segment's start; the segment's minutes run on from it. */
	startMinuteOfDay: number;
}

/** First minute in (fromMs, toMs] whose offset differs from `offset`; toMs when none does. */
function nextOffsetChange(timeZone: string, offset: number, fromMs: number, toMs: number): number {
	if (offsetAt(timeZone, toMs - MINUTE) === offset) return toMs;
	let lo = fromMs; // offset holds at lo
	let hi = toMs - MINUTE; // offset differs at hi
	while (hi - lo > MINUTE) {
		const mid = lo + Math.floor((hi - lo) / MINUTE / 2) * MINUTE;
		if (offsetAt(timeZone, mid) === offset) lo = mid;
		else hi = mid;
	}
	return hi;
}

/**
 * Splits the real interval [start, end) into local segments: a new segment begins at each local
 * midnight and at each change of UTC offset. Minutes are real elapsed minutes, so a night across
 * a spring-forward change yields one minute fewer per skipped minute, never a phantom hour.
 */
export function localSegments(start: Date, end: Date, timeZone: string): LocalSegment[] {
	const segments: LocalSegment[] = [];
	const endMs = end.getTime();
	let t = start.getTime();
	while (t < endMs) {
		const parts = localParts(new Date(t), timeZone);
		const msToMidnight = DAY - (parts.minuteOfDay * MINUTE + parts.subMinuteMs);
		const dayEnd = Math.min(endMs, t + msToMidnight);
		const segmentEnd = nextOffsetChange(timeZone, parts.offsetMinutes, t, dayEnd);
		segments.push({
			startMs: t,
			minutes: Math.round((segmentEnd - t) / MINUTE),
			ymd: parts.ymd,
			isoWeekday: parts.isoWeekday,
			startMinuteOfDay: parts.minuteOfDay
		});
		t = segmentEnd;
	}
	return segments;
}

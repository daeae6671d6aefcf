/**
 * Local wall time ↔ instant, in an IANA time zone, with @date-fns/tz.
 *
 * Why not just `new TZDate(y, m, d, h, min, zone)`: for a wall time in the spring-forward gap it
 * silently shifts forward (2027-03-28 03:30 Europe/Helsinki becomes 04:30), and for a repeated
 * wall time the occurrence it picks depends on the HOST's zone (2027-10-31 03:30 becomes
 * 03:30+02:00 on a UTC host but 03:30+03:00 on an Asia/Kathmandu host). We need to
 * refuse the first and, per RFC 5545 §3.3.5, pick the FIRST occurrence of the second. So we
 * resolve wall times ourselves from the zone's UTC offsets (`tzOffset`, which reads the IANA tz
 * database shipped with the runtime's ICU), and read an instant's wall clock as the instant plus
 * the offset in force at it, never through the host's zone.
 *
 * A local day lasts whatever the tz database says: 23 h on 2027-03-28 and 25 h on 2027-10-31 in
 * Europe/Helsinki (Directive 2000/84/EC: EU summer time starts and ends at 01:00 UTC on the last
 * Sundays of March and October).
 *
 * Assumption (true of every IANA zone): offsets change at most once within any 24 h.
 */
import { tzOffset } from '@date-fns/tz';
import { addDays, formatYmd, fromDayNumber, mustParseYmd, naiveWallMs, parseClock } from './dates';
import { NonexistentLocalTimeError, TimeInputError } from './errors';

const MINUTE_MS = 60_000;
const DAY_MS = 86_400_000;

/** How a local wall time maps to instants. */
export type WallTimeResolution =
	/** The usual case: the wall time happens exactly once. */
	| { kind: 'unique'; instant: Date }
	/** Fall-back overlap: the wall time happens twice (e.g. 03:30 on 2027-10-31 in Europe/Helsinki). */
	| { kind: 'repeated'; first: Date; second: Date }
	/** Spring-forward gap: the wall time never happens; `transition` is the instant the clocks jumped. */
	| { kind: 'skipped'; transition: Date };

const validZones = new Set<string>();

/** Throws TimeInputError('invalid-time-zone') unless `timeZone` is a zone the runtime's tz data knows. */
export function assertTimeZone(timeZone: string): void {
	if (validZones.has(timeZone)) return;
	let ok = typeof timeZone === 'string' && timeZone.length > 0;
	if (ok) {
		try {
			new Intl.DateTimeFormat('en-US', { timeZone });
			ok = !Number.isNaN(tzOffset(timeZone, new Date(0)));
		} catch {
			ok = false;
		}
	}
	if (!ok) throw new TimeInputError('invalid-time-zone', `Unknown time zone: ${JSON.stringify(timeZone)}`);
	validZones.add(timeZone);
}

// Reading an offset asks ICU to format the instant, which dominates the availability endpoint's
// time (measured with --cpu-prof under `npm run bench`). Offsets at whole minutes, the ones wall
// times resolve to, are remembered; the cache is bounded and an offset never changes for a given
// zone and instant, so nothing can go stale.
const offsetCache = new Map<string, number>();
const OFFSET_CACHE_LIMIT = 100_000;

/** UTC offset of the zone at an instant, in milliseconds (positive east of Greenwich). */
export function offsetMsAt(timeZone: string, ms: number): number {
	if (ms % MINUTE_MS !== 0) return Math.round(tzOffset(timeZone, new Date(ms)) * MINUTE_MS);
	const key = `${timeZone}|${ms}`;
	let offset = offsetCache.get(key);
	if (offset === undefined) {
		offset = Math.round(tzOffset(timeZone, new Date(ms)) * MINUTE_MS);
		if (offsetCache.size >= OFFSET_CACHE_LIMIT) offsetCache.clear();
		offsetCache.set(key, offset);
	}
	return offset;
}

/** The local calendar date, weekday and time of day of an instant in a zone. */
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

/** The local date, weekday and time of day of an instant in `timeZone`. */
export function localParts(instant: Date | number, timeZone: string): LocalParts {
	const ms = typeof instant === 'number' ? instant : instant.getTime();
	// Offsets change on whole minutes, so the offset of the instant's minute is the instant's own.
	const offset = offsetMsAt(timeZone, ms - (((ms % MINUTE_MS) + MINUTE_MS) % MINUTE_MS));
	if (!Number.isFinite(offset)) throw new TimeInputError('invalid-time-zone', `Unknown time zone: ${JSON.stringify(timeZone)}`);
	const local = ms + offset;
	const day = Math.floor(local / DAY_MS);
	const msOfDay = local - day * DAY_MS;
	return {
		ymd: formatYmd(fromDayNumber(day)),
		// 1970-01-01 (day 0) was a Thursday, ISO weekday 4.
		isoWeekday: ((((day + 3) % 7) + 7) % 7) + 1,
		minuteOfDay: Math.floor(msOfDay / MINUTE_MS),
		subMinuteMs: msOfDay % MINUTE_MS,
		offsetMinutes: offset / MINUTE_MS
	};
}

/** The local calendar date ('YYYY-MM-DD') of an instant in a zone; an ISO string is read as an instant. */
export function localDateOf(instant: Date | number | string, timeZone: string): string {
	return localParts(typeof instant === 'string' ? Date.parse(instant) : instant, timeZone).ymd;
}

/**
 * Smallest instant in (lo, hi] whose offset equals the offset at hi, given the offsets at lo and
 * hi differ: with one change in between, that is the instant of the change.
 */
export function findTransition(timeZone: string, lo: number, hi: number): number {
	const target = offsetMsAt(timeZone, hi);
	let a = lo;
	let b = hi;
	while (b - a > 1) {
		const mid = Math.floor((a + b) / 2);
		if (offsetMsAt(timeZone, mid) === target) b = mid;
		else a = mid;
	}
	return b;
}

/** Resolves a wall-clock reading (as a naive ms count, see naiveWallMs) against the zone's offsets. */
function resolveNaive(naive: number, timeZone: string): WallTimeResolution {
	// Every offset that could apply is the offset at some instant within a day of the wall time.
	const offsets = new Set<number>([
		offsetMsAt(timeZone, naive - DAY_MS),
		offsetMsAt(timeZone, naive),
		offsetMsAt(timeZone, naive + DAY_MS)
	]);
	const candidates = [...offsets].map((o) => naive - o);
	// A candidate is real when the zone actually uses that offset at that instant.
	const valid = [...new Set(candidates.filter((t) => naive - offsetMsAt(timeZone, t) === t))].sort((a, b) => a - b);
	const first = valid[0];
	const last = valid[valid.length - 1];
	if (first !== undefined && last !== undefined) {
		return first === last
			? { kind: 'unique', instant: new Date(first) }
			: { kind: 'repeated', first: new Date(first), second: new Date(last) };
	}
	// No offset fits: the wall time lies in a gap. The change happened between the earliest and
	// latest candidate instants.
	const lo = Math.min(...candidates);
	const hi = Math.max(...candidates);
	return { kind: 'skipped', transition: new Date(findTransition(timeZone, lo, hi)) };
}

export interface ResolvedLocalTime {
	instant: Date;
	/**
	 * 'unique': the wall time occurs once. 'ambiguous': it occurs twice (autumn fall-back) and the
	 * first occurrence is returned, as RFC 5545 §3.3.5 prescribes for iCalendar. 'gap': it does not
	 * exist (spring-forward); the instant returned is the one the clocks jumped at, the first real
	 * instant after that wall time (a day whose midnight is skipped starts there; a studio opening
	 * at a skipped 03:30 in Helsinki on 2027-03-28 opens when the clocks read 04:00).
	 */
	kind: 'unique' | 'ambiguous' | 'gap';
}

function boundary(resolution: WallTimeResolution): ResolvedLocalTime {
	switch (resolution.kind) {
		case 'unique':
			return { instant: resolution.instant, kind: 'unique' };
		case 'repeated':
			return { instant: resolution.first, kind: 'ambiguous' };
		case 'skipped':
			return { instant: resolution.transition, kind: 'gap' };
	}
}

/**
 * The instant of a local wall time, `minuteOfDay` minutes after the start of local date `ymd`
 * counted on the wall clock; 1440 and above fall on later dates (1800 = 06:00 the next day, an
 * overnight closing time). For rule boundaries (opening hours, day bounds, horizon): a repeated
 * time is its first occurrence, a skipped time the instant the clocks jumped (see `kind`).
 */
export function localToInstant(ymd: string, minuteOfDay: number, timeZone: string): ResolvedLocalTime {
	assertTimeZone(timeZone);
	return boundary(resolveNaive(naiveWallMs(mustParseYmd(ymd), minuteOfDay), timeZone));
}

/**
 * Start and end instants of local day `ymd` in `timeZone`, half-open [start, end). The length is
 * whatever the tz database says: 23 h on 2027-03-28 and 25 h on 2027-10-31 in Europe/Helsinki.
 */
export function localDayBounds(ymd: string, timeZone: string): { start: Date; end: Date } {
	return { start: localToInstant(ymd, 0, timeZone).instant, end: localToInstant(ymd, 1440, timeZone).instant };
}

/** How the local wall time `time` ('HH:MM' or 'HH:MM:SS') on `ymd` maps to instants in `timeZone`. */
export function resolveWallTime(ymd: string, time: string, timeZone: string): WallTimeResolution {
	assertTimeZone(timeZone);
	const d = mustParseYmd(ymd);
	const c = parseClock(time);
	return resolveNaive(naiveWallMs(d, c.hour * 60 + c.minute) + c.second * 1000, timeZone);
}

/**
 * The instant at which the wall clock in `timeZone` reads `time` on `ymd`.
 * - Spring-forward gap: throws NonexistentLocalTimeError (2027-03-28 03:30 Europe/Helsinki).
 * - Fall-back overlap: the FIRST occurrence, RFC 5545 §3.3.5 ("the first occurrence of the
 *   repeated time"): 2027-10-31 03:30 Europe/Helsinki is 03:30+03:00 = 00:30Z.
 */
export function zonedWallTime(ymd: string, time: string, timeZone: string): Date {
	const r = resolveWallTime(ymd, time, timeZone);
	switch (r.kind) {
		case 'unique':
			return r.instant;
		case 'repeated':
			return r.first;
		case 'skipped':
			throw new NonexistentLocalTimeError(ymd, time, timeZone, r.transition);
	}
}

/**
 * The same local wall time `days` calendar days later (a nominal day, as in RFC 5545 durations
 * and Temporal's ZonedDateTime.add({ days })): across a DST change this is 23 or 25 real hours.
 */
export function addLocalDays(instant: number, days: number, timeZone: string): number {
	const p = localParts(instant, timeZone);
	const naive = naiveWallMs(mustParseYmd(addDays(p.ymd, days)), p.minuteOfDay) + p.subMinuteMs;
	return boundary(resolveNaive(naive, timeZone)).instant.getTime();
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
	if (offsetMsAt(timeZone, toMs - MINUTE_MS) === offset) return toMs;
	let lo = fromMs; // offset holds at lo
	let hi = toMs - MINUTE_MS; // offset differs at hi
	while (hi - lo > MINUTE_MS) {
		const mid = lo + Math.floor((hi - lo) / MINUTE_MS / 2) * MINUTE_MS;
		if (offsetMsAt(timeZone, mid) === offset) lo = mid;
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
		const parts = localParts(t, timeZone);
		const msToMidnight = DAY_MS - (parts.minuteOfDay * MINUTE_MS + parts.subMinuteMs);
		const dayEnd = Math.min(endMs, t + msToMidnight);
		const segmentEnd = nextOffsetChange(timeZone, parts.offsetMinutes * MINUTE_MS, t, dayEnd);
		segments.push({
			startMs: t,
			minutes: Math.round((segmentEnd - t) / MINUTE_MS),
			ymd: parts.ymd,
			isoWeekday: parts.isoWeekday,
			startMinuteOfDay: parts.minuteOfDay
		});
		t = segmentEnd;
	}
	return segments;
}

/**
 * Local wall time ↔ instant, in an IANA time zone, with @date-fns/tz.
 *
 * Why not just `new TZDate(y, m, d, h, min, zone)`: for a wall time in the spring-forward gap it
 * silently shifts forward (2027-03-28 03:30 Europe/Helsinki becomes 04:30), and for a repeated
 * wall time the occurrence it picks depends on the HOST's zone (2027-10-31 03:30 becomes
 * 03:30+02:00 on a UTC host but 03:30+03:00 on an Asia/Kathmandu host). We need to
 * refuse the first and, per RFC 5545 §3.3.5, pick the FIRST occurrence of the second. So we
 * resolve wall times ourselves from the zone's UTC offsets (`tzOffset`, which reads the IANA tz
 * database shipped with the runtime's ICU) and read wall fields back with TZDate, whose getters
 * never depend on the host's time zone.
 *
 * Assumption (true of every IANA zone): offsets change at most once within any 24 h.
 */
import { TZDate, tzOffset } from '@date-fns/tz';
import { addDays, formatYmd, parseYmd } from './calendar';
import { NonexistentLocalTimeError, TimeInputError } from './errors';

const MINUTE_MS = 60_000;
const DAY_MS = 86_400_000;

/** Wall-clock fields of an instant in a zone. month is 1..12. */
export interface WallTime {
	year: number;
	month: number;
	day: number;
	hour: number;
	minute: number;
	second: number;
	millisecond: number;
}

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

/** Wall-clock fields of an instant in a zone (TZDate's getters read the zone, never the host). */
export function wallTimeOf(instant: Date | number, timeZone: string): WallTime {
	const t = new TZDate(typeof instant === 'number' ? instant : instant.getTime(), timeZone);
	return {
		year: t.getFullYear(),
		month: t.getMonth() + 1,
		day: t.getDate(),
		hour: t.getHours(),
		minute: t.getMinutes(),
		second: t.getSeconds(),
		millisecond: t.getMilliseconds()
	};
}

/** The local calendar date ('YYYY-MM-DD') of an instant in a zone. */
export function localDateOf(instant: Date | number, timeZone: string): string {
	const w = wallTimeOf(instant, timeZone);
	return formatYmd(w);
}

/** The wall fields read as if they were UTC: a plain number to do wall-clock arithmetic on. */
function naiveMs(w: WallTime): number {
	const d = new Date(0);
	d.setUTCFullYear(w.year, w.month - 1, w.day);
	d.setUTCHours(w.hour, w.minute, w.second, w.millisecond);
	return d.getTime();
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

/** Resolves wall-clock fields (as a naive ms count) against the zone's offsets. */
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

/**
 * Turns a wall time into one instant for rule boundaries (opening hours, day bounds, horizon):
 * a repeated time is its first occurrence (RFC 5545 §3.3.5), a skipped time is the instant the
 * clocks jumped (the first real instant at or after that wall time: a day whose midnight is
 * skipped starts there, a studio opening at a skipped 03:30 opens when the clocks read 04:00).
 */
function boundaryInstant(naive: number, timeZone: string): number {
	const r = resolveNaive(naive, timeZone);
	switch (r.kind) {
		case 'unique':
			return r.instant.getTime();
		case 'repeated':
			return r.first.getTime();
		case 'skipped':
			return r.transition.getTime();
	}
}

function mustParseYmd(ymd: string) {
	const d = parseYmd(ymd);
	if (!d) throw new TimeInputError('invalid-date', `Not a calendar date (YYYY-MM-DD): ${JSON.stringify(ymd)}`);
	return d;
}

/**
 * The instant of `minuteOfDay` minutes after the start of local date `ymd`, counted on the wall
 * clock; values of 1440 and above fall on later dates (1800 = 06:00 the next day). Gap and
 * overlap rules as boundaryInstant.
 */
export function wallMinuteInstant(ymd: string, minuteOfDay: number, timeZone: string): number {
	const dayOffset = Math.floor(minuteOfDay / 1440);
	const minute = minuteOfDay - dayOffset * 1440;
	const d = mustParseYmd(dayOffset === 0 ? ymd : addDays(ymd, dayOffset));
	return boundaryInstant(
		naiveMs({
			...d,
			hour: Math.floor(minute / 60),
			minute: minute % 60,
			second: 0,
			millisecond: 0
		}),
		timeZone
	);
}

/**
 * Start and end instants of local day `ymd` in `timeZone`, half-open [start, end). The length is
 * whatever the tz database says: 23 h on 2027-03-28 and 25 h on 2027-10-31 in Europe/Helsinki.
 */
export function localDayBounds(ymd: string, timeZone: string): { start: Date; end: Date } {
	assertTimeZone(timeZone);
	mustParseYmd(ymd);
	return {
		start: new Date(wallMinuteInstant(ymd, 0, timeZone)),
		end: new Date(wallMinuteInstant(ymd, 1440, timeZone))
	};
}

const HHMM_RE = /^(\d{2}):(\d{2})(?::(\d{2}))?$/;

function parseClock(time: string, allowSeconds: boolean): { hour: number; minute: number; second: number } {
	const m = HHMM_RE.exec(time);
	if (!m || (!allowSeconds && m[3] !== undefined)) {
		throw new TimeInputError('invalid-format', `Not a time of day (HH:MM): ${JSON.stringify(time)}`);
	}
	const hour = Number(m[1]);
	const minute = Number(m[2]);
	const second = m[3] === undefined ? 0 : Number(m[3]);
	// 24:00 is refused: ISO 8601 allows it only as an end-of-day marker, which is not a start.
	if (hour > 23 || minute > 59 || second > 59) {
		throw new TimeInputError('invalid-time', `Not a time of day: ${JSON.stringify(time)}`);
	}
	return { hour, minute, second };
}

/** How the local wall time `time` ('HH:MM') on `ymd` maps to instants in `timeZone`. */
export function resolveWallTime(ymd: string, time: string, timeZone: string): WallTimeResolution {
	assertTimeZone(timeZone);
	const d = mustParseYmd(ymd);
	const c = parseClock(time, true);
	return resolveNaive(naiveMs({ ...d, ...c, millisecond: 0 }), timeZone);
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

// RFC 3339 §5.6 date-time (the ISO 8601 profile used on the wire), seconds and up to 3 fraction digits optional.
const WITH_OFFSET_RE = /^(\d{4}-\d{2}-\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?(Z|[+-](\d{2}):(\d{2}))$/;
// A local date-time with no offset, as an <input type="datetime-local"> sends it.
const LOCAL_RE = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2}(?::\d{2})?)$/;

/**
 * Parses a booking time from a form or API body.
 * - `2027-03-28T10:00:00+03:00`, `2027-03-28T07:00Z`: ISO 8601 / RFC 3339 with an offset; the
 *   offset fixes the instant, whatever the zone.
 * - `2027-03-28T10:00`: local wall time in `timeZone`, with the gap refused and a repeated time
 *   taken as its first occurrence (see zonedWallTime).
 * Anything else throws TimeInputError with a message fit to show next to the field.
 */
export function parseBookingInstant(s: string, timeZone: string): Date {
	assertTimeZone(timeZone);
	if (typeof s !== 'string') {
		throw new TimeInputError('invalid-format', 'A date and time is required');
	}
	const withOffset = WITH_OFFSET_RE.exec(s);
	if (withOffset) {
		const [, ymd = '', hh = '', mm = '', ss, frac, zone = '', oh, om] = withOffset;
		const d = mustParseYmd(ymd);
		const c = parseClock(`${hh}:${mm}${ss === undefined ? '' : `:${ss}`}`, true);
		let offsetMs = 0;
		if (zone !== 'Z') {
			const offH = Number(oh);
			const offM = Number(om);
			if (offH > 23 || offM > 59) {
				throw new TimeInputError('invalid-offset', `Not a UTC offset: ${zone} in ${JSON.stringify(s)}`);
			}
			offsetMs = (zone.startsWith('-') ? -1 : 1) * (offH * 60 + offM) * MINUTE_MS;
		}
		const millisecond = frac === undefined ? 0 : Number(frac.padEnd(3, '0'));
		return new Date(naiveMs({ ...d, ...c, millisecond }) - offsetMs);
	}
	const local = LOCAL_RE.exec(s);
	if (local) {
		const [, ymd = '', time = ''] = local;
		return zonedWallTime(ymd, time, timeZone);
	}
	throw new TimeInputError(
		'invalid-format',
		`Not a date and time: ${JSON.stringify(s)}; expected e.g. 2027-03-28T10:00:00+03:00, 2027-03-28T07:00:00Z or a local 2027-03-28T10:00`
	);
}

/**
 * The same local wall time `days` calendar days later (a nominal day, as in RFC 5545 durations
 * and Temporal's ZonedDateTime.add({ days })): across a DST change this is 23 or 25 real hours.
 */
export function addLocalDays(instant: number, days: number, timeZone: string): number {
	const w = wallTimeOf(instant, timeZone);
	const target = mustParseYmd(addDays(formatYmd(w), days));
	return boundaryInstant(naiveMs({ ...w, ...target }), timeZone);
}

// ---------------------------------------------------------------------------------------------
// The booking grid: instants whose local wall time is a whole multiple of the increment counted
// from local midnight (09:00, 09:30, ... for 30 min). In Europe/Helsinki the offset is whole hours
// so the UTC and local grids coincide, but in Asia/Kolkata (+05:30) or Asia/Kathmandu (+05:45)
// they do not, and around a DST change the offset moves under our feet; hence the checks below.

/** Milliseconds since the last grid line on the local wall clock (0 when on the grid). */
function msPastGrid(ms: number, timeZone: string, incrementMs: number): { past: number; toMidnight: number } {
	const w = wallTimeOf(ms, timeZone);
	const msOfDay = ((w.hour * 60 + w.minute) * 60 + w.second) * 1000 + w.millisecond;
	return { past: msOfDay % incrementMs, toMidnight: DAY_MS - msOfDay };
}

export function isOnLocalGrid(ms: number, timeZone: string, incrementMinutes: number): boolean {
	return msPastGrid(ms, timeZone, incrementMinutes * MINUTE_MS).past === 0;
}

/** The first instant at or after `ms` that lies on the local grid. */
export function ceilToLocalGrid(ms: number, timeZone: string, incrementMinutes: number): number {
	const inc = incrementMinutes * MINUTE_MS;
	let t = ms;
	for (let guard = 0; guard < 16; guard++) {
		const { past, toMidnight } = msPastGrid(t, timeZone, inc);
		if (past === 0) return t;
		// The grid restarts at each local midnight, so when the increment does not divide a day
		// the next line may be midnight rather than the next multiple.
		const candidate = t + Math.min(inc - past, toMidnight);
		if (offsetMsAt(timeZone, candidate) === offsetMsAt(timeZone, t)) return candidate;
		// The offset changed before the candidate: on the old offset no grid line comes before the
		// change, so carry on from the instant of the change on the new offset.
		t = findTransition(timeZone, t, candidate);
	}
	throw new Error('ceilToLocalGrid did not converge');
}

/** The last instant at or before `ms` that lies on the local grid. */
export function floorToLocalGrid(ms: number, timeZone: string, incrementMinutes: number): number {
	const inc = incrementMinutes * MINUTE_MS;
	let t = ms;
	for (let guard = 0; guard < 16; guard++) {
		const { past } = msPastGrid(t, timeZone, inc);
		if (past === 0) return t;
		const candidate = t - past;
		if (offsetMsAt(timeZone, candidate) === offsetMsAt(timeZone, t)) return candidate;
		// The offset changed after the candidate: no grid line between the change and t on the
		// current offset, so carry on from just before the change on the old offset.
		t = findTransition(timeZone, candidate, t) - 1;
	}
	throw new Error('floorToLocalGrid did not converge');
}

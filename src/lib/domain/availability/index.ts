/**
 * Availability of a room (or an engineer): when can a booking be made?
 *
 * Pure functions: the caller loads the policy, the busy intervals (active bookings and unexpired
 * holds, WITHOUT turnaround) and the closed days (blackouts, and public holidays when the studio
 * closes on them), and passes `now`. Every wall-clock rule is evaluated in policy.timeZone with
 * @date-fns/tz, never in the host's zone, so results are the same on any server.
 *
 * How the open windows are built, in order:
 * 1. Opening hours per ISO weekday, as local wall times (closeMinute > 1440 runs into the next
 *    day); touching windows are joined, so a studio open round the clock has one long window.
 * 2. Minus each busy interval, widened by the turnaround on BOTH sides: after it, because the
 *    room is being reset; before it, because the new booking's own turnaround must also end
 *    before the next booking starts (every booking is followed by its turnaround). So every
 *    instant reported open can really be booked, turnaround included. The turnaround of a
 *    booking that ends at closing time may run past closing: tidying up after hours needs no
 *    opening hours.
 * 3. Minus closed days: on a blackout date nothing is open from its local midnight to the next,
 *    and that date's own opening hours do not happen at all (an overnight window that would
 *    start on a closed day is dropped entirely, including the part after midnight).
 * 4. Nothing before now + minNoticeMinutes (real elapsed minutes) and nothing after the same
 *    wall time horizonDays calendar days later (nominal days, as Temporal's add({ days })).
 * 5. Each window snapped to the increment grid of the local wall clock (start up, end down).
 * 6. Windows shorter than minBookingMinutes (real elapsed time) are dropped.
 */
import type { StudioPolicy } from '../types';
import {
	addDays,
	addLocalDays,
	assertTimeZone,
	ceilToLocalGrid,
	eachDay,
	floorToLocalGrid,
	isOnLocalGrid,
	isoWeekday,
	isYmd,
	localDateOf,
	localToInstant,
	maxYmd,
	minYmd
} from '../time';
import { AvailabilityInputError } from './errors';
import { clipSpans, mergeSpans, subtractSpans, toInterval, toSpan, type Interval, type Span } from './intervals';

export { overlaps, type Interval } from './intervals';
export { AvailabilityInputError, type AvailabilityInputErrorCode } from './errors';

const MINUTE_MS = 60_000;

/** The instant (ms) of a local wall time, as a rule boundary (see localToInstant). */
const wallInstant = (ymd: string, minuteOfDay: number, timeZone: string): number =>
	localToInstant(ymd, minuteOfDay, timeZone).instant.getTime();

/** The parts of the studio policy availability reads; a full StudioPolicy fits. */
export type AvailabilityPolicy = Pick<
	StudioPolicy,
	| 'timeZone'
	| 'openingHours'
	| 'minBookingMinutes'
	| 'incrementMinutes'
	| 'turnaroundMinutes'
	| 'minNoticeMinutes'
	| 'horizonDays'
>;

export interface Blackout {
	/** Local calendar date in the studio's zone, YYYY-MM-DD. */
	date: string;
	reason?: string;
}

export interface ClosedDay {
	date: string;
	/** The blackout's reason(s), joined with '; '; 'Closed' when none was given. */
	reason: string;
}

export interface AvailabilityInput {
	/** First local date, YYYY-MM-DD in policy.timeZone. */
	from: string;
	/** Last local date, inclusive. */
	to: string;
	policy: AvailabilityPolicy;
	/** Active bookings and unexpired holds of the room (or engineer), WITHOUT turnaround. */
	busy: readonly Interval[];
	/** Studio-wide closed days, including public holidays when the studio closes on them. */
	blackouts: readonly Blackout[];
	now: Date;
}

export interface Availability {
	timeZone: string;
	/**
	 * Bookable windows, sorted, disjoint, clipped to the local days from..to. Each was at least
	 * minBookingMinutes long before clipping; a piece cut at the range edge may be shorter.
	 */
	open: Interval[];
	/** Busy intervals extended by the turnaround after each, merged, clipped to the range. */
	busy: Interval[];
	/** Blackout days within from..to. */
	closed: ClosedDay[];
}

export interface FitInput extends AvailabilityInput {
	/** Length of the booking wanted, in real elapsed minutes. */
	durationMinutes: number;
}

// ---------------------------------------------------------------------------------------------
// Input checks: these inputs come from our own code and the database, so a bad one is a bug we
// want loudly, not an empty calendar.

function fail(code: ConstructorParameters<typeof AvailabilityInputError>[0], message: string): never {
	throw new AvailabilityInputError(code, message);
}

// The checks answer yes or no and narrow nothing: a value typed as a number that is out of range
// is still a number for the message, and Array.isArray would turn a typed readonly list into any[].
function isInt(n: unknown, min: number, max = Number.MAX_SAFE_INTEGER): boolean {
	return typeof n === 'number' && Number.isInteger(n) && n >= min && n <= max;
}

function isValidDate(d: unknown): boolean {
	return d instanceof Date && Number.isFinite(d.getTime());
}

function isList(v: unknown): boolean {
	return Array.isArray(v);
}

function checkPolicy(p: AvailabilityPolicy): void {
	try {
		assertTimeZone(p.timeZone);
	} catch {
		fail('invalid-policy', `policy.timeZone is not a known IANA zone: ${JSON.stringify(p.timeZone)}`);
	}
	if (!isInt(p.incrementMinutes, 1, 1440)) fail('invalid-policy', 'policy.incrementMinutes must be an integer 1..1440');
	if (!isInt(p.minBookingMinutes, 0)) fail('invalid-policy', 'policy.minBookingMinutes must be a non-negative integer');
	if (!isInt(p.turnaroundMinutes, 0)) fail('invalid-policy', 'policy.turnaroundMinutes must be a non-negative integer');
	if (!isInt(p.minNoticeMinutes, 0)) fail('invalid-policy', 'policy.minNoticeMinutes must be a non-negative integer');
	if (!isInt(p.horizonDays, 0, 3660)) fail('invalid-policy', 'policy.horizonDays must be an integer 0..3660');
	if (!isList(p.openingHours)) fail('invalid-policy', 'policy.openingHours must be an array');
	for (const h of p.openingHours) {
		if (!isInt(h.weekday, 1, 7)) fail('invalid-policy', `opening hours weekday must be ISO 1..7, got ${h.weekday}`);
		if (!isInt(h.openMinute, 0, 1439)) fail('invalid-policy', `openMinute must be 0..1439, got ${h.openMinute}`);
		// One opening may last at most a whole day; 1440 + 360 = 06:00 the next morning.
		if (!isInt(h.closeMinute, h.openMinute, h.openMinute + 1440)) {
			fail('invalid-policy', `closeMinute must be openMinute..openMinute+1440, got ${h.closeMinute}`);
		}
	}
}

interface Prepared {
	policy: AvailabilityPolicy;
	timeZone: string;
	rangeStart: number;
	rangeEnd: number;
	/** now + minimum notice. */
	earliest: number;
	/** now + horizon. */
	horizonEnd: number;
	busy: Span[];
	blackouts: readonly Blackout[];
}

function prepare(input: AvailabilityInput): Prepared {
	const { from, to, policy, busy, blackouts, now } = input;
	checkPolicy(policy);
	if (!isYmd(from) || !isYmd(to)) fail('invalid-range', `from and to must be YYYY-MM-DD dates, got ${from}..${to}`);
	if (to < from) fail('invalid-range', `to (${to}) is before from (${from})`);
	if (!isValidDate(now)) fail('invalid-now', 'now must be a valid Date');
	if (!isList(busy)) fail('invalid-busy', 'busy must be an array');
	for (const b of busy) {
		if (!isValidDate(b.start) || !isValidDate(b.end) || b.end < b.start) {
			fail('invalid-busy', 'each busy interval needs valid start <= end Dates');
		}
	}
	if (!isList(blackouts)) fail('invalid-blackout', 'blackouts must be an array');
	for (const b of blackouts) {
		if (!isYmd(b.date)) fail('invalid-blackout', `blackout date must be YYYY-MM-DD, got ${JSON.stringify(b.date)}`);
	}
	const tz = policy.timeZone;
	const nowMs = now.getTime();
	return {
		policy,
		timeZone: tz,
		rangeStart: wallInstant(from, 0, tz),
		rangeEnd: wallInstant(to, 1440, tz),
		earliest: nowMs + policy.minNoticeMinutes * MINUTE_MS,
		horizonEnd: addLocalDays(nowMs, policy.horizonDays, tz),
		// A zero-length interval books nothing, so it blocks nothing (not even turnaround).
		busy: busy.map(toSpan).filter((b) => b.end > b.start),
		blackouts
	};
}

/** The union of opening-hours windows whose opening falls on a local date in anchorFrom..anchorTo. */
function openingSpans(
	policy: Pick<AvailabilityPolicy, 'timeZone' | 'openingHours'>,
	anchorFrom: string,
	anchorTo: string,
	skip: ReadonlySet<string> = new Set()
): Span[] {
	const tz = policy.timeZone;
	const spans: Span[] = [];
	for (const day of eachDay(anchorFrom, anchorTo)) {
		if (skip.has(day)) continue;
		const weekday = isoWeekday(day);
		for (const h of policy.openingHours) {
			if (h.weekday !== weekday || h.closeMinute <= h.openMinute) continue;
			const start = wallInstant(day, h.openMinute, tz);
			const end = wallInstant(day, h.closeMinute, tz);
			if (end > start) spans.push({ start, end });
		}
	}
	return mergeSpans(spans);
}

/**
 * The bookable windows among the opening hours of local dates anchorFrom..anchorTo, whole
 * (not clipped to the requested range), after steps 1–6 of the header comment.
 */
function freeSpans(p: Prepared, anchorFrom: string, anchorTo: string): Span[] {
	const { policy, timeZone: tz } = p;
	if (p.horizonEnd <= p.earliest) return [];
	// Only the days that can hold anything bookable: from the day before the notice ends (an
	// overnight window may start then) to the day the horizon falls on. This also bounds the work
	// however wide a range a caller asks for.
	const lo = maxYmd(anchorFrom, addDays(localDateOf(p.earliest, tz), -1));
	const hi = minYmd(anchorTo, localDateOf(p.horizonEnd, tz));
	if (hi < lo) return [];

	const closedDates = new Set(p.blackouts.map((b) => b.date));
	const opening = openingSpans(policy, lo, hi, closedDates);

	const turnaround = policy.turnaroundMinutes * MINUTE_MS;
	const cuts: Span[] = p.busy.map((b) => ({
		start: b.start - turnaround,
		end: b.end + turnaround
	}));
	for (const date of closedDates) {
		// Windows of anchors lo..hi end before hi + 2 days; later or earlier blackouts cannot touch them.
		if (date < addDays(lo, -1) || date > addDays(hi, 1)) continue;
		cuts.push({ start: wallInstant(date, 0, tz), end: wallInstant(date, 1440, tz) });
	}
	const free = clipSpans(subtractSpans(opening, cuts), p.earliest, p.horizonEnd);

	const minLength = policy.minBookingMinutes * MINUTE_MS;
	const out: Span[] = [];
	for (const s of free) {
		const start = ceilToLocalGrid(s.start, tz, policy.incrementMinutes);
		const end = floorToLocalGrid(s.end, tz, policy.incrementMinutes);
		if (end > start && end - start >= minLength) out.push({ start, end });
	}
	return out;
}

function closedDays(blackouts: readonly Blackout[], from: string, to: string): ClosedDay[] {
	const reasons = new Map<string, string[]>();
	for (const b of blackouts) {
		if (b.date < from || b.date > to) continue;
		const list = reasons.get(b.date) ?? [];
		const reason = b.reason?.trim();
		if (reason && !list.includes(reason)) list.push(reason);
		reasons.set(b.date, list);
	}
	return [...reasons.entries()]
		.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
		.map(([date, list]) => ({ date, reason: list.length > 0 ? list.join('; ') : 'Closed' }));
}

/** Open windows, busy intervals and closed days of the local dates from..to. */
export function computeAvailability(input: AvailabilityInput): Availability {
	const p = prepare(input);
	// Anchors one day either side, so a window that runs over the range's edge (overnight
	// opening, or round-the-clock hours joined across midnight) is judged whole before clipping.
	const windows = freeSpans(p, addDays(input.from, -1), addDays(input.to, 1));
	const turnaround = p.policy.turnaroundMinutes * MINUTE_MS;
	const busy = mergeSpans(p.busy.map((b) => ({ start: b.start, end: b.end + turnaround })));
	return {
		timeZone: p.timeZone,
		open: clipSpans(windows, p.rangeStart, p.rangeEnd).map(toInterval),
		busy: clipSpans(busy, p.rangeStart, p.rangeEnd).map(toInterval),
		closed: closedDays(p.blackouts, input.from, input.to)
	};
}

/**
 * Every start on the increment grid, on a local date from..to, at which a booking of
 * durationMinutes (real elapsed time) fits wholly inside an open window, in time order. The
 * booking may run past the end of `to` (a 22:00 start on an overnight studio's last day).
 */
export function startsThatFit(input: FitInput): Date[] {
	const p = prepare(input);
	const { durationMinutes } = input;
	const { incrementMinutes, minBookingMinutes } = p.policy;
	if (!isInt(durationMinutes, 1)) fail('invalid-duration', 'durationMinutes must be a positive integer');
	if (durationMinutes < minBookingMinutes) {
		fail('invalid-duration', `a booking lasts at least ${minBookingMinutes} minutes (policy.minBookingMinutes)`);
	}
	if (durationMinutes % incrementMinutes !== 0) {
		fail('invalid-duration', `a booking lasts a whole number of ${incrementMinutes}-minute increments`);
	}
	const duration = durationMinutes * MINUTE_MS;
	const tz = p.timeZone;
	const windows = freeSpans(p, addDays(input.from, -1), addDays(input.to, Math.ceil(durationMinutes / 1440) + 1));
	const out: Date[] = [];
	for (const w of windows) {
		let s = ceilToLocalGrid(Math.max(w.start, p.rangeStart), tz, incrementMinutes);
		while (s < p.rangeEnd && s + duration <= w.end) {
			out.push(new Date(s));
			s = ceilToLocalGrid(s + 1, tz, incrementMinutes);
		}
	}
	return out;
}

/**
 * The `count` starts that fit closest to desiredStart by absolute distance, closest first (an
 * earlier start wins a tie), for the "try one of these" answer to a 409. `accept` leaves out
 * starts that fit the room but not something else the booking needs (an engineer, its gear).
 */
export function nearestFreeStarts(
	input: FitInput,
	desiredStart: Date,
	count = 3,
	accept: (start: Date) => boolean = () => true
): Date[] {
	if (!isValidDate(desiredStart)) fail('invalid-now', 'desiredStart must be a valid Date');
	if (!isInt(count, 0)) fail('invalid-count', 'count must be a non-negative integer');
	const want = desiredStart.getTime();
	const out: Date[] = [];
	const byNearness = startsThatFit(input)
		.map((d) => ({ d, distance: Math.abs(d.getTime() - want) }))
		.sort((a, b) => a.distance - b.distance || a.d.getTime() - b.d.getTime());
	for (const { d } of byNearness) {
		if (out.length >= count) break;
		if (accept(d)) out.push(d);
	}
	return out;
}

/**
 * True when [start, end) lies wholly inside the opening hours (blackouts, bookings and notice
 * are not considered here). An empty or reversed interval is not a booking: false.
 */
export function isWithinOpeningHours(
	start: Date,
	end: Date,
	policy: Pick<AvailabilityPolicy, 'timeZone' | 'openingHours'>
): boolean {
	if (!isValidDate(start) || !isValidDate(end) || end <= start) return false;
	assertTimeZone(policy.timeZone);
	const s = start.getTime();
	const e = end.getTime();
	// The window holding `start` opened on start's local date or, overnight, the day before.
	const windows = openingSpans(policy, addDays(localDateOf(s, policy.timeZone), -1), localDateOf(e, policy.timeZone));
	return windows.some((w) => w.start <= s && e <= w.end);
}

/** True when the instant's local wall time is a whole multiple of the increment from local midnight. */
export function isOnGrid(instant: Date, policy: Pick<AvailabilityPolicy, 'timeZone' | 'incrementMinutes'>): boolean {
	if (!isValidDate(instant)) return false;
	assertTimeZone(policy.timeZone);
	return isOnLocalGrid(instant.getTime(), policy.timeZone, policy.incrementMinutes);
}

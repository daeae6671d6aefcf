/**
 * Property tests (fast-check). Two kinds:
 * 1. Invariants of computeAvailability that must hold for any policy, bookings and closed days:
 *    open never overlaps a booking widened by its turnaround, never starts before now + notice,
 *    always lies within opening hours (and the horizon, the grid, off closed days).
 * 2. startsThatFit against a brute-force oracle written with Temporal (temporal-polyfill), a
 *    second, independent implementation of the IANA tz rules, trying every 15 minutes.
 * Zones are chosen to exercise DST: Europe/Helsinki (EU rule, Directive 2000/84/EC), America/New_York
 * (US rule, 15 U.S.C. §260a), Asia/Kolkata (+05:30, no DST) and Australia/Lord_Howe (+10:30 with a
 * 30-minute summer shift); dates are drawn near their 2027 changes half the time.
 */
import fc from 'fast-check';
import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import type { OpeningHours } from '../types';
import {
	computeAvailability,
	isOnGrid,
	isWithinOpeningHours,
	overlaps,
	startsThatFit,
	type AvailabilityInput,
	type Interval
} from './index';
import { localDayBounds } from '../time';
import { demoPolicy } from '$fixtures/availability';

const MIN = 60_000;
const DAY = 86_400_000;

// IANA tz 2027 transitions of each zone, as local dates.
const ZONES = {
	'Europe/Helsinki': ['2027-03-28', '2027-10-31'],
	'America/New_York': ['2027-03-14', '2027-11-07'],
	'Asia/Kolkata': ['2027-06-01'],
	'Australia/Lord_Howe': ['2027-04-04', '2027-10-03']
} as const;
type Zone = keyof typeof ZONES;

const plainDate = (ymd: string) => Temporal.PlainDate.from(ymd);

/** Oracle wall time -> instant with the documented rules: first occurrence; a gap maps to the jump. */
function oracleInstant(pdt: Temporal.PlainDateTime, tz: string): number {
	const earlier = pdt.toZonedDateTime(tz, { disambiguation: 'earlier' });
	if (Temporal.PlainDateTime.compare(earlier.toPlainDateTime(), pdt) === 0) return earlier.epochMilliseconds;
	const jump = earlier.getTimeZoneTransition('next');
	if (!jump) throw new Error('gap without a transition');
	return jump.epochMilliseconds;
}

const midnight = (d: Temporal.PlainDate, tz: string) => oracleInstant(d.toPlainDateTime({ hour: 0 }), tz);

function oracleStarts(input: AvailabilityInput, durationMinutes: number): number[] {
	const { policy, now } = input;
	const tz = policy.timeZone;
	const from = plainDate(input.from);
	const to = plainDate(input.to);
	const rangeStart = midnight(from, tz);
	const rangeEnd = midnight(to.add({ days: 1 }), tz);
	const earliest = now.getTime() + policy.minNoticeMinutes * MIN;
	const horizon = oracleInstant(
		Temporal.Instant.fromEpochMilliseconds(now.getTime())
			.toZonedDateTimeISO(tz)
			.toPlainDateTime()
			.add({ days: policy.horizonDays }),
		tz
	);
	const closed = new Set(input.blackouts.map((b) => b.date));
	const opening: [number, number][] = [];
	for (let d = from.subtract({ days: 2 }); Temporal.PlainDate.compare(d, to.add({ days: 3 })) <= 0; d = d.add({ days: 1 })) {
		if (closed.has(d.toString())) continue; // a closed day's own hours do not happen
		for (const h of policy.openingHours) {
			if (h.weekday !== d.dayOfWeek) continue;
			const base = d.toPlainDateTime({ hour: 0 });
			opening.push([
				oracleInstant(base.add({ minutes: h.openMinute }), tz),
				oracleInstant(base.add({ minutes: h.closeMinute }), tz)
			]);
		}
	}
	// Union of opening windows (touching ones join).
	opening.sort((a, b) => a[0] - b[0]);
	const merged: [number, number][] = [];
	for (const w of opening) {
		const last = merged.at(-1);
		if (last && w[0] <= last[1]) last[1] = Math.max(last[1], w[1]);
		else merged.push([w[0], w[1]]);
	}
	const closedSpans = [...closed].map((ymd) => [midnight(plainDate(ymd), tz), midnight(plainDate(ymd).add({ days: 1 }), tz)]);
	const t = policy.turnaroundMinutes * MIN;
	const dur = durationMinutes * MIN;
	const hit = (s: number, e: number, a: number, b: number) => s < b && a < e;
	const out: number[] = [];
	for (let s = rangeStart; s < rangeEnd; s += 15 * MIN) {
		const z = Temporal.Instant.fromEpochMilliseconds(s).toZonedDateTimeISO(tz);
		if ((z.hour * 60 + z.minute) % policy.incrementMinutes !== 0) continue;
		const e = s + dur;
		if (s < earliest || e > horizon) continue;
		if (!merged.some(([a, b]) => a <= s && e <= b)) continue;
		if (closedSpans.some(([a = 0, b = 0]) => hit(s, e, a, b))) continue;
		if (input.busy.some((b) => hit(s, e, b.start.getTime() - t, b.end.getTime() + t))) continue;
		out.push(s);
	}
	return out;
}

const openingArb: fc.Arbitrary<OpeningHours[]> = fc
	.array(
		fc.record({
			weekday: fc.integer({ min: 1, max: 7 }),
			open: fc.integer({ min: 0, max: 47 }),
			length: fc.integer({ min: 1, max: 48 })
		}),
		{ minLength: 1, maxLength: 9 }
	)
	.map((rows) =>
		rows.map((r) => ({
			weekday: r.weekday,
			openMinute: r.open * 30,
			closeMinute: r.open * 30 + r.length * 30
		}))
	);

interface Scenario {
	input: AvailabilityInput;
	durationMinutes: number;
	/** false where the oracle's 15-minute scan cannot model the grid exactly (see below). */
	exact: boolean;
}

const scenarioArb: fc.Arbitrary<Scenario> = fc
	.constantFrom(...(Object.keys(ZONES) as Zone[]))
	.chain((zone) =>
		fc.record({
			zone: fc.constant(zone),
			day: fc.oneof(
				fc.record({
					base: fc.constantFrom<string>(...ZONES[zone]),
					shift: fc.integer({ min: -2, max: 1 })
				}),
				fc.record({ base: fc.constant('2027-01-01'), shift: fc.integer({ min: 0, max: 364 }) })
			),
			span: fc.integer({ min: 0, max: 3 }),
			increment: fc.constantFrom(15, 30, 60),
			minBooking: fc.constantFrom(60, 120, 240),
			blocks: fc.integer({ min: 1, max: 3 }),
			turnaround: fc.constantFrom(0, 15, 30, 45, 60),
			notice: fc.constantFrom(0, 60, 1440, 2000),
			horizon: fc.constantFrom(1, 3, 10, 180),
			opening: fc.oneof(openingArb, fc.constant(demoPolicy().openingHours)),
			nowBack: fc.integer({ min: 0, max: 4 * 24 * 60 * 60 }), // seconds before the range starts
			busy: fc.array(
				fc.record({
					at: fc.integer({ min: -24 * 60, max: 6 * 24 * 60 }),
					minutes: fc.integer({ min: 1, max: 600 }),
					sec: fc.integer({ min: 0, max: 59 })
				}),
				{ maxLength: 6 }
			),
			closed: fc.array(fc.integer({ min: -1, max: 4 }), { maxLength: 2 })
		})
	)
	.map((r) => {
		const from = plainDate(r.day.base).add({ days: r.day.shift });
		const to = from.add({ days: r.span });
		const policy = demoPolicy({
			timeZone: r.zone,
			openingHours: r.opening,
			incrementMinutes: r.increment,
			minBookingMinutes: r.minBooking,
			turnaroundMinutes: r.turnaround,
			minNoticeMinutes: r.notice,
			horizonDays: r.horizon
		});
		const rangeStart = midnight(from, r.zone);
		const input: AvailabilityInput = {
			from: from.toString(),
			to: to.toString(),
			policy,
			now: new Date(rangeStart - r.nowBack * 1000),
			busy: r.busy.map((b) => {
				const start = rangeStart + b.at * MIN + b.sec * 1000;
				return { start: new Date(start), end: new Date(start + b.minutes * MIN) };
			}),
			blackouts: r.closed.map((k) => ({ date: from.add({ days: k }).toString() }))
		};
		// Lord Howe shifts by 30 min, so on a 60-min grid a booking of whole hours can start on the
		// grid and end off it; the oracle does not model the end being floored to the grid there.
		return {
			input,
			durationMinutes: r.minBooking * r.blocks,
			exact: !(r.zone === 'Australia/Lord_Howe' && r.increment === 60)
		};
	});

describe('computeAvailability properties', () => {
	it('open windows avoid bookings plus turnaround, respect notice, horizon, grid and closed days, and lie within opening hours', () => {
		fc.assert(
			fc.property(scenarioArb, ({ input }) => {
				const { policy } = input;
				const a = computeAvailability(input);
				const t = policy.turnaroundMinutes * MIN;
				const range = {
					start: localDayBounds(input.from, policy.timeZone).start,
					end: localDayBounds(input.to, policy.timeZone).end
				};
				const earliest = input.now.getTime() + policy.minNoticeMinutes * MIN;
				const extended: Interval[] = input.busy.map((b) => ({
					start: b.start,
					end: new Date(b.end.getTime() + t)
				}));
				const closedDays = input.blackouts.map((b) => localDayBounds(b.date, policy.timeZone));
				let previousEnd = -Infinity;
				for (const w of a.open) {
					expect(w.start.getTime()).toBeLessThan(w.end.getTime());
					expect(w.start.getTime()).toBeGreaterThanOrEqual(previousEnd); // sorted, disjoint
					previousEnd = w.end.getTime();
					expect(w.start.getTime()).toBeGreaterThanOrEqual(Math.max(earliest, range.start.getTime()));
					expect(w.end.getTime()).toBeLessThanOrEqual(range.end.getTime());
					expect(w.end.getTime()).toBeLessThanOrEqual(input.now.getTime() + (policy.horizonDays + 1) * DAY);
					// The brief's invariant: never inside a booking extended by its turnaround ...
					for (const b of extended) expect(overlaps(w, b)).toBe(false);
					// ... and (our rule) never in the turnaround a new booking would need before one.
					for (const b of input.busy) expect(overlaps(w, { start: new Date(b.start.getTime() - t), end: b.start })).toBe(false);
					for (const c of closedDays) expect(overlaps(w, c)).toBe(false);
					expect(isWithinOpeningHours(w.start, w.end, policy)).toBe(true);
					expect(isOnGrid(w.start, policy)).toBe(true);
					expect(isOnGrid(w.end, policy)).toBe(true);
				}
				for (const b of a.busy) {
					expect(b.start >= range.start && b.end <= range.end).toBe(true);
				}
			}),
			{ numRuns: 300 }
		);
	});

	it('startsThatFit matches a brute-force Temporal oracle, and every start lies in an open window', () => {
		fc.assert(
			fc.property(scenarioArb, ({ input, durationMinutes, exact }) => {
				const starts = startsThatFit({ ...input, durationMinutes });
				const open = computeAvailability(input).open;
				for (const s of starts) {
					expect(open.some((w) => w.start <= s && s < w.end)).toBe(true);
					expect(isOnGrid(s, input.policy)).toBe(true);
				}
				if (exact) expect(starts.map((d) => d.getTime())).toEqual(oracleStarts(input, durationMinutes));
			}),
			{ numRuns: 150 }
		);
	});
});

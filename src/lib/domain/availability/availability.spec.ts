import { TZDate } from '@date-fns/tz';
import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import {
	AvailabilityInputError,
	computeAvailability,
	isOnGrid,
	isWithinOpeningHours,
	nearestFreeStarts,
	startsThatFit,
	type AvailabilityInput
} from './index';
import { localDayBounds } from '../time';
import { at, demoPolicy, everyDay, HELSINKI, iso } from '$fixtures/availability';

const HOUR = 3_600_000;

/** Expected instants built with @date-fns/tz directly, independently of our wall-time resolver. */
const helsinki = (y: number, m: number, d: number, h: number, min = 0): string =>
	new Date(new TZDate(y, m - 1, d, h, min, HELSINKI).getTime()).toISOString();

function input(over: Partial<AvailabilityInput> = {}): AvailabilityInput {
	return {
		from: '2027-01-15',
		to: '2027-01-15',
		policy: demoPolicy(),
		busy: [],
		blackouts: [],
		now: at('2027-01-10T12:00:00Z'),
		...over
	};
}

describe('computeAvailability — demo studio (open 09:00–23:00, 2 h min, 30 min grid and turnaround)', () => {
	it('an empty winter day is one window 09:00–23:00 at +02:00', () => {
		const a = computeAvailability(input());
		expect(a.timeZone).toBe(HELSINKI);
		// @date-fns/tz TZDate, and the literal +02:00 (IANA tz: EET in January).
		expect(iso(a.open)).toEqual([[helsinki(2027, 1, 15, 9), helsinki(2027, 1, 15, 23)]]);
		expect(iso(a.open)).toEqual([[at('2027-01-15T09:00:00+02:00').toISOString(), at('2027-01-15T23:00:00+02:00').toISOString()]]);
		expect(a.busy).toEqual([]);
		expect(a.closed).toEqual([]);
	});

	it('an empty summer day is one window 09:00–23:00 at +03:00', () => {
		const a = computeAvailability(input({ from: '2027-07-15', to: '2027-07-15', now: at('2027-07-01T12:00:00Z') }));
		// @date-fns/tz TZDate, and the literal +03:00 (IANA tz: EEST in July, Directive 2000/84/EC).
		expect(iso(a.open)).toEqual([[helsinki(2027, 7, 15, 9), helsinki(2027, 7, 15, 23)]]);
		expect(iso(a.open)).toEqual([[at('2027-07-15T09:00:00+03:00').toISOString(), at('2027-07-15T23:00:00+03:00').toISOString()]]);
	});

	it('a booking 10:00–14:00 leaves 14:30–23:00 (turnaround after) and drops the 09:00 stub (< 2 h minimum)', () => {
		// The demo policy: turnaround 30 min after each booking, minimum booking 2 h.
		const booking = {
			start: at('2027-01-15T10:00:00+02:00'),
			end: at('2027-01-15T14:00:00+02:00')
		};
		const a = computeAvailability(input({ busy: [booking] }));
		expect(iso(a.open)).toEqual([[helsinki(2027, 1, 15, 14, 30), helsinki(2027, 1, 15, 23)]]);
		// The busy band the calendar shows includes the turnaround.
		expect(iso(a.busy)).toEqual([[helsinki(2027, 1, 15, 10), helsinki(2027, 1, 15, 14, 30)]]);
	});

	it('keeps room for the new booking’s own turnaround before the next booking', () => {
		// The 30 min turnaround after each booking applies to the booking being made too:
		// before an 11:30 booking, a new one must end by 11:00, so the window is 09:00–11:00 (2 h, kept).
		const booking = {
			start: at('2027-01-15T11:30:00+02:00'),
			end: at('2027-01-15T14:00:00+02:00')
		};
		const a = computeAvailability(input({ busy: [booking] }));
		expect(iso(a.open)).toEqual([
			[helsinki(2027, 1, 15, 9), helsinki(2027, 1, 15, 11)],
			[helsinki(2027, 1, 15, 14, 30), helsinki(2027, 1, 15, 23)]
		]);
	});

	it('merges back-to-back bookings into one busy band and snaps off-grid ends to the grid', () => {
		const busy = [
			{ start: at('2027-01-15T10:00:00+02:00'), end: at('2027-01-15T12:00:00+02:00') },
			{ start: at('2027-01-15T12:00:00+02:00'), end: at('2027-01-15T13:10:00+02:00') } // an overrun hold, off-grid
		];
		const a = computeAvailability(input({ busy }));
		expect(iso(a.busy)).toEqual([[helsinki(2027, 1, 15, 10), helsinki(2027, 1, 15, 13, 40)]]);
		// 13:40 is rounded UP to the next 30-min line (policy.incrementMinutes, local wall clock).
		expect(iso(a.open)).toEqual([[helsinki(2027, 1, 15, 14), helsinki(2027, 1, 15, 23)]]);
	});

	it('a blackout day is closed, with its reason, and its neighbours stay open', () => {
		const a = computeAvailability(
			input({
				from: '2027-12-23',
				to: '2027-12-25',
				now: at('2027-12-01T12:00:00Z'),
				blackouts: [{ date: '2027-12-24', reason: 'Christmas Eve' }, { date: '2027-12-25' }, { date: '2028-01-01' }]
			})
		);
		// A day the owner blocks out sells nothing.
		expect(iso(a.open)).toEqual([[helsinki(2027, 12, 23, 9), helsinki(2027, 12, 23, 23)]]);
		expect(a.closed).toEqual([
			{ date: '2027-12-24', reason: 'Christmas Eve' },
			{ date: '2027-12-25', reason: 'Closed' }
		]);
	});

	it('minimum notice (24 h) clips today and part of tomorrow', () => {
		// The demo policy: minimum notice 24 h. now = 10:10 local, so nothing before tomorrow 10:10,
		// rounded up to the 10:30 grid line.
		const a = computeAvailability(input({ from: '2027-01-15', to: '2027-01-16', now: at('2027-01-15T10:10:00+02:00') }));
		expect(iso(a.open)).toEqual([[helsinki(2027, 1, 16, 10, 30), helsinki(2027, 1, 16, 23)]]);
	});

	it('the 180-day horizon clips the far end (same wall time 180 calendar days on, across the March change)', () => {
		// The demo policy: horizon 180 days. now = 2027-01-01 12:00+02:00; Temporal's add({ days: 180 })
		// gives 2027-06-30 12:00+03:00 (nominal days keep the wall time, Temporal proposal).
		const now = at('2027-01-01T12:00:00+02:00');
		const horizon = Temporal.Instant.fromEpochMilliseconds(now.getTime()).toZonedDateTimeISO(HELSINKI).add({ days: 180 });
		expect(horizon.toString()).toBe('2027-06-30T12:00:00+03:00[Europe/Helsinki]');
		const a = computeAvailability(input({ from: '2027-06-29', to: '2027-07-01', now }));
		expect(iso(a.open)).toEqual([
			[helsinki(2027, 6, 29, 9), helsinki(2027, 6, 29, 23)],
			[helsinki(2027, 6, 30, 9), new Date(horizon.epochMilliseconds).toISOString()]
		]);
	});

	it('asks for nothing beyond the horizon however wide the range', () => {
		const a = computeAvailability(input({ from: '2027-01-01', to: '2099-12-31', now: at('2027-01-01T12:00:00Z') }));
		// 180-day horizon: the first bookable day is 2027-01-02, the last 2027-06-30 (cut at 14:00 local).
		expect(a.open.length).toBe(180);
		expect(a.open.at(-1)?.end.toISOString()).toBe('2027-06-30T11:00:00.000Z');
	});
});

describe('computeAvailability — DST (Directive 2000/84/EC; IANA tz Europe/Helsinki)', () => {
	// An overnight studio: 20:00 to 06:00 the next morning (closeMinute 1800 = 30 h from midnight).
	const overnight = demoPolicy({ openingHours: everyDay(20 * 60, 30 * 60) });

	it('localDayBounds gives 23 h on 2027-03-28 and 25 h on 2027-10-31', () => {
		const spring = localDayBounds('2027-03-28', HELSINKI);
		const autumn = localDayBounds('2027-10-31', HELSINKI);
		// Directive 2000/84/EC art. 2 and 3: 03:00 -> 04:00 in March, 04:00 -> 03:00 in October.
		expect((spring.end.getTime() - spring.start.getTime()) / HOUR).toBe(23);
		expect((autumn.end.getTime() - autumn.start.getTime()) / HOUR).toBe(25);
	});

	it('a 20:00–06:00 opening lasts 9 h of real time across the spring change', () => {
		const a = computeAvailability(
			input({
				from: '2027-03-27',
				to: '2027-03-28',
				policy: overnight,
				now: at('2027-03-01T12:00:00Z')
			})
		);
		// 20:00+02:00 on the 27th to 06:00+03:00 on the 28th (TZDate): 10 h on the wall clock, 9 h real.
		const w = a.open.find((o) => o.start.toISOString() === helsinki(2027, 3, 27, 20));
		expect(w?.end.toISOString()).toBe(helsinki(2027, 3, 28, 6));
		expect(w?.end.toISOString()).toBe('2027-03-28T03:00:00.000Z');
		expect(w && (w.end.getTime() - w.start.getTime()) / HOUR).toBe(9);
	});

	it('a 20:00–06:00 opening lasts 11 h of real time across the autumn change', () => {
		const a = computeAvailability(
			input({
				from: '2027-10-30',
				to: '2027-10-31',
				policy: overnight,
				now: at('2027-10-01T12:00:00Z')
			})
		);
		// 20:00+03:00 on the 30th to 06:00+02:00 on the 31st (TZDate): 11 h real.
		const w = a.open.find((o) => o.start.toISOString() === helsinki(2027, 10, 30, 20));
		expect(w?.end.toISOString()).toBe('2027-10-31T04:00:00.000Z');
		expect(w && (w.end.getTime() - w.start.getTime()) / HOUR).toBe(11);
	});

	it('bills real elapsed time: a 10 h booking does not fit the 9 h spring night, an 11 h one fits the autumn night', () => {
		// Our rule (index.ts: a duration is real elapsed minutes): a night across a change bills real time.
		const spring = input({
			from: '2027-03-27',
			to: '2027-03-27',
			policy: overnight,
			now: at('2027-03-01T12:00:00Z')
		});
		expect(startsThatFit({ ...spring, durationMinutes: 600 })).toEqual([]);
		expect(startsThatFit({ ...spring, durationMinutes: 540 }).map((d) => d.toISOString())).toEqual([helsinki(2027, 3, 27, 20)]);
		const autumn = input({
			from: '2027-10-30',
			to: '2027-10-30',
			policy: overnight,
			now: at('2027-10-01T12:00:00Z')
		});
		expect(startsThatFit({ ...autumn, durationMinutes: 660 }).map((d) => d.toISOString())).toEqual([helsinki(2027, 10, 30, 20)]);
	});

	it('clips an overnight window to the requested days but lets a start on the last day run past midnight', () => {
		const one = input({
			from: '2027-03-27',
			to: '2027-03-27',
			policy: overnight,
			now: at('2027-03-01T12:00:00Z')
		});
		const a = computeAvailability(one);
		// Local day 2027-03-27 (localDayBounds): 00:00–06:00 from the night before, 20:00–24:00 of its own night.
		expect(iso(a.open)).toEqual([
			[helsinki(2027, 3, 27, 0), helsinki(2027, 3, 27, 6)],
			[helsinki(2027, 3, 27, 20), helsinki(2027, 3, 28, 0)]
		]);
		// 8 h bookings: none in the morning piece (it ends 06:00, and starts must fall on the
		// requested day, so the night before's 22:00 is not offered); from 20:00, 20:30 and 21:00
		// they end by 06:00+03:00 of the 9 h spring night.
		expect(startsThatFit({ ...one, durationMinutes: 480 }).map((d) => d.toISOString())).toEqual([
			helsinki(2027, 3, 27, 20),
			helsinki(2027, 3, 27, 20, 30),
			helsinki(2027, 3, 27, 21)
		]);
		// A 2 h booking also fits the morning piece, 00:00 to 04:00 starts.
		expect(startsThatFit({ ...one, durationMinutes: 120 })[0]?.toISOString()).toBe(helsinki(2027, 3, 27, 0));
	});

	it('the demo day on 2027-03-28 still opens 09:00+03:00 and the grid stays on local half hours', () => {
		const a = computeAvailability(input({ from: '2027-03-28', to: '2027-03-28', now: at('2027-03-01T12:00:00Z') }));
		expect(iso(a.open)).toEqual([['2027-03-28T06:00:00.000Z', '2027-03-28T20:00:00.000Z']]);
	});
});

describe('startsThatFit and nearestFreeStarts', () => {
	// One booking 13:00–15:00: free for a new 2 h booking 09:00–12:30 (its turnaround must end by
	// 13:00) and 15:30–23:00 (after the existing turnaround).
	const busy = [{ start: at('2027-01-15T13:00:00+02:00'), end: at('2027-01-15T15:00:00+02:00') }];
	const fit = { ...input({ busy }), durationMinutes: 120 };
	const local = (h: number, m = 0) => helsinki(2027, 1, 15, h, m);

	it('lists every 30-min grid start where a 2 h booking fits', () => {
		const starts = startsThatFit(fit).map((d) => d.toISOString());
		expect(starts).toEqual([
			local(9),
			local(9, 30),
			local(10),
			local(10, 30),
			local(15, 30),
			local(16),
			local(16, 30),
			local(17),
			local(17, 30),
			local(18),
			local(18, 30),
			local(19),
			local(19, 30),
			local(20),
			local(20, 30),
			local(21)
		]);
		// A 4 h half-day block (the demo rate card) only fits in the evening window.
		expect(startsThatFit({ ...fit, durationMinutes: 240 }).map((d) => d.toISOString())).toEqual([
			local(15, 30),
			local(16),
			local(16, 30),
			local(17),
			local(17, 30),
			local(18),
			local(18, 30),
			local(19)
		]);
	});

	it('offers the closest starts to a taken one, closest first, the earlier on a tie', () => {
		// Wanted 13:30 (taken): 15:30 is 2 h away, 16:00 2.5 h, then 10:30 and 16:30 both 3 h.
		const near = nearestFreeStarts(fit, at('2027-01-15T13:30:00+02:00'));
		expect(near.map((d) => d.toISOString())).toEqual([local(15, 30), local(16), local(10, 30)]);
		expect(nearestFreeStarts(fit, at('2027-01-15T12:00:00+02:00'), 1).map((d) => d.toISOString())).toEqual([local(10, 30)]);
		expect(nearestFreeStarts(fit, at('2027-01-15T12:00:00+02:00'), 0)).toEqual([]);
	});

	it('skips starts the caller cannot take (no engineer free), still closest first', () => {
		const engineerBusyAt16 = (d: Date) => d.toISOString() !== local(16);
		const near = nearestFreeStarts(fit, at('2027-01-15T13:30:00+02:00'), 3, engineerBusyAt16);
		expect(near.map((d) => d.toISOString())).toEqual([local(15, 30), local(10, 30), local(16, 30)]);
	});

	it('refuses a duration the policy cannot sell', () => {
		// The demo policy: minimum booking 2 h, increment 30 min.
		expect(() => startsThatFit({ ...fit, durationMinutes: 90 })).toThrow(AvailabilityInputError);
		expect(() => startsThatFit({ ...fit, durationMinutes: 135 })).toThrow(/increments/);
		expect(() => startsThatFit({ ...fit, durationMinutes: 0 })).toThrow(/positive integer/);
	});
});

describe('isWithinOpeningHours and isOnGrid', () => {
	const policy = demoPolicy();

	it('checks [start, end) against 09:00–23:00 local', () => {
		// The demo policy: open 09:00 to 23:00 every day; half-open, so ending at 23:00 is inside.
		expect(isWithinOpeningHours(at('2027-01-15T09:00:00+02:00'), at('2027-01-15T23:00:00+02:00'), policy)).toBe(true);
		expect(isWithinOpeningHours(at('2027-07-15T21:00:00+03:00'), at('2027-07-15T23:00:00+03:00'), policy)).toBe(true);
		expect(isWithinOpeningHours(at('2027-01-15T08:30:00+02:00'), at('2027-01-15T10:00:00+02:00'), policy)).toBe(false);
		expect(isWithinOpeningHours(at('2027-01-15T22:00:00+02:00'), at('2027-01-15T23:30:00+02:00'), policy)).toBe(false);
		// 09:00Z is 11:00 or 12:00 in Helsinki, never 09:00: the zone is the studio's, not UTC or the host's.
		expect(isWithinOpeningHours(at('2027-01-15T21:00:00Z'), at('2027-01-15T22:00:00Z'), policy)).toBe(false);
		expect(isWithinOpeningHours(at('2027-01-15T12:00:00+02:00'), at('2027-01-15T12:00:00+02:00'), policy)).toBe(false);
	});

	it('follows an overnight window past midnight', () => {
		const overnight = { timeZone: HELSINKI, openingHours: everyDay(20 * 60, 30 * 60) };
		expect(isWithinOpeningHours(at('2027-01-15T22:00:00+02:00'), at('2027-01-16T02:00:00+02:00'), overnight)).toBe(true);
		expect(isWithinOpeningHours(at('2027-01-16T05:00:00+02:00'), at('2027-01-16T07:00:00+02:00'), overnight)).toBe(false);
	});

	it('puts the grid on local half hours', () => {
		// policy.incrementMinutes = 30 from local midnight.
		expect(isOnGrid(at('2027-01-15T09:30:00+02:00'), policy)).toBe(true);
		expect(isOnGrid(at('2027-01-15T09:15:00+02:00'), policy)).toBe(false);
		expect(isOnGrid(at('2027-01-15T09:30:01+02:00'), policy)).toBe(false);
		// Kolkata (+05:30, IANA tz) with whole-hour increments: 10:00 IST is 04:30Z.
		const kolkata = { timeZone: 'Asia/Kolkata', incrementMinutes: 60 };
		expect(isOnGrid(at('2027-01-15T04:30:00Z'), kolkata)).toBe(true);
		expect(isOnGrid(at('2027-01-15T04:00:00Z'), kolkata)).toBe(false);
	});
});

describe('input checks', () => {
	it('throws typed errors on malformed input', () => {
		expect(() => computeAvailability(input({ from: '2027-01-16', to: '2027-01-15' }))).toThrow(AvailabilityInputError);
		expect(() => computeAvailability(input({ from: '15.01.2027' }))).toThrow(/YYYY-MM-DD/);
		expect(() => computeAvailability(input({ policy: demoPolicy({ timeZone: 'Nowhere/Else' }) }))).toThrow(/IANA/);
		expect(() => computeAvailability(input({ policy: demoPolicy({ incrementMinutes: 0 }) }))).toThrow(/incrementMinutes/);
		expect(() =>
			computeAvailability(input({ busy: [{ start: at('2027-01-15T12:00:00Z'), end: at('2027-01-15T11:00:00Z') }] }))
		).toThrow(/busy/);
		expect(() => computeAvailability(input({ blackouts: [{ date: '2027-13-01' }] }))).toThrow(/blackout/);
	});
});

describe('input checks, one rule at a time', () => {
	/** The error thrown by `run`, for its code and message. */
	function refusal(run: () => unknown): AvailabilityInputError {
		try {
			run();
		} catch (e) {
			if (e instanceof AvailabilityInputError) return e;
			throw new Error(`expected an AvailabilityInputError, got ${String(e)}`);
		}
		throw new Error('expected an AvailabilityInputError, nothing was thrown');
	}
	const withPolicy = (over: Record<string, unknown>) => () =>
		computeAvailability(input({ policy: { ...demoPolicy(), ...over } }));
	const withHours = (hours: unknown[]) => withPolicy({ openingHours: hours });

	it('names the policy field that is wrong', () => {
		const cases: [Record<string, unknown>, RegExp][] = [
			[{ timeZone: 'Nowhere/Else' }, /^policy\.timeZone is not a known IANA zone: "Nowhere\/Else"$/],
			[{ incrementMinutes: 1441 }, /^policy\.incrementMinutes must be an integer 1\.\.1440$/],
			[{ incrementMinutes: 7.5 }, /^policy\.incrementMinutes/],
			[{ incrementMinutes: '30' }, /^policy\.incrementMinutes/],
			[{ minBookingMinutes: -30 }, /^policy\.minBookingMinutes must be a non-negative integer$/],
			[{ turnaroundMinutes: -1 }, /^policy\.turnaroundMinutes must be a non-negative integer$/],
			[{ minNoticeMinutes: 0.5 }, /^policy\.minNoticeMinutes must be a non-negative integer$/],
			[{ horizonDays: 3661 }, /^policy\.horizonDays must be an integer 0\.\.3660$/],
			[{ openingHours: null }, /^policy\.openingHours must be an array$/]
		];
		for (const [over, message] of cases) {
			const e = refusal(withPolicy(over));
			expect(e.code, JSON.stringify(over)).toBe('invalid-policy');
			expect(e.message, JSON.stringify(over)).toMatch(message);
		}
		// The largest values allowed are accepted: a one-day grid, ten years ahead.
		expect(() => withPolicy({ incrementMinutes: 1440, minBookingMinutes: 1440 })()).not.toThrow();
		expect(() => withPolicy({ horizonDays: 3660 })()).not.toThrow();
	});

	it('checks each opening: ISO weekday 1..7, opening 00:00..23:59, at most a whole day long', () => {
		const day = (weekday: number, openMinute: number, closeMinute: number) => ({ weekday, openMinute, closeMinute });
		const cases: [unknown, RegExp][] = [
			[day(0, 540, 1380), /^opening hours weekday must be ISO 1\.\.7, got 0$/],
			[day(8, 540, 1380), /^opening hours weekday must be ISO 1\.\.7, got 8$/],
			[day(1, 1440, 1500), /^openMinute must be 0\.\.1439, got 1440$/],
			[day(1, -30, 600), /^openMinute must be 0\.\.1439, got -30$/],
			[day(1, 540, 480), /^closeMinute must be openMinute\.\.openMinute\+1440, got 480$/],
			[day(1, 540, 540 + 1441), /^closeMinute must be openMinute\.\.openMinute\+1440, got 1981$/]
		];
		for (const [hours, message] of cases) {
			const e = refusal(withHours([day(2, 540, 1380), hours]));
			expect(e.code).toBe('invalid-policy');
			expect(e.message).toMatch(message);
		}
		// The edges are allowed: Sunday (7), a 23:59 opening, a whole day from 23:59.
		expect(() => withHours([day(7, 1439, 1439 + 1440), day(1, 0, 0)])()).not.toThrow();
	});

	it('refuses a malformed range, now, busy list or blackout with its own code', () => {
		const cases: [Partial<AvailabilityInput>, string, RegExp][] = [
			[{ to: '16.01.2027' }, 'invalid-range', /^from and to must be YYYY-MM-DD dates, got 2027-01-15\.\.16\.01\.2027$/],
			[{ from: '2027-01-16', to: '2027-01-15' }, 'invalid-range', /^to \(2027-01-15\) is before from \(2027-01-16\)$/],
			[{ now: new Date(Number.NaN) }, 'invalid-now', /^now must be a valid Date$/],
			[{ now: Date.parse('2027-01-10T12:00:00Z') as unknown as Date }, 'invalid-now', /^now must be a valid Date$/],
			[{ busy: null as unknown as [] }, 'invalid-busy', /^busy must be an array$/],
			[
				{ busy: [{ start: at('2027-01-15T12:00:00Z'), end: new Date(Number.NaN) }] },
				'invalid-busy',
				/^each busy interval needs valid start <= end Dates$/
			],
			[
				{ busy: [{ start: new Date(Number.NaN), end: at('2027-01-15T12:00:00Z') }] },
				'invalid-busy',
				/^each busy interval needs valid start <= end Dates$/
			],
			[{ blackouts: null as unknown as [] }, 'invalid-blackout', /^blackouts must be an array$/],
			[{ blackouts: [{ date: '2027-13-01' }] }, 'invalid-blackout', /^blackout date must be YYYY-MM-DD, got "2027-13-01"$/]
		];
		for (const [over, code, message] of cases) {
			const e = refusal(() => computeAvailability(input(over)));
			expect(e.code, JSON.stringify(over)).toBe(code);
			expect(e.message, JSON.stringify(over)).toMatch(message);
		}
	});

	it('explains a duration or a nearest-starts request it refuses', () => {
		const fit = { ...input(), durationMinutes: 120 };
		const part = refusal(() => startsThatFit({ ...fit, durationMinutes: 1.5 }));
		expect([part.code, part.message]).toEqual(['invalid-duration', 'durationMinutes must be a positive integer']);
		// The demo policy: minimum booking 2 h, increment 30 min.
		const short = refusal(() => startsThatFit({ ...fit, durationMinutes: 90 }));
		expect([short.code, short.message]).toEqual([
			'invalid-duration',
			'a booking lasts at least 120 minutes (policy.minBookingMinutes)'
		]);
		const odd = refusal(() => startsThatFit({ ...fit, durationMinutes: 135 }));
		expect([odd.code, odd.message]).toEqual(['invalid-duration', 'a booking lasts a whole number of 30-minute increments']);
		const when = refusal(() => nearestFreeStarts(fit, new Date(Number.NaN)));
		expect([when.code, when.message]).toEqual(['invalid-now', 'desiredStart must be a valid Date']);
		for (const count of [-1, 1.5]) {
			const e = refusal(() => nearestFreeStarts(fit, at('2027-01-15T12:00:00Z'), count));
			expect([e.code, e.message]).toEqual(['invalid-count', 'count must be a non-negative integer']);
		}
	});

	it('answers false, without throwing, for an invalid instant', () => {
		const policy = demoPolicy();
		const noon = at('2027-01-15T12:00:00+02:00');
		expect(isWithinOpeningHours(new Date(Number.NaN), noon, policy)).toBe(false);
		expect(isWithinOpeningHours(at('2027-01-15T10:00:00+02:00'), new Date(Number.NaN), policy)).toBe(false);
		expect(isOnGrid(new Date(Number.NaN), policy)).toBe(false);
	});
});

describe('computeAvailability — edges of the rules', () => {
	const local = (d: number, h: number, min = 0) => helsinki(2027, 1, d, h, min);

	it('lets a zero-length busy interval block nothing, not even a turnaround', () => {
		const noon = at('2027-01-15T12:00:00+02:00');
		const a = computeAvailability(input({ busy: [{ start: noon, end: noon }] }));
		expect(iso(a.open)).toEqual([[local(15, 9), local(15, 23)]]);
		expect(a.busy).toEqual([]);
	});

	it('drops the whole overnight opening of a closed day, also its hours after midnight', () => {
		// Open 20:00–06:00; the 15th is closed, so its night (20:00 on the 15th to 06:00 on the
		// 16th) does not happen, and the 16th opens only at its own 20:00.
		const a = computeAvailability(
			input({
				from: '2027-01-16',
				to: '2027-01-16',
				policy: demoPolicy({ openingHours: everyDay(20 * 60, 30 * 60) }),
				blackouts: [{ date: '2027-01-15' }]
			})
		);
		expect(iso(a.open)).toEqual([[local(16, 20), local(17, 0)]]);
		expect(a.closed).toEqual([]);
	});

	it('lists the closed days of the range in date order, the first day included, reasons trimmed and joined once', () => {
		const a = computeAvailability(
			input({
				from: '2027-12-24',
				to: '2027-12-26',
				now: at('2027-12-01T12:00:00Z'),
				blackouts: [
					{ date: '2027-12-26', reason: '  Boxing Day ' },
					{ date: '2027-12-24', reason: 'Christmas Eve' },
					{ date: '2027-12-23', reason: 'Before the range' },
					{ date: '2027-12-24', reason: 'Christmas Eve' },
					{ date: '2027-12-24', reason: 'Staff party' },
					{ date: '2027-12-25', reason: '   ' },
					{ date: '2027-12-27', reason: 'After the range' }
				]
			})
		);
		expect(a.closed).toEqual([
			{ date: '2027-12-24', reason: 'Christmas Eve; Staff party' },
			{ date: '2027-12-25', reason: 'Closed' },
			{ date: '2027-12-26', reason: 'Boxing Day' }
		]);
		expect(a.open).toEqual([]);
	});
});

describe('startsThatFit — a studio open round the clock', () => {
	// Open 00:00–24:00 every day: the days join into one window (header comment, step 1), so a
	// booking that starts late on the last requested day runs on into the next morning.
	const allDay = { ...input({ policy: demoPolicy({ openingHours: everyDay(0, 1440) }) }), durationMinutes: 240 };

	it('offers every half hour of the day, the last ones running past midnight, and none on the next day', () => {
		const starts = startsThatFit(allDay).map((d) => d.toISOString());
		// 48 half-hour starts from 00:00 to 23:30 on 15 January (EET, +02:00).
		expect(starts.length).toBe(48);
		expect(starts[0]).toBe(helsinki(2027, 1, 15, 0));
		expect(starts.slice(-2)).toEqual([helsinki(2027, 1, 15, 23), helsinki(2027, 1, 15, 23, 30)]);
	});

	it('lets a start on the last day run a whole day and more into the next', () => {
		const starts = startsThatFit({ ...allDay, durationMinutes: 1800 }).map((d) => d.toISOString());
		expect(starts.length).toBe(48);
		expect(starts.at(-1)).toBe(helsinki(2027, 1, 15, 23, 30));
	});
});

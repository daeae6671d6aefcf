/**
 * Fixtures of the availability unit specs (`$fixtures/availability`), never imported by app code.
 * The policy is the invented demo studio's, written out: Europe/Helsinki, open 09:00–23:00 every
 * day, minimum booking 2 h, increment 30 min, turnaround 30 min after each booking, minimum notice
 * 24 h, horizon 180 days, hold 30 min.
 */
import type { OpeningHours, StudioPolicy } from '../../src/lib/domain/types';

export const HELSINKI = 'Europe/Helsinki';

export function everyDay(openMinute: number, closeMinute: number): OpeningHours[] {
	return [1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, openMinute, closeMinute }));
}

export function demoPolicy(overrides: Partial<StudioPolicy> = {}): StudioPolicy {
	return {
		timeZone: HELSINKI,
		currency: 'EUR',
		country: 'FI',
		vatRateBp: 2550,
		pricesIncludeVat: true,
		blocks: { halfDayMinutes: 240, fullDayMinutes: 480 },
		minBookingMinutes: 120,
		incrementMinutes: 30,
		turnaroundMinutes: 30,
		minNoticeMinutes: 24 * 60,
		horizonDays: 180,
		holdMinutes: 30,
		openingHours: everyDay(9 * 60, 23 * 60),
		surcharges: [],
		depositBp: 3000,
		depositMinimum: 5000,
		cancellation: [
			{ minNoticeHours: 168, refundBp: 10000 },
			{ minNoticeHours: 48, refundBp: 5000 },
			{ minNoticeHours: 0, refundBp: 0 }
		],
		overtimeIncrementMinutes: 15,
		engineerRates: { hourly: 3500, halfDay: 12000, fullDay: 23000 },
		...overrides
	};
}

/** ISO strings of intervals, for readable equality checks. */
export function iso(intervals: readonly { start: Date; end: Date }[]): [string, string][] {
	return intervals.map((i) => [i.start.toISOString(), i.end.toISOString()]);
}

export const at = (s: string): Date => new Date(s);

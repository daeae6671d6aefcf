/**
 * Fixtures of the availability unit specs (`$fixtures/availability`), never imported by app code.
 * The policy is the invented demo studio's (src/lib/domain/demo.ts) without its surcharges, which
 * availability does not read: Europe/Helsinki, open 09:00–23:00 every day, minimum booking 2 h,
 * increment 30 min, turnaround 30 min after each booking, minimum notice 24 h, horizon 180 days,
 * hold 30 min.
 */
import { DEMO_POLICY } from '../../src/lib/domain/demo';
import type { OpeningHours, StudioPolicy } from '../../src/lib/domain/types';

export const HELSINKI = 'Europe/Helsinki';

export function everyDay(openMinute: number, closeMinute: number): OpeningHours[] {
	return [1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, openMinute, closeMinute }));
}

export function demoPolicy(overrides: Partial<StudioPolicy> = {}): StudioPolicy {
	return { ...structuredClone(DEMO_POLICY), surcharges: [], ...overrides };
}

/** ISO strings of intervals, for readable equality checks. */
export function iso(intervals: readonly { start: Date; end: Date }[]): [string, string][] {
	return intervals.map((i) => [i.start.toISOString(), i.end.toISOString()]);
}

export const at = (s: string): Date => new Date(s);

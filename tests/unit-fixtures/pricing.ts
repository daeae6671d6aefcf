/**
 * Fixtures of the pricing and invoice unit specs (`$fixtures/pricing`), never imported by app code.
 * The demo studio's values come from src/lib/domain/demo.ts, the same invented studio the seed uses.
 */
import { expect } from 'vitest';
import { DEMO_POLICY, demoPolicy, demoRoom } from '../../src/lib/domain/demo';
import type { StudioPolicy } from '../../src/lib/domain/types';
import { en16931Violations, type ChargeTotals, type PriceLine } from '../../src/lib/domain/pricing';
import { localToInstant } from '../../src/lib/domain/time';

export const HELSINKI = DEMO_POLICY.timeZone;
export const LIVE_ROOM = demoRoom('live-room');
export const VOCAL_BOOTH = demoRoom('vocal-booth');
export const CONTROL_ROOM = demoRoom('control-room');

/** The instant of a Helsinki wall time: at('2027-03-02', '16:00'). '24:00' is the next midnight. */
export function at(ymd: string, hm: string, timeZone = HELSINKI): Date {
	const [h = 0, m = 0] = hm.split(':').map(Number);
	const resolved = localToInstant(ymd, h * 60 + m, timeZone);
	if (resolved.kind === 'gap') throw new Error(`${ymd} ${hm} does not exist in ${timeZone}`);
	return resolved.instant;
}

/** The demo policy with changes. */
export function policyWith(overrides: Partial<StudioPolicy> = {}): StudioPolicy {
	return { ...demoPolicy(), ...overrides };
}

/** The demo policy open round the clock (for night sessions across DST changes). */
export function openAllHours(overrides: Partial<StudioPolicy> = {}): StudioPolicy {
	return policyWith({
		openingHours: [1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, openMinute: 0, closeMinute: 1440 })),
		...overrides
	});
}

/** A line by key, failing the test when it is missing. */
export function line(totals: ChargeTotals, key: string): PriceLine {
	const found = totals.lines.find((l) => l.key === key);
	expect(found, `line ${key} in ${totals.lines.map((l) => l.key).join(', ')}`).toBeDefined();
	return found as PriceLine;
}

/** EN 16931 BR-CO-10, -13, -14, -15, -16, -17, BR-DEC, BR-27 and the advertised gross. */
export function expectEn16931(totals: ChargeTotals): void {
	expect(en16931Violations(totals)).toEqual([]);
}

/** No holidays at all (to isolate other rules). */
export const noHolidays = (): boolean => false;

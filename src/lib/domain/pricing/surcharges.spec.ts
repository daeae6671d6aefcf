import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { TZDate } from '@date-fns/tz';
import { DEMO_POLICY } from '../demo';
import { isPublicHoliday } from '../holidays';
import type { SurchargeRule } from '../types';
import { surchargeAmount, surchargeShares } from './surcharges';
import { at, HELSINKI } from './spec-fixtures';

const fiHoliday = (ymd: string) => isPublicHoliday('FI', ymd);

/**
 * Reference: walk every real minute with TZDate (@date-fns/tz), independently of zonedTime.ts,
 * and take the highest rule whose window holds the local wall time.
 */
function referenceShares(start: Date, end: Date, rules: SurchargeRule[], isHoliday: (ymd: string) => boolean) {
	const won = new Map<string, number>();
	for (let t = start.getTime(); t < end.getTime(); t += 60_000) {
		const local = new TZDate(t, HELSINKI);
		const ymd = `${local.getFullYear()}-${String(local.getMonth() + 1).padStart(2, '0')}-${String(local.getDate()).padStart(2, '0')}`;
		const weekday = local.getDay() === 0 ? 7 : local.getDay();
		const minute = local.getHours() * 60 + local.getMinutes();
		let best: SurchargeRule | undefined;
		for (const rule of rules) {
			const applies =
				rule.kind === 'holiday'
					? isHoliday(ymd)
					: rule.weekdays.includes(weekday) && minute >= rule.fromMinute && minute < rule.toMinute;
			if (applies && rule.percentBp > 0 && (!best || rule.percentBp > best.percentBp)) best = rule;
		}
		if (best) won.set(best.id, (won.get(best.id) ?? 0) + 1);
	}
	return rules.flatMap((r) => (won.has(r.id) ? [[r.id, won.get(r.id)]] : []));
}

describe('surcharge minutes (source: PRODUCT.md: highest surcharge per minute, in local wall time)', () => {
	it('Tuesday 16:00–20:00 has 120 evening minutes', () => {
		const shares = surchargeShares(at('2027-03-02', '16:00'), at('2027-03-02', '20:00'), DEMO_POLICY, fiHoliday);
		expect(shares.map((s) => [s.rule.id, s.minutes])).toEqual([['evening', 120]]);
		// 160.00 × 25 % × 120/240 = 20.00
		const [evening] = shares;
		expect(evening && surchargeAmount(16000, evening, 240)).toBe(2000);
	});

	it('Friday 22:00 → Saturday 02:00 (round the clock): 1 h evening, 1 h plain, 2 h weekend', () => {
		// Fri 22:00–23:00 evening (60), 23:00–24:00 none, Sat 00:00–02:00 weekend (120).
		const shares = surchargeShares(at('2027-03-05', '22:00'), at('2027-03-06', '02:00'), DEMO_POLICY, fiHoliday);
		expect(shares.map((s) => [s.rule.id, s.minutes])).toEqual([
			['evening', 60],
			['weekend', 120]
		]);
	});

	it('matches a minute-by-minute TZDate reference across DST changes and holidays (property)', () => {
		const anchors = fc.constantFrom(
			'2027-03-27T18:00:00Z', // into the 23-hour Easter Sunday
			'2027-10-30T18:00:00Z', // into the 25-hour Sunday
			'2027-12-05T12:00:00Z', // Sunday into Independence Day
			'2027-03-01T06:00:00Z' // an ordinary week
		);
		const extraRule = fc
			.record({
				id: fc.constant('extra'),
				label: fc.constant('Extra'),
				kind: fc.constant('window' as const),
				percentBp: fc.integer({ min: 0, max: 6000 }),
				weekdays: fc.subarray([1, 2, 3, 4, 5, 6, 7]),
				fromMinute: fc.integer({ min: 0, max: 1380 }),
				toMinute: fc.integer({ min: 0, max: 1440 })
			})
			.filter((r) => r.fromMinute < r.toMinute);
		fc.assert(
			fc.property(
				anchors,
				fc.integer({ min: 0, max: 24 * 60 }),
				fc.integer({ min: 1, max: 30 * 60 }),
				extraRule,
				(anchor, offset, length, extra) => {
					const start = new Date(new Date(anchor).getTime() + offset * 60_000);
					const end = new Date(start.getTime() + length * 60_000);
					const rules = [...DEMO_POLICY.surcharges, extra];
					const shares = surchargeShares(start, end, { timeZone: HELSINKI, surcharges: rules }, fiHoliday);
					expect(shares.map((s) => [s.rule.id, s.minutes])).toEqual(referenceShares(start, end, rules, fiHoliday));
					expect(shares.reduce((n, s) => n + s.minutes, 0)).toBeLessThanOrEqual(length);
				}
			),
			{ numRuns: 60 }
		);
	});
});

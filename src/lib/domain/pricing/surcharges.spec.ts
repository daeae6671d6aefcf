import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { TZDate } from '@date-fns/tz';
import { DEMO_POLICY } from '../demo';
import { isPublicHoliday } from '../holidays';
import type { SurchargeRule } from '../types';
import { surchargeAmount, surchargeShares, surchargeSplit, surchargeWeight, type SurchargeShare } from './surcharges';
import { at, HELSINKI, noHolidays } from '$fixtures/pricing';

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
			// A window running past midnight belongs to the weekday it starts on.
			const previous = weekday === 1 ? 7 : weekday - 1;
			const applies =
				rule.kind === 'holiday'
					? isHoliday(ymd)
					: rule.fromMinute <= rule.toMinute
						? rule.weekdays.includes(weekday) && minute >= rule.fromMinute && minute < rule.toMinute
						: (rule.weekdays.includes(weekday) && minute >= rule.fromMinute) ||
							(rule.weekdays.includes(previous) && minute < rule.toMinute);
			if (applies && rule.percentBp > 0 && (!best || rule.percentBp > best.percentBp)) best = rule;
		}
		if (best) won.set(best.id, (won.get(best.id) ?? 0) + 1);
	}
	return rules.flatMap((r) => (won.has(r.id) ? [[r.id, won.get(r.id)]] : []));
}

describe('surcharge minutes (our rule: highest surcharge per minute, in local wall time)', () => {
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

	it('a window past midnight belongs to the day it starts: Friday 22:00–02:00 covers early Saturday, not early Monday', () => {
		const late: SurchargeRule = {
			id: 'late',
			label: 'Late night',
			kind: 'window',
			percentBp: 4000,
			weekdays: [1, 2, 3, 4, 5],
			fromMinute: 22 * 60,
			toMinute: 2 * 60
		};
		const policy = { timeZone: HELSINKI, surcharges: [late] };
		// 2027-03-05 is a Friday: 23:00 Friday → 01:00 Saturday is all late night.
		const friday = surchargeShares(at('2027-03-05', '23:00'), at('2027-03-06', '01:00'), policy, () => false);
		expect(friday.map((s) => [s.rule.id, s.minutes])).toEqual([['late', 120]]);
		// 00:00–02:00 on Monday 2027-03-08 follows Sunday night, which is not listed.
		expect(surchargeShares(at('2027-03-08', '00:00'), at('2027-03-08', '02:00'), policy, () => false)).toEqual([]);
		// 00:00–02:00 on Tuesday follows Monday night: covered.
		const tuesday = surchargeShares(at('2027-03-09', '00:00'), at('2027-03-09', '03:00'), policy, () => false);
		expect(tuesday.map((s) => [s.rule.id, s.minutes])).toEqual([['late', 120]]);
	});

	it('on equal percentages the rule listed first wins each minute, whichever it is', () => {
		// Tuesday 2027-03-02 16:00–20:00: two windows of 25 % both hold 18:00–20:00.
		const window = (id: string, fromMinute: number, toMinute: number): SurchargeRule => ({
			id,
			label: id,
			kind: 'window',
			percentBp: 2500,
			weekdays: [2],
			fromMinute,
			toMinute
		});
		const early = window('early', 16 * 60, 20 * 60);
		const late = window('late', 18 * 60, 22 * 60);
		const minutes = (surcharges: SurchargeRule[]) =>
			surchargeShares(at('2027-03-02', '16:00'), at('2027-03-02', '20:00'), { timeZone: HELSINKI, surcharges }, noHolidays).map(
				(s) => [s.rule.id, s.minutes]
			);
		expect(minutes([early, late])).toEqual([['early', 240]]);
		expect(minutes([late, early])).toEqual([
			['late', 120],
			['early', 120]
		]);
		// A holiday rule at the same percent as a window: the one listed first takes the shared minutes.
		const holiday: SurchargeRule = { ...window('holiday', 0, 0), kind: 'holiday', weekdays: [] };
		const onHoliday = (surcharges: SurchargeRule[]) =>
			surchargeShares(at('2027-12-06', '16:00'), at('2027-12-06', '20:00'), { timeZone: HELSINKI, surcharges }, fiHoliday).map(
				(s) => [s.rule.id, s.minutes]
			);
		const monday = { ...early, weekdays: [1] };
		expect(onHoliday([holiday, monday])).toEqual([['holiday', 240]]);
		expect(onHoliday([monday, holiday])).toEqual([['early', 240]]);
		// A higher percent still wins wherever it holds, listed first or last.
		const higher = { ...late, percentBp: 2501 };
		expect(minutes([early, higher])).toEqual([
			['early', 120],
			['late', 120]
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

describe("a resource's surcharge: price × Σ(% per minute) ÷ capacity, rounded once, split by rule (our rule)", () => {
	const rule = (id: string, percentBp: number): SurchargeRule => ({
		id,
		label: id,
		kind: 'window',
		percentBp,
		weekdays: [],
		fromMinute: 0,
		toMinute: 0
	});
	const share = (id: string, percentBp: number, minutes: number): SurchargeShare => ({ rule: rule(id, percentBp), minutes });

	it('weighs each minute by its percent: 120 min at 25 % = 300 000 basis-point minutes', () => {
		expect(surchargeWeight([share('evening', 2500, 120)])).toBe(300_000);
		expect(surchargeWeight([share('weekend', 2000, 240), share('holiday', 5000, 120)])).toBe(1_080_000);
		expect(surchargeWeight([])).toBe(0);
	});

	it('charges unbooked block time nothing: 7 h 30 in a full day, 4 h 30 at 25 % → 300.00 × 25 % × 270/480 = 42.19', () => {
		expect(surchargeSplit(30000, [share('evening', 2500, 270)], 480)).toEqual([4219]);
	});

	it('splits by largest remainder: 250.00 over 360 min, weekend 240 min at 20 %, holiday 120 min at 50 %', () => {
		// 33.333… + 41.666… = 75.00 exactly → 33.33 + 41.67 (the spare cent to the larger remainder).
		const shares = [share('weekend', 2000, 240), share('holiday', 5000, 120)];
		expect(surchargeSplit(25000, shares, 360)).toEqual([3333, 4167]);
		expect(shares.map((s) => surchargeAmount(25000, s, 360))).toEqual([3333, 4167]);
	});

	it('rounds once per resource: three rules of exactly half a cent each come to round(1.5) = 2, not 3', () => {
		// price 1.00 over 100 min; each rule 1 min at 50 %: 100 × 50 % × 1/100 = 0.5 cent each.
		const shares = [share('a', 5000, 1), share('b', 5000, 1), share('c', 5000, 1)];
		expect(shares.map((s) => surchargeAmount(100, s, 100))).toEqual([1, 1, 1]); // each on its own
		expect(surchargeSplit(100, shares, 100)).toEqual([1, 1, 0]); // equal remainders: listed first wins
	});

	it('the lines always add up to the once-rounded total, each within a cent of its exact share (property)', () => {
		fc.assert(
			fc.property(
				fc.integer({ min: 0, max: 1_000_000 }),
				fc.integer({ min: 1, max: 3000 }),
				fc.array(fc.tuple(fc.integer({ min: 1, max: 20_000 }), fc.integer({ min: 1, max: 1000 })), { maxLength: 5 }),
				(price, capacity, raw) => {
					const shares = raw.map(([bp, minutes], i) => share(`r${i}`, bp, minutes));
					const split = surchargeSplit(price, shares, capacity);
					const d = BigInt(capacity) * 10_000n;
					const exact = shares.map((s) => BigInt(price) * BigInt(s.rule.percentBp) * BigInt(s.minutes));
					const sum = exact.reduce((a, b) => a + b, 0n);
					expect(BigInt(split.reduce((a, b) => a + b, 0))).toBe((2n * sum + d) / (2n * d));
					split.forEach((amount, i) => {
						const floor = (exact[i] ?? 0n) / d;
						expect([floor, floor + 1n]).toContain(BigInt(amount));
					});
				}
			),
			{ numRuns: 300 }
		);
	});
});

describe('the edges of a surcharge window (calendar: 2027-03-05 is a Friday, 2027-03-08 a Monday)', () => {
	const rule = (over: Partial<SurchargeRule>): SurchargeRule => ({
		id: 'r',
		label: 'Late surcharge',
		kind: 'window',
		percentBp: 3000,
		weekdays: [5],
		fromMinute: 22 * 60,
		toMinute: 2 * 60,
		...over
	});
	const minutesOf = (start: Date, end: Date, rules: SurchargeRule[], isHoliday: (ymd: string) => boolean = noHolidays) =>
		surchargeShares(start, end, { timeZone: HELSINKI, surcharges: rules }, isHoliday).map((s) => [s.rule.id, s.minutes]);

	it('starts a window past midnight at its first minute, on the weekday it is listed for', () => {
		// Friday 22:00–02:00: 22:00–22:30 is 30 minutes of it.
		expect(minutesOf(at('2027-03-05', '22:00'), at('2027-03-05', '22:30'), [rule({})])).toEqual([['r', 30]]);
	});

	it('carries a Sunday window past midnight into the early hours of Monday', () => {
		const sunday = rule({ weekdays: [7] });
		expect(minutesOf(at('2027-03-08', '00:00'), at('2027-03-08', '01:00'), [sunday])).toEqual([['r', 60]]);
		// …while a window listed for Monday starts at Monday 22:00: Monday's early hours are not in it.
		expect(minutesOf(at('2027-03-08', '00:00'), at('2027-03-08', '01:00'), [rule({ weekdays: [1] })])).toEqual([]);
	});

	it('covers no minute with a window that ends where it starts', () => {
		expect(
			minutesOf(at('2027-03-05', '00:00'), at('2027-03-06', '00:00'), [rule({ fromMinute: 18 * 60, toMinute: 18 * 60 })])
		).toEqual([]);
	});

	it('ignores rules of 0 % or less (a discount is no surcharge)', () => {
		const start = at('2027-03-05', '22:00');
		const end = at('2027-03-05', '23:00');
		expect(minutesOf(start, end, [rule({ id: 'zero', percentBp: 0 })])).toEqual([]);
		expect(minutesOf(start, end, [rule({ id: 'discount', percentBp: -1000 }), rule({ id: 'late', percentBp: 1000 })])).toEqual([
			['late', 60]
		]);
	});

	it('asks whether a day is a holiday only when the policy has a holiday rule', () => {
		const asked: string[] = [];
		const spy = (ymd: string) => {
			asked.push(ymd);
			return true;
		};
		expect(minutesOf(at('2027-03-05', '22:00'), at('2027-03-05', '23:00'), [rule({})], spy)).toEqual([['r', 60]]);
		expect(asked).toEqual([]);
		const holiday = rule({ id: 'h', kind: 'holiday', percentBp: 5000 });
		expect(minutesOf(at('2027-03-05', '22:00'), at('2027-03-05', '23:00'), [rule({}), holiday], spy)).toEqual([['h', 60]]);
		expect(asked).toEqual(['2027-03-05']);
	});

	it('charges nothing against a capacity of zero minutes, and splits nothing into nothing', () => {
		const share: SurchargeShare = { rule: rule({}), minutes: 60 };
		expect(surchargeAmount(16_000, share, 0)).toBe(0);
		expect(surchargeSplit(16_000, [share], 0)).toEqual([0]);
		expect(surchargeSplit(16_000, [], 240)).toEqual([]);
	});
});

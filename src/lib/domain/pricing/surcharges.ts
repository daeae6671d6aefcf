/**
 * Surcharges by minute (our rule: a surcharge is paid pro rata for the minutes that fall in its
 * evening, weekend or holiday window, and a minute in several windows pays only the highest;
 * evening, weekend and holiday premiums are common practice).
 *
 * Every real minute of a booking carries the HIGHEST surcharge whose window contains it, read in
 * the studio's local wall time: a 'window' rule by ISO weekday and local minute of the day, a
 * 'holiday' rule on every minute of a local date that is a public holiday. Overlapping rules never
 * add up; on equal percentages the rule listed first in the policy wins. Rules of 0 % or less are
 * ignored (a discount would be an allowance, not a surcharge).
 *
 * What a surcharged minute pays — common practice / our rule (no outside source): a resource's
 * cover C buys capacity(C) minutes of block time for price(C), i.e. rate(C) = price(C) ÷
 * capacity(C) per minute, and each surcharged booked minute pays its percent of that share:
 *
 *   surcharge(C) = price(C) × Σ over booked minutes of (that minute's percent) ÷ capacity(C)
 *
 * Tuesday 16:00–20:00 in the live room: half day 160.00 buys 240 min; 120 evening minutes at 25 %
 * → 160.00 × 25 % × 120/240 = 20.00. Unbooked block time (a full day bought for 7 h 30) carries
 * no surcharge. The per-rule lines (evening, weekend, holiday) are that one amount split by rule:
 * the resource's total is rounded half-up ONCE and shared out by largest remainder (surchargeSplit),
 * so each line is its exact share rounded down or up and the lines add up to the rounded total.
 */
import { mulDivRoundHalfUp } from '../money';
import type { Minor, StudioPolicy, SurchargeRule } from '../types';
import { localSegments } from '../time';

export interface SurchargeShare {
	rule: SurchargeRule;
	/** Real minutes of the booking this rule won (highest per minute). */
	minutes: number;
}

/**
 * Whether a window rule covers a local minute of a local date. A window with from > to starts on
 * its listed weekdays and runs past midnight into the next day, the way a studio reads "Friday
 * 22:00 to 02:00": the early hours of Saturday belong to Friday's window, and the early hours of a
 * Monday belong to nothing unless Sunday is listed.
 */
function windowCovers(rule: SurchargeRule, isoWeekday: number, minuteOfDay: number): boolean {
	if (rule.fromMinute <= rule.toMinute) {
		return rule.weekdays.includes(isoWeekday) && minuteOfDay >= rule.fromMinute && minuteOfDay < rule.toMinute;
	}
	if (minuteOfDay >= rule.fromMinute) return rule.weekdays.includes(isoWeekday);
	if (minuteOfDay < rule.toMinute) return rule.weekdays.includes(isoWeekday === 1 ? 7 : isoWeekday - 1);
	return false;
}

/**
 * Which surcharge rule wins each minute of [start, end), summed per rule, in policy order.
 * `isHoliday` is only asked when the policy has a 'holiday' rule.
 */
export function surchargeShares(
	start: Date,
	end: Date,
	policy: Pick<StudioPolicy, 'timeZone' | 'surcharges'>,
	isHoliday: (ymd: string) => boolean
): SurchargeShare[] {
	const rules = policy.surcharges.filter((rule) => rule.percentBp > 0);
	if (rules.length === 0) return [];
	const wonMinutes = new Map<SurchargeRule, number>();
	const holidayRules = rules.filter((rule) => rule.kind === 'holiday');

	for (const segment of localSegments(start, end, policy.timeZone)) {
		const holiday = holidayRules.length > 0 && isHoliday(segment.ymd);
		// Once per local day: the rules that can cover any minute of it (windowCovers decides each minute).
		const previous = segment.isoWeekday === 1 ? 7 : segment.isoWeekday - 1;
		const candidates = rules.filter((rule) =>
			rule.kind === 'holiday'
				? holiday
				: rule.weekdays.includes(segment.isoWeekday) || (rule.fromMinute > rule.toMinute && rule.weekdays.includes(previous))
		);
		if (candidates.length === 0) continue;
		for (let k = 0; k < segment.minutes; k++) {
			const minuteOfDay = segment.startMinuteOfDay + k;
			let winner: SurchargeRule | undefined;
			for (const rule of candidates) {
				const applies = rule.kind === 'holiday' || windowCovers(rule, segment.isoWeekday, minuteOfDay);
				if (applies && (!winner || rule.percentBp > winner.percentBp)) winner = rule;
			}
			if (winner) wonMinutes.set(winner, (wonMinutes.get(winner) ?? 0) + 1);
		}
	}
	return rules.flatMap((rule) => {
		const minutes = wonMinutes.get(rule) ?? 0;
		return minutes > 0 ? [{ rule, minutes }] : [];
	});
}

/**
 * Σ over the booked minutes of each minute's winning percent, in basis-point minutes (the W of
 * cheapestCover): 120 evening minutes at 25 % = 120 × 2500 = 300 000.
 */
export function surchargeWeight(shares: readonly SurchargeShare[]): number {
	return shares.reduce((sum, { rule, minutes }) => sum + rule.percentBp * minutes, 0);
}

/**
 * One rule's exact share on its own, rounded half-up: price × rule % × minutes ÷ capacityMinutes
 * (exact in BigInt before rounding). 160.00 × 25 % × 120/240 = 20.00.
 */
export function surchargeAmount(price: Minor, share: SurchargeShare, capacityMinutes: number): Minor {
	if (capacityMinutes <= 0) return 0;
	return mulDivRoundHalfUp(price, share.rule.percentBp * share.minutes, 10_000 * capacityMinutes);
}

/**
 * A resource's surcharge per rule, in the order of `shares`: the total price × Σ(percent per
 * minute) ÷ capacity is rounded half-up once; each rule gets its exact share rounded down, and the
 * cents left over go one each to the largest remainders (on equal remainders, the rule listed
 * first). With a single rule this is that rule's amount rounded half-up.
 */
export function surchargeSplit(price: Minor, shares: readonly SurchargeShare[], capacityMinutes: number): Minor[] {
	if (capacityMinutes <= 0 || shares.length === 0) return shares.map(() => 0);
	const denominator = BigInt(capacityMinutes) * 10_000n;
	const exact = shares.map(({ rule, minutes }) => BigInt(price) * BigInt(rule.percentBp) * BigInt(minutes));
	const sum = exact.reduce((a, b) => a + b, 0n);
	const total = (2n * sum + denominator) / (2n * denominator); // half-up, all terms ≥ 0
	const amounts = exact.map((n) => n / denominator);
	let left = total - amounts.reduce((a, b) => a + b, 0n);
	const byRemainder = exact
		.map((n, i) => ({ i, remainder: n % denominator }))
		.sort((a, b) => (a.remainder === b.remainder ? a.i - b.i : a.remainder > b.remainder ? -1 : 1));
	for (const { i } of byRemainder) {
		if (left === 0n) break;
		amounts[i] = (amounts[i] ?? 0n) + 1n;
		left -= 1n;
	}
	return amounts.map(Number);
}

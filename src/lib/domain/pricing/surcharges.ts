/**
 * Surcharges pro rata by minute (PRODUCT.md; evening, weekend and holiday premiums are common
 * practice, the per-minute rule is Slateroom's own).
 *
 * Every real minute of a booking carries the HIGHEST surcharge whose window contains it, read in
 * the studio's local wall time: a 'window' rule by ISO weekday and local minute of the day, a
 * 'holiday' rule on every minute of a local date that is a public holiday. Overlapping rules never
 * add up; on equal percentages the rule listed first in the policy wins. Rules of 0 % or less are
 * ignored (a discount would be an allowance, not a surcharge).
 *
 * A resource's surcharge for a rule = its block price × rule % × (minutes the rule won ÷ booked
 * minutes), i.e. the price times the rule's share of the booked time, rounded half-up once.
 */
import { mulDivRoundHalfUp } from '../money';
import type { Minor, StudioPolicy, SurchargeRule } from '../types';
import { localSegments } from './zonedTime';

export interface SurchargeShare {
	rule: SurchargeRule;
	/** Real minutes of the booking this rule won (highest per minute). */
	minutes: number;
}

function windowContains(rule: SurchargeRule, minuteOfDay: number): boolean {
	// A window with from > to wraps past midnight within the same local date's weekday list.
	return rule.fromMinute <= rule.toMinute
		? minuteOfDay >= rule.fromMinute && minuteOfDay < rule.toMinute
		: minuteOfDay >= rule.fromMinute || minuteOfDay < rule.toMinute;
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
		const candidates = rules.filter((rule) => (rule.kind === 'holiday' ? holiday : rule.weekdays.includes(segment.isoWeekday)));
		if (candidates.length === 0) continue;
		for (let k = 0; k < segment.minutes; k++) {
			const minuteOfDay = segment.startMinuteOfDay + k;
			let winner: SurchargeRule | undefined;
			for (const rule of candidates) {
				const applies = rule.kind === 'holiday' || windowContains(rule, minuteOfDay);
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

/** price × rule % × minutes ÷ totalMinutes, rounded half-up (exact in BigInt before rounding). */
export function surchargeAmount(price: Minor, share: SurchargeShare, totalMinutes: number): Minor {
	if (totalMinutes <= 0) return 0;
	return mulDivRoundHalfUp(price, share.rule.percentBp * share.minutes, 10_000 * totalMinutes);
}

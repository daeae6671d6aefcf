/**
 * Sanity checks for what the owner types into a rate card, before it prices anything. Two kinds of
 * finding: an `error` is something that can only be a slip of the keyboard and blocks saving; a
 * `warning` is merely odd (the owner may mean it) and is shown without blocking anything.
 *
 * Our rules, from how the pricing engine sells time (blocks.ts, surcharges.ts):
 * - a half day dearer than a full day cannot be meant: error;
 * - a block dearer than the hours it stands for is never sold (the cheapest cover takes the
 *   hours): warning; dearer BLOCK_TYPO_FACTOR times over or more, it is a slipped digit: error;
 * - a full day dearer than two half days is never sold either: warning; a half day at the full
 *   day's price: warning;
 * - a surcharge above 100 % more than doubles those minutes: warning (the form's own limit refuses
 *   absurd percents);
 * - a window whose end is at or before its start runs past midnight into the next day: warning,
 *   saying the hours it covers.
 */
import { basisPointsToPercent, formatMoney } from '../money';
import { hourlyAmount } from './blocks';
import { clockLabel, formatDuration } from '../time';

export type FindingLevel = 'error' | 'warning';

export interface Finding<F extends string = string> {
	field: F;
	level: FindingLevel;
	message: string;
}

/** A block this many times dearer than its hours at the hourly rate is taken for a typo. */
export const BLOCK_TYPO_FACTOR = 3;

export interface BlockRates {
	hourly: number;
	halfDay: number;
	fullDay: number;
}

export interface BlockLengths {
	halfDayMinutes: number;
	fullDayMinutes: number;
}

export type RateField = 'hourly' | 'halfDay' | 'fullDay';

const BLOCK_NAMES = { halfDay: 'half day', fullDay: 'full day' } as const;

/** Findings on an hourly rate and its two blocks (a room's or the engineer's), amounts in minor units. */
export function checkBlockRates(rates: BlockRates, lengths: BlockLengths, currency: string): Finding<RateField>[] {
	const found: Finding<RateField>[] = [];
	const money = (minor: number) => formatMoney(minor, currency);
	const { hourly, halfDay, fullDay } = rates;

	if (halfDay > fullDay) {
		found.push({
			field: 'halfDay',
			level: 'error',
			message: `The half day (${money(halfDay)}) costs more than the full day (${money(fullDay)}): check both for a typo.`
		});
	} else if (halfDay === fullDay && halfDay > 0) {
		found.push({
			field: 'halfDay',
			level: 'warning',
			message: `The half day costs as much as the full day (${money(fullDay)}), so nobody is offered a half day's saving.`
		});
	}

	if (hourly > 0) {
		for (const block of ['halfDay', 'fullDay'] as const) {
			const minutes = block === 'halfDay' ? lengths.halfDayMinutes : lengths.fullDayMinutes;
			const price = rates[block];
			const asHours = hourlyAmount(hourly, minutes);
			const name = BLOCK_NAMES[block];
			const hours = formatDuration(minutes);
			if (price >= asHours * BLOCK_TYPO_FACTOR) {
				found.push({
					field: block,
					level: 'error',
					message: `The ${name} (${money(price)}) costs ${Math.floor(price / asHours)} times what its ${hours} cost by the hour (${money(asHours)}): check for a typo.`
				});
			} else if (price > asHours) {
				found.push({
					field: block,
					level: 'warning',
					message: `The ${name} (${money(price)}) costs more than its ${hours} by the hour (${money(asHours)}), so it is never chosen: bookings are priced by the hour instead.`
				});
			}
		}
	}

	if (
		halfDay > 0 &&
		halfDay <= fullDay &&
		lengths.fullDayMinutes <= 2 * lengths.halfDayMinutes &&
		fullDay > 2 * halfDay &&
		!found.some((f) => f.field === 'fullDay')
	) {
		found.push({
			field: 'fullDay',
			level: 'warning',
			message: `Two half days (${money(2 * halfDay)}) cost less than the full day (${money(fullDay)}), so the full day is never chosen.`
		});
	}
	return found;
}

/** The hours a daily window covers: [from, to) in minutes of the day, past midnight when to ≤ from. */
export function windowSpan(fromMinute: number, toMinute: number): { overnight: boolean; minutes: number } {
	const overnight = toMinute <= fromMinute;
	return { overnight, minutes: overnight ? 1440 - fromMinute + toMinute : toMinute - fromMinute };
}

export type SurchargeField = 'percent' | 'to';

export interface SurchargeShape {
	percentBp: number;
	kind: 'window' | 'holiday';
	fromMinute: number;
	toMinute: number;
}

/** Findings on one surcharge rule. Equal ends are the form's own error (a window needs a length). */
export function checkSurcharge(rule: SurchargeShape): Finding<SurchargeField>[] {
	const found: Finding<SurchargeField>[] = [];
	if (rule.percentBp > 10_000) {
		found.push({
			field: 'percent',
			level: 'warning',
			message: `+${basisPointsToPercent(rule.percentBp)} % is above 100 %: it more than doubles the price of every minute it covers. Check that this is meant.`
		});
	}
	// 00:00 as the end is midnight at the end of the day (as 24:00): nothing runs over.
	if (rule.kind === 'window' && rule.toMinute > 0 && rule.toMinute < rule.fromMinute) {
		const span = windowSpan(rule.fromMinute, rule.toMinute);
		found.push({
			field: 'to',
			level: 'warning',
			message: `The window ends before it starts, so it runs past midnight: ${clockLabel(rule.fromMinute)} to ${clockLabel(rule.toMinute)} the next morning, ${formatDuration(span.minutes)} a night, starting on each day ticked.`
		});
	}
	return found;
}

/** Only the findings of one level. */
export function ofLevel<F extends string>(found: Finding<F>[], level: FindingLevel): Finding<F>[] {
	return found.filter((f) => f.level === level);
}

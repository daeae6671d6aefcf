/** Building price lines for a resource (room or engineer time), its surcharges, and gear hire. */
import { assertInteger } from '../money';
import { isPublicHoliday } from '../holidays';
import type { BlockLengths, BlockRates, GearHire, Minor, StudioPolicy } from '../types';
import type { BlockCover } from './blocks';
import { decimalHours, formatPercent } from './labels';
import { formatDuration } from '../time';
import { surchargeSplit, type SurchargeShare } from './surcharges';
import type { SurchargeMinutes } from './types';
import type { ChargeItem } from './vat';

/** What is being priced: the room, or engineer time. */
export interface Resource {
	key: 'room' | 'engineer';
	/** "Live room" or "Engineer". */
	name: string;
	/** How a surcharge line names it: "Live room" or "engineer time". */
	surchargeTarget: string;
	rates: BlockRates;
}

export function roomResource(room: { name: string; rates: BlockRates }): Resource {
	return { key: 'room', name: room.name, surchargeTarget: room.name, rates: room.rates };
}

export function engineerResource(rates: BlockRates): Resource {
	return { key: 'engineer', name: 'Engineer', surchargeTarget: 'engineer time', rates };
}

/** The policy's own holiday calendar when the caller gives none (date-holidays, by country). */
export function holidayCheckerFor(
	policy: Pick<StudioPolicy, 'country'>,
	holidays?: (ymd: string) => boolean
): (ymd: string) => boolean {
	return holidays ?? ((ymd) => isPublicHoliday(policy.country, ymd));
}

/** Real elapsed whole minutes from `start` to `end`; throws unless end is after start on a whole minute. */
export function elapsedMinutes(start: Date, end: Date): number {
	const ms = end.getTime() - start.getTime();
	if (!Number.isFinite(ms) || ms <= 0) throw new RangeError('end must be after start');
	if (ms % 60_000 !== 0) throw new RangeError('times must fall on whole minutes');
	return ms / 60_000;
}

/** Lines for the blocks of one resource: full days, half days, hourly time (those used). */
export function blockLines(resource: Resource, cover: BlockCover, blocks: BlockLengths, vatRateBp: number): ChargeItem[] {
	const lines: ChargeItem[] = [];
	if (cover.fullDays > 0) {
		lines.push({
			key: `${resource.key}:full-day`,
			kind: resource.key,
			label: `${resource.name}, full day (${formatDuration(blocks.fullDayMinutes)})`,
			quantity: String(cover.fullDays),
			unitCode: 'C62',
			unitAmount: resource.rates.fullDay,
			amount: cover.fullDayAmount,
			vatRateBp
		});
	}
	if (cover.halfDays > 0) {
		lines.push({
			key: `${resource.key}:half-day`,
			kind: resource.key,
			label: `${resource.name}, half day (${formatDuration(blocks.halfDayMinutes)})`,
			quantity: String(cover.halfDays),
			unitCode: 'C62',
			unitAmount: resource.rates.halfDay,
			amount: cover.halfDayAmount,
			vatRateBp
		});
	}
	if (cover.hourlyMinutes > 0) {
		lines.push({
			key: `${resource.key}:hourly`,
			kind: resource.key,
			label: `${resource.name}, hourly (${formatDuration(cover.hourlyMinutes)})`,
			quantity: decimalHours(cover.hourlyMinutes),
			unitCode: 'HUR',
			unitAmount: resource.rates.hourly,
			amount: cover.hourlyAmount,
			vatRateBp
		});
	}
	return lines;
}

/** What one resource's surcharges are worked out from: the price and capacity of what it bought. */
export interface SurchargeBase {
	resource: Resource;
	/** price(C): the cover's price (or, for overtime, the overtime amount). */
	price: Minor;
	/** capacity(C): the minutes of block time that price buys (overtime: the billed minutes). */
	capacityMinutes: number;
}

/**
 * The surcharge lines of one or more resources: price × Σ(percent per minute) ÷ capacity per
 * resource, rounded once and split by rule (surchargeSplit), listed rule by rule and, within a
 * rule, resource by resource. Lines that come to 0 are left out.
 */
export function surchargeLines(
	bases: readonly SurchargeBase[],
	shares: readonly SurchargeShare[],
	vatRateBp: number,
	keyPrefix = 'surcharge'
): ChargeItem[] {
	const amounts = bases.map((base) => surchargeSplit(base.price, shares, base.capacityMinutes));
	return shares.flatMap(({ rule, minutes }, i) =>
		bases.flatMap(({ resource }, j) => {
			const amount = amounts[j]?.[i] ?? 0;
			if (amount === 0) return [];
			return [
				{
					key: `${keyPrefix}:${rule.id}:${resource.key}`,
					kind: 'surcharge' as const,
					label: `${rule.label} on ${resource.surchargeTarget} (${formatPercent(rule.percentBp)}, ${formatDuration(minutes)})`,
					amount,
					vatRateBp
				}
			];
		})
	);
}

/** Gear hire: a fee per booking per item, a line each (never surcharged). EN 16931 BR-27: no negative price. */
export function gearLines(gear: readonly GearHire[], vatRateBp: number): ChargeItem[] {
	const seen = new Map<string, number>();
	return gear.map((item) => {
		assertInteger(item.fee, `fee of ${item.label}`);
		if (item.fee < 0) throw new RangeError(`gear fee of ${item.label} is negative`);
		const count = (seen.get(item.id) ?? 0) + 1;
		seen.set(item.id, count);
		return {
			key: count === 1 ? `gear:${item.id}` : `gear:${item.id}#${count}`,
			kind: 'gear' as const,
			label: `Gear hire: ${item.label}`,
			quantity: '1',
			unitCode: 'C62',
			unitAmount: item.fee,
			amount: item.fee,
			vatRateBp
		};
	});
}

export function surchargeSummary(shares: readonly SurchargeShare[]): SurchargeMinutes[] {
	return shares.map(({ rule, minutes }) => ({
		ruleId: rule.id,
		label: rule.label,
		percentBp: rule.percentBp,
		minutes
	}));
}

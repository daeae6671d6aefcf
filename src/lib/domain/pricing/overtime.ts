/**
 * Overtime (our rule; billing overtime in 15- or 30-minute increments is common practice).
 *
 * Each STARTED overtime increment past the booked end is billed at the hourly rate pro rata
 * (15 min = a quarter of the hourly rate): the room's hourly rate, plus the engineer's when an
 * engineer was booked. The billed minutes — from the booked end to the end of the last started
 * increment — carry the surcharges that minute by minute win there (highest per minute), applied
 * to the room and engineer overtime as in a quote: the overtime amount buys exactly the billed
 * minutes, so each resource's surcharge = overtime amount × Σ(percent per billed minute) ÷ billed
 * minutes, rounded once per resource and split by rule (surcharges.ts). Lines and totals follow
 * the quote's shape.
 */
import type { RoomRates, StudioPolicy } from '../types';
import { hourlyAmount } from './blocks';
import { decimalHours } from './labels';
import { formatDuration } from '../time';
import { engineerResource, holidayCheckerFor, roomResource, surchargeLines, surchargeSummary, type Resource } from './lines';
import { surchargeShares } from './surcharges';
import type { OvertimeCharge } from './types';
import type { VatTreatment } from '../vat-treatment';
import { chargeTotals, type ChargeItem } from './vat';

export interface OvertimeInput {
	bookedEnd: Date;
	actualEnd: Date;
	room: RoomRates;
	engineer: boolean;
	policy: StudioPolicy;
	holidays?: (ymd: string) => boolean;
	/** The booking's treatment (its quote's): reverse charge bills overtime without VAT too. */
	vatTreatment?: VatTreatment;
}

export function overtimeCharge(input: OvertimeInput): OvertimeCharge {
	const { bookedEnd, actualEnd, room, engineer, policy } = input;
	const increment = policy.overtimeIncrementMinutes;
	if (!Number.isInteger(increment) || increment <= 0) {
		throw new RangeError('overtimeIncrementMinutes must be a positive integer');
	}
	const overMs = Math.max(0, actualEnd.getTime() - bookedEnd.getTime());
	const overtimeMinutes = Math.ceil(overMs / 60_000);
	const increments = Math.ceil(overMs / (increment * 60_000));
	const billedMinutes = increments * increment;
	const vatRateBp = policy.vatRateBp;

	const resources: Resource[] = [{ ...roomResource(room), surchargeTarget: `${room.name} overtime` }];
	if (engineer) {
		resources.push({ ...engineerResource(policy.engineerRates), surchargeTarget: 'engineer overtime' });
	}

	const items: ChargeItem[] = [];
	const billedEnd = new Date(bookedEnd.getTime() + billedMinutes * 60_000);
	const shares =
		billedMinutes > 0 ? surchargeShares(bookedEnd, billedEnd, policy, holidayCheckerFor(policy, input.holidays)) : [];
	const bases = resources.map((resource) => hourlyAmount(resource.rates.hourly, billedMinutes));

	resources.forEach((resource, i) => {
		if (billedMinutes === 0) return;
		items.push({
			key: `overtime:${resource.key}`,
			kind: 'overtime',
			label: `Overtime, ${resource.name} (${increments} × ${formatDuration(increment)})`,
			quantity: decimalHours(billedMinutes),
			unitCode: 'HUR',
			unitAmount: resource.rates.hourly,
			amount: bases[i] ?? 0,
			vatRateBp
		});
	});
	if (billedMinutes > 0) {
		// Overtime buys exactly the billed minutes, so its capacity is billedMinutes.
		const surchargeBases = resources.map((resource, i) => ({ resource, price: bases[i] ?? 0, capacityMinutes: billedMinutes }));
		items.push(...surchargeLines(surchargeBases, shares, vatRateBp, 'overtime-surcharge'));
	}

	return {
		...chargeTotals(items, policy.currency, policy.pricesIncludeVat, input.vatTreatment),
		overtimeMinutes,
		increments,
		billedMinutes,
		surchargeMinutes: surchargeSummary(shares)
	};
}

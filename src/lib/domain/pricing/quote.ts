/**
 * The price of a booking, as the artist sees it before paying: what they pay is what was shown.
 *
 * 1. Surcharge minutes (surcharges.ts): every real minute of the booking carries its highest
 *    surcharge (evening, weekend, holiday); W = Σ of those percents over the booked minutes.
 * 2. Room time: the cover C — a mix of full days, half days and hourly increments whose block
 *    time covers the real elapsed minutes — with the lowest price(C) + surcharge(C) (blocks.ts).
 *    Real minutes: a night across a daylight-saving change bills 23 h or 25 h (Directive
 *    2000/84/EC; IANA tz).
 * 3. Engineer time, when booked: its own cover, chosen the same way from the engineer rates.
 * 4. Surcharges — common practice / our rule: each surcharged booked minute pays its percent of
 *    the minute's share of the block time bought, so per resource
 *      surcharge(C) = price(C) × W ÷ capacity(C)   (capacity = the minutes of block time C buys),
 *    rounded half-up once per resource and split into a labelled line per rule. Gear hire is not
 *    surcharged. Worked example: Tuesday 16:00–20:00 in the live room = half day 160.00 +
 *    160.00 × 25 % × 120/240 = 20.00.
 * 5. Gear hire: the fee per booking, a line per item.
 * 6. VAT and totals per EN 16931 (vat.ts); the rounding amount BT-114 keeps the total equal to
 *    the advertised gross when prices include VAT. Under reverse charge (../vat-treatment.ts) the
 *    lines carry no VAT and, with prices incl. VAT, cost their net amounts (vat.ts
 *    `reverseChargeItems`); the monotonicity below is shown for the standard treatment.
 * 7. Deposit and balance (deposit.ts).
 *
 * Why the total never decreases when a booking gets longer (at either end). Let booking B lie
 * inside booking B'. A minute's highest surcharge depends on that minute alone and percentages are
 * ≥ 0, so W(B) ≤ W(B'). Let C' be the cover chosen for B': capacity(C') ≥ |B'| ≥ |B|, so C' also
 * covers B, and cheapestCover searches every cover of B (it drops only covers whose price alone
 * exceeds a total it has already found). Hence, per resource, before rounding:
 *   best(B) ≤ price(C') + price(C') × W(B) ÷ capacity(C') ≤ price(C') + price(C') × W(B') ÷ capacity(C') = best(B').
 * Rounding keeps this: price(C) is whole minor units, so price + round(surcharge) =
 * round(price + surcharge), and half-up rounding is monotone; the lines per rule are a split of
 * that one rounded amount, not rounded each on their own (which could lose a cent). Room,
 * engineer and the same gear add up. With prices incl. VAT the total is the sum of the amounts;
 * excl. VAT it is net + round(net × rate) with net = that sum; both never decrease as it grows.
 */
import type { BlockRates, GearHire, RoomRates, StudioPolicy } from '../types';
import { cheapestCover } from './blocks';
import { depositAndBalance } from './deposit';
import {
	blockLines,
	elapsedMinutes,
	engineerResource,
	gearLines,
	holidayCheckerFor,
	roomResource,
	surchargeLines,
	surchargeSummary,
	type SurchargeBase
} from './lines';
import { surchargeShares, surchargeWeight } from './surcharges';
import type { Quote } from './types';
import type { VatTreatment } from '../vat-treatment';
import { chargeTotals, type ChargeItem } from './vat';

export interface QuoteInput {
	start: Date;
	end: Date;
	room: RoomRates;
	engineer: boolean;
	gear: GearHire[];
	policy: StudioPolicy;
	/** Is this local date 'YYYY-MM-DD' a public holiday? Defaults to date-holidays for policy.country. */
	holidays?: (ymd: string) => boolean;
	/** 'reverse-charge' prices the booking without VAT (vat.ts `chargeTotals`); default 'standard'. */
	vatTreatment?: VatTreatment;
}

export function quoteBooking(input: QuoteInput): Quote {
	const { start, end, room, engineer, gear, policy } = input;
	const durationMinutes = elapsedMinutes(start, end);
	const vatRateBp = policy.vatRateBp;
	const shares = surchargeShares(start, end, policy, holidayCheckerFor(policy, input.holidays));
	const weight = surchargeWeight(shares);
	const coverOf = (rates: BlockRates) => cheapestCover(durationMinutes, rates, policy.blocks, policy.incrementMinutes, weight);

	const roomTime = roomResource(room);
	const roomBlocks = coverOf(room.rates);
	const items: ChargeItem[] = blockLines(roomTime, roomBlocks, policy.blocks, vatRateBp);
	const surchargeBases: SurchargeBase[] = [
		{ resource: roomTime, price: roomBlocks.price, capacityMinutes: roomBlocks.coveredMinutes }
	];

	const engineerBlocks = engineer ? coverOf(policy.engineerRates) : null;
	if (engineerBlocks) {
		const engineerTime = engineerResource(policy.engineerRates);
		items.push(...blockLines(engineerTime, engineerBlocks, policy.blocks, vatRateBp));
		surchargeBases.push({ resource: engineerTime, price: engineerBlocks.price, capacityMinutes: engineerBlocks.coveredMinutes });
	}

	items.push(...surchargeLines(surchargeBases, shares, vatRateBp));
	items.push(...gearLines(gear, vatRateBp));

	const totals = chargeTotals(items, policy.currency, policy.pricesIncludeVat, input.vatTreatment);
	return {
		...totals,
		...depositAndBalance(totals.total, policy),
		durationMinutes,
		roomBlocks,
		engineerBlocks,
		surchargeMinutes: surchargeSummary(shares)
	};
}

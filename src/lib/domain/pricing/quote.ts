/**
 * The price of a booking, as the artist sees it before paying (PRODUCT.md, "What it computes").
 *
 * 1. Room time: the cheapest mix of full days, half days and hourly time covering the real
 *    elapsed minutes (blocks.ts). Real minutes: a night across a daylight-saving change bills
 *    23 h or 25 h (Directive 2000/84/EC; IANA tz).
 * 2. Engineer time, when booked: priced the same way from the policy's engineer rates.
 * 3. Surcharges (surcharges.ts): applied to room time AND engineer time, each resource's block
 *    price × the winning rule's % × its share of the minutes, a labelled line per rule and
 *    resource. Gear hire is not surcharged.
 * 4. Gear hire: the fee per booking, a line per item.
 * 5. VAT and totals per EN 16931 (vat.ts); the rounding amount BT-114 keeps the total equal to
 *    the advertised gross when prices include VAT.
 * 6. Deposit and balance (deposit.ts).
 */
import type { GearHire, RoomRates, StudioPolicy } from '../types';
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
	surchargeSummary
} from './lines';
import { surchargeShares } from './surcharges';
import type { Quote } from './types';
import { summariseCharges, type ChargeItem } from './vat';

export interface QuoteInput {
	start: Date;
	end: Date;
	room: RoomRates;
	engineer: boolean;
	gear: GearHire[];
	policy: StudioPolicy;
	/** Is this local date 'YYYY-MM-DD' a public holiday? Defaults to date-holidays for policy.country. */
	holidays?: (ymd: string) => boolean;
}

export function quoteBooking(input: QuoteInput): Quote {
	const { start, end, room, engineer, gear, policy } = input;
	const durationMinutes = elapsedMinutes(start, end);
	const vatRateBp = policy.vatRateBp;
	const shares = surchargeShares(start, end, policy, holidayCheckerFor(policy, input.holidays));

	const roomTime = roomResource(room);
	const roomBlocks = cheapestCover(durationMinutes, room.rates, policy.blocks, policy.incrementMinutes);
	const items: ChargeItem[] = blockLines(roomTime, roomBlocks, policy.blocks, vatRateBp);

	const engineerTime = engineerResource(policy.engineerRates);
	const engineerBlocks = engineer
		? cheapestCover(durationMinutes, policy.engineerRates, policy.blocks, policy.incrementMinutes)
		: null;
	if (engineerBlocks) items.push(...blockLines(engineerTime, engineerBlocks, policy.blocks, vatRateBp));

	for (const share of shares) {
		items.push(...surchargeLines(roomTime, roomBlocks.price, [share], durationMinutes, vatRateBp));
		if (engineerBlocks) {
			items.push(...surchargeLines(engineerTime, engineerBlocks.price, [share], durationMinutes, vatRateBp));
		}
	}
	items.push(...gearLines(gear, vatRateBp));

	const totals = summariseCharges(items, policy.currency, policy.pricesIncludeVat);
	return {
		...totals,
		...depositAndBalance(totals.total, policy),
		durationMinutes,
		roomBlocks,
		engineerBlocks,
		surchargeMinutes: surchargeSummary(shares)
	};
}

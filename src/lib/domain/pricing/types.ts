/**
 * Shapes the pricing engine returns. Amounts are integer minor units of `currency`.
 * The totals follow the EN 16931-1 semantic model (business terms named beside each field).
 */
import type { Minor } from '../types';
import type { VatTreatment } from '../vat-treatment';
import type { BlockCover } from './blocks';

export type LineKind = 'room' | 'engineer' | 'surcharge' | 'gear' | 'overtime';

export interface PriceLine {
	/** Stable id within one quote: 'room:half-day', 'surcharge:evening:room', 'gear:<id>' … */
	key: string;
	kind: LineKind;
	/** Text for people, in English (en-GB): "Evening surcharge on Live room (25 %, 2 h)". */
	label: string;
	/** Decimal quantity ("1", "2.5") in `unitCode`; absent on pro rata surcharge lines. */
	quantity?: string;
	/** UN/ECE Recommendation 20 unit: 'HUR' hour, 'C62' one (a block, an item of gear). */
	unitCode?: string;
	/** Price of one unit, incl. or excl. VAT like `amount`. */
	unitAmount?: Minor;
	/** The amount as shown on the rate card: incl. VAT when the policy's prices include VAT. */
	amount: Minor;
	/** Line net amount excl. VAT, rounded to minor units (EN 16931 BT-131). */
	net: Minor;
	/** VAT rate of the line in basis points (2550 = 25.5 %). */
	vatRateBp: number;
}

/** One VAT breakdown group (EN 16931 BG-23). */
export interface VatGroup {
	/** BT-119 as text without trailing zeros: "25.5". */
	ratePercent: string;
	rateBp: number;
	/** BT-116 taxable amount: sum of the line nets at this rate. */
	base: Minor;
	/** BT-117 = round(base × rate / 100) to minor units (BR-CO-17). */
	amount: Minor;
	/**
	 * BT-118 VAT category code (UNTDID 5305) when it is not read from the rate: 'AE', VAT reverse
	 * charge. Absent: 'S' above 0 %, 'Z' at 0 %.
	 */
	category?: 'AE';
}

export interface ChargeTotals {
	currency: string;
	/** Whether the line amounts include VAT; false after reverse charge (the amounts are nets, no VAT is in them). */
	pricesIncludeVat: boolean;
	/** 'reverse-charge': priced without VAT, the buyer accounts for it (vat-treatment.ts). Absent on quotes made before treatments were kept: 'standard'. */
	vatTreatment?: VatTreatment;
	lines: PriceLine[];
	/** BT-106 sum of line nets (BR-CO-10) = BT-109 taxable total (BR-CO-13, no document allowances or charges). */
	net: Minor;
	vat: VatGroup[];
	/** BT-110 total VAT = sum of the groups' VAT (BR-CO-14). */
	vatTotal: Minor;
	/** BT-112 total with VAT = net + vatTotal (BR-CO-15). */
	gross: Minor;
	/**
	 * BT-114 rounding amount: what brings the invoice gross to the advertised gross when the
	 * prices include VAT (a cent or two either way); 0 when prices exclude VAT.
	 */
	rounding: Minor;
	/** BT-115 amount due before any payment = gross + rounding (BR-CO-16, nothing prepaid). */
	total: Minor;
}

export interface SurchargeMinutes {
	ruleId: string;
	label: string;
	percentBp: number;
	/** Real minutes of the booking this rule won (the highest per minute). */
	minutes: number;
}

export interface Quote extends ChargeTotals {
	/** Deposit due now: a share of `total`, rounded up to whole currency units, ≥ minimum, ≤ total. */
	deposit: Minor;
	/** total − deposit. */
	balance: Minor;
	/** Real elapsed minutes between start and end. */
	durationMinutes: number;
	/** The room's cover: the mix with the lowest price + surcharge (blocks.ts). */
	roomBlocks: BlockCover;
	/** The engineer's own cover, chosen the same way; null when no engineer is booked. */
	engineerBlocks: BlockCover | null;
	surchargeMinutes: SurchargeMinutes[];
}

export interface OvertimeCharge extends ChargeTotals {
	/** Real minutes past the booked end (rounded up to whole minutes). */
	overtimeMinutes: number;
	/** Started overtime increments. */
	increments: number;
	/** increments × overtimeIncrementMinutes. */
	billedMinutes: number;
	surchargeMinutes: SurchargeMinutes[];
}

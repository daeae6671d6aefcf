/**
 * VAT and document totals, following EN 16931-1 (the European e-invoicing semantic model) as
 * checked by the CEN validation artefacts (github.com/ConnectingEurope/eInvoicing-EN16931):
 *
 * - each line net (BT-131) is rounded to minor units (BR-DEC: at most two decimals);
 *   when the rate card includes VAT, line net = gross amount ÷ (1 + rate), rounded half-up;
 * - BR-CO-10: sum of line nets (BT-106) = Σ BT-131;
 * - BR-CO-13: taxable total (BT-109) = BT-106 − allowances + charges (none at document level here);
 * - BR-CO-17: VAT per rate (BT-117) = taxable amount of that rate (BT-116) × rate ÷ 100,
 *   rounded to minor units (half-up);
 * - BR-CO-14: total VAT (BT-110) = Σ BT-117;
 * - BR-CO-15: gross (BT-112) = BT-109 + BT-110;
 * - BR-CO-16: amount due (BT-115) = BT-112 − prepaid (BT-113) + rounding (BT-114).
 *
 * When prices include VAT, the rounded nets and the per-rate VAT can land a cent or two away from
 * the sum of the advertised gross amounts. That difference is not spread into a line or dropped:
 * it is the explicit rounding amount BT-114, so the amount due always equals what was advertised.
 */
import { basisPointsToPercent, mulDivRoundHalfUp, sumMinor } from '../money';
import type { Minor } from '../types';
import type { VatTreatment } from '../vat-treatment';
import type { ChargeTotals, PriceLine, VatGroup } from './types';

export type ChargeItem = Omit<PriceLine, 'net'>;

/** Line net excl. VAT of an amount as shown (BT-131), rounded half-up to minor units. */
export function lineNet(amount: Minor, vatRateBp: number, pricesIncludeVat: boolean): Minor {
	return pricesIncludeVat ? mulDivRoundHalfUp(amount, 10_000, 10_000 + vatRateBp) : amount;
}

/** BR-CO-17: VAT of a taxable amount at a rate, rounded half-up to minor units. */
export function vatOf(base: Minor, vatRateBp: number): Minor {
	return mulDivRoundHalfUp(base, vatRateBp, 10_000);
}

/** Nets, VAT groups and totals of a list of priced items (a quote, an overtime bill, an invoice). */
export function summariseCharges(items: readonly ChargeItem[], currency: string, pricesIncludeVat: boolean): ChargeTotals {
	const lines: PriceLine[] = items.map((item) => ({
		...item,
		net: lineNet(item.amount, item.vatRateBp, pricesIncludeVat)
	}));

	const bases = new Map<number, Minor>();
	for (const line of lines) bases.set(line.vatRateBp, (bases.get(line.vatRateBp) ?? 0) + line.net);
	const vat: VatGroup[] = [...bases.entries()]
		.sort(([a], [b]) => b - a)
		.map(([rateBp, base]) => ({
			ratePercent: basisPointsToPercent(rateBp),
			rateBp,
			base,
			amount: vatOf(base, rateBp)
		}));

	const net = sumMinor(lines.map((l) => l.net)); // BR-CO-10 and BR-CO-13
	const vatTotal = sumMinor(vat.map((g) => g.amount)); // BR-CO-14
	const gross = net + vatTotal; // BR-CO-15
	const advertised = pricesIncludeVat ? sumMinor(lines.map((l) => l.amount)) : gross;
	const rounding = advertised - gross; // BT-114
	return {
		currency,
		pricesIncludeVat,
		lines,
		net,
		vat,
		vatTotal,
		gross,
		rounding,
		total: gross + rounding // BR-CO-16 with nothing prepaid
	};
}

/**
 * The items of a reverse-charged booking (vat-treatment.ts): the same services at 0 %, VAT
 * category AE. What the buyer pays, our rule: when the rate card includes VAT, each line's amount
 * becomes its net amount (BT-131), exactly as a standard invoice of the same booking would state
 * it (lineNet: amount ÷ (1 + rate), rounded half-up); a rate card before VAT keeps its amounts. So
 * the studio keeps the same revenue net of VAT whoever buys, and the buyer's own VAT on the net
 * (which they account for under Article 196) replaces the studio's: nobody pays the studio VAT it
 * does not owe. Unit prices go net the same way.
 */
export function reverseChargeItems(items: readonly ChargeItem[], pricesIncludeVat: boolean): ChargeItem[] {
	return items.map((item) => ({
		...item,
		amount: lineNet(item.amount, item.vatRateBp, pricesIncludeVat),
		...(item.unitAmount === undefined ? {} : { unitAmount: lineNet(item.unitAmount, item.vatRateBp, pricesIncludeVat) }),
		vatRateBp: 0
	}));
}

/**
 * Totals of priced items under a booking's VAT treatment: the studio's VAT, or none at all
 * (reverse charge: lines at 0 %, one VAT group of category AE, amounts without VAT).
 */
export function chargeTotals(
	items: readonly ChargeItem[],
	currency: string,
	pricesIncludeVat: boolean,
	treatment: VatTreatment = 'standard'
): ChargeTotals {
	if (treatment !== 'reverse-charge') return { ...summariseCharges(items, currency, pricesIncludeVat), vatTreatment: 'standard' };
	const totals = summariseCharges(reverseChargeItems(items, pricesIncludeVat), currency, false);
	return { ...totals, vat: totals.vat.map((g) => ({ ...g, category: 'AE' as const })), vatTreatment: 'reverse-charge' };
}

/**
 * The EN 16931 totals rules this engine promises, checked on a finished set of totals; returns
 * the rules broken (empty when all hold). Cheap enough to run before issuing any document.
 */
export function en16931Violations(totals: ChargeTotals): string[] {
	const broken: string[] = [];
	const amounts = [
		totals.net,
		totals.vatTotal,
		totals.gross,
		totals.rounding,
		totals.total,
		...totals.lines.flatMap((l) => [l.amount, l.net]),
		...totals.vat.flatMap((g) => [g.base, g.amount])
	];
	if (!amounts.every(Number.isSafeInteger)) broken.push('BR-DEC: amounts in whole minor units');
	if (totals.lines.some((l) => l.amount < 0 || (l.unitAmount ?? 0) < 0)) {
		broken.push('BR-27: no negative item price');
	}
	if (totals.net !== sumMinor(totals.lines.map((l) => l.net))) broken.push('BR-CO-10');
	if (totals.net !== sumMinor(totals.vat.map((g) => g.base))) broken.push('BR-CO-13');
	for (const group of totals.vat) {
		const base = sumMinor(totals.lines.filter((l) => l.vatRateBp === group.rateBp).map((l) => l.net));
		if (group.base !== base) broken.push(`BR-S-08 (${group.ratePercent} %)`);
		if (group.amount !== vatOf(group.base, group.rateBp)) broken.push(`BR-CO-17 (${group.ratePercent} %)`);
	}
	if (totals.vatTotal !== sumMinor(totals.vat.map((g) => g.amount))) broken.push('BR-CO-14');
	if (totals.gross !== totals.net + totals.vatTotal) broken.push('BR-CO-15');
	if (totals.total !== totals.gross + totals.rounding) broken.push('BR-CO-16');
	if (totals.pricesIncludeVat && totals.total !== sumMinor(totals.lines.map((l) => l.amount))) {
		broken.push('advertised gross: total = sum of the gross line amounts');
	}
	if (!totals.pricesIncludeVat && totals.rounding !== 0) broken.push('no rounding when prices exclude VAT');
	// BR-AE-01: reverse charge is one VAT group of category AE; BR-AE-05: its lines at 0 %;
	// BR-AE-09: no VAT in it.
	const reverse = totals.vat.filter((g) => g.category === 'AE');
	if (reverse.length > 0 || totals.vatTreatment === 'reverse-charge') {
		if (reverse.length !== 1 || totals.vat.length !== 1) broken.push('BR-AE-01');
		if (totals.lines.some((l) => l.vatRateBp !== 0)) broken.push('BR-AE-05');
		if (reverse.some((g) => g.rateBp !== 0 || g.amount !== 0)) broken.push('BR-AE-09');
	}
	return broken;
}

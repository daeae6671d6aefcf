/**
 * Document totals of invoices, prepayment invoices and credit notes, in integer minor units,
 * following the EN 16931-1 semantic model as checked by the CEN validation artefacts
 * (github.com/ConnectingEurope/eInvoicing-EN16931):
 *
 * - BT-131 line net: the line amount excl. VAT, rounded half-up to minor units (BR-DEC-23);
 *   when amounts are shown incl. VAT, net = amount ÷ (1 + rate) (pricing/vat.ts `lineNet`);
 * - BR-CO-10: BT-106 sum of line nets = Σ BT-131;
 * - BR-CO-13: BT-109 taxable total = BT-106 − BT-107 allowances + BT-108 charges (both 0 here);
 * - BR-CO-17: BT-117 VAT of a rate = BT-116 base × rate ÷ 100, rounded to minor units;
 * - BR-CO-14: BT-110 total VAT = Σ BT-117;
 * - BR-CO-15: BT-112 total with VAT = BT-109 + BT-110;
 * - BR-CO-16: BT-115 amount due = BT-112 − BT-113 paid amount + BT-114 rounding amount;
 * - BR-27: no negative item net price (BT-146); a credit note (UNTDID 1001 code 381) carries
 *   positive amounts: its type says they are credited, no minus signs are needed.
 *
 * The per-line and per-rate arithmetic is the pricing engine's own (`lineNet`, `vatOf`), so a
 * final invoice built from a quote's lines has exactly the quote's nets, VAT and gross.
 * When amounts include VAT, what was advertised (Σ line amounts) may differ from BT-112 by a cent
 * or two: that difference is the explicit rounding amount BT-114, never hidden in a line.
 */
import { basisPointsToPercent, sumMinor } from '../money';
import { lineNet, vatOf } from '../pricing/vat';
import type { PriceLine, VatGroup } from '../pricing/types';
import type { Minor } from '../types';

export interface DocumentLineInput {
	/** Stable within the document: 'room:half-day', 'overtime:room', 'deposit:2550' … */
	key: string;
	/** 'room', 'engineer', 'surcharge', 'gear', 'overtime', 'deposit', 'refund'. */
	kind: string;
	/** Nature of the service, for people (Article 226(6)). */
	description: string;
	/** BT-129 invoiced quantity as decimal text ("1", "2.5"). */
	quantity: string;
	/** BT-130 UN/ECE Recommendation 20 unit: 'HUR' hour, 'C62' one. */
	unitCode: string;
	/** Price of one unit as shown (incl. VAT when `amountsIncludeVat`). */
	unitAmount: Minor;
	/** Line amount as shown (incl. VAT when `amountsIncludeVat`). */
	amount: Minor;
	/** BT-152 VAT rate, basis points (2550 = 25.5 %). */
	vatRateBp: number;
}

export interface DocumentLine extends DocumentLineInput {
	/** BT-131 line net amount. */
	net: Minor;
	/** BT-146 item net price: the unit price excl. VAT (Article 226(8)), rounded to minor units. */
	unitPriceNet: Minor;
}

export interface DocumentTotals {
	currency: string;
	/** true when line amounts are shown incl. VAT (the studio's rate card, or money received). */
	amountsIncludeVat: boolean;
	lines: DocumentLine[];
	/** BT-106 */
	lineNetTotal: Minor;
	/** BT-107 and BT-108: Slateroom puts no allowances or charges at document level. */
	allowances: Minor;
	charges: Minor;
	/** BT-109 */
	taxable: Minor;
	/** BG-23, highest rate first */
	vat: VatGroup[];
	/** BT-110 */
	vatTotal: Minor;
	/** BT-112 */
	gross: Minor;
	/** BT-113 paid amount (a deposit received on account, money already refunded on a credit note) */
	prepaid: Minor;
	/** BT-114 */
	rounding: Minor;
	/** BT-115 */
	amountDue: Minor;
}

export interface TotalsOptions {
	currency: string;
	amountsIncludeVat: boolean;
	/** BT-113; default 0. */
	prepaid?: Minor;
	/** 'AE': a reverse-charged document (../vat-treatment.ts), its lines at 0 % and its one VAT group of category AE. */
	vatCategory?: 'AE';
}

export function documentTotals(inputs: readonly DocumentLineInput[], options: TotalsOptions): DocumentTotals {
	const incl = options.amountsIncludeVat;
	const lines: DocumentLine[] = inputs.map((line) => ({
		...line,
		net: lineNet(line.amount, line.vatRateBp, incl),
		unitPriceNet: lineNet(line.unitAmount, line.vatRateBp, incl)
	}));
	const bases = new Map<number, Minor>();
	for (const line of lines) bases.set(line.vatRateBp, (bases.get(line.vatRateBp) ?? 0) + line.net);
	const vat: VatGroup[] = [...bases.entries()]
		.sort(([a], [b]) => b - a)
		.map(([rateBp, base]) => ({
			ratePercent: basisPointsToPercent(rateBp),
			rateBp,
			base,
			amount: vatOf(base, rateBp),
			...(options.vatCategory ? { category: options.vatCategory } : {})
		}));

	const lineNetTotal = sumMinor(lines.map((l) => l.net)); // BR-CO-10
	const allowances = 0;
	const charges = 0;
	const taxable = lineNetTotal - allowances + charges; // BR-CO-13
	const vatTotal = sumMinor(vat.map((g) => g.amount)); // BR-CO-14
	const gross = taxable + vatTotal; // BR-CO-15
	const advertised = incl ? sumMinor(lines.map((l) => l.amount)) : gross;
	const rounding = advertised - gross; // BT-114
	const prepaid = options.prepaid ?? 0;
	return {
		currency: options.currency,
		amountsIncludeVat: incl,
		lines,
		lineNetTotal,
		allowances,
		charges,
		taxable,
		vat,
		vatTotal,
		gross,
		prepaid,
		rounding,
		amountDue: gross - prepaid + rounding // BR-CO-16
	};
}

/** The document's total as the customer reads it: BT-112 + BT-114 (what a deposit or refund is measured against). */
export function payableTotal(t: Pick<DocumentTotals, 'gross' | 'rounding'>): Minor {
	return t.gross + t.rounding;
}

/**
 * The EN 16931 rules this module promises, checked on finished totals (or on the stored copy of an
 * issued document); returns the rules broken, empty when all hold.
 */
export function documentViolations(t: DocumentTotals): string[] {
	const broken: string[] = [];
	const amounts = [
		t.lineNetTotal,
		t.allowances,
		t.charges,
		t.taxable,
		t.vatTotal,
		t.gross,
		t.prepaid,
		t.rounding,
		t.amountDue,
		...t.lines.flatMap((l) => [l.net, l.amount, l.unitAmount, l.unitPriceNet]),
		...t.vat.flatMap((g) => [g.base, g.amount])
	];
	if (!amounts.every(Number.isSafeInteger)) broken.push('BR-DEC: amounts in whole minor units');
	if (t.lines.length === 0) broken.push('BR-16: at least one invoice line');
	if (t.lines.some((l) => l.unitPriceNet < 0 || l.unitAmount < 0)) broken.push('BR-27: no negative item net price');
	if (t.lines.some((l) => !/^\d+(\.\d+)?$/.test(l.quantity))) broken.push('BT-129: quantity is a non-negative decimal');
	if (t.lineNetTotal !== sumMinor(t.lines.map((l) => l.net))) broken.push('BR-CO-10');
	if (t.taxable !== t.lineNetTotal - t.allowances + t.charges) broken.push('BR-CO-13');
	if (t.taxable !== sumMinor(t.vat.map((g) => g.base))) broken.push('BR-CO-13 (VAT bases cover the taxable total)');
	const rates = new Set(t.lines.map((l) => l.vatRateBp));
	if (rates.size !== t.vat.length || t.vat.some((g) => !rates.has(g.rateBp)))
		broken.push('BR-S-01/BR-CO-18: one VAT group per rate used');
	for (const g of t.vat) {
		const base = sumMinor(t.lines.filter((l) => l.vatRateBp === g.rateBp).map((l) => l.net));
		if (g.base !== base) broken.push(`BR-S-08 (${g.ratePercent} %)`);
		if (g.amount !== vatOf(g.base, g.rateBp)) broken.push(`BR-CO-17 (${g.ratePercent} %)`);
	}
	if (t.vatTotal !== sumMinor(t.vat.map((g) => g.amount))) broken.push('BR-CO-14');
	if (t.gross !== t.taxable + t.vatTotal) broken.push('BR-CO-15');
	if (t.amountDue !== t.gross - t.prepaid + t.rounding) broken.push('BR-CO-16');
	if (t.amountsIncludeVat && t.gross + t.rounding !== sumMinor(t.lines.map((l) => l.amount))) {
		broken.push('advertised total: BT-112 + BT-114 = Σ line amounts incl. VAT');
	}
	if (!t.amountsIncludeVat && t.rounding !== 0) broken.push('no rounding amount when amounts exclude VAT');
	// Reverse charge: BR-AE-01 exactly one VAT group, of category AE, and no other category beside
	// it; BR-AE-05 every line at 0 %; BR-AE-08 its base is the sum of the line nets (BR-S-08 above
	// checks that per rate); BR-AE-09 no VAT in it.
	if (t.vat.some((g) => g.category === 'AE')) {
		if (t.vat.length !== 1) broken.push('BR-AE-01');
		if (t.lines.some((l) => l.vatRateBp !== 0)) broken.push('BR-AE-05');
		if (t.vat.some((g) => g.rateBp !== 0 || g.amount !== 0)) broken.push('BR-AE-09');
	}
	return broken;
}

/** A quote's (or an overtime bill's) priced lines as document lines. */
export function linesFromPriceLines(lines: readonly Omit<PriceLine, 'net'>[]): DocumentLineInput[] {
	return lines.map((l) => {
		const hasUnit = l.quantity !== undefined && l.unitAmount !== undefined;
		return {
			key: l.key,
			kind: l.kind,
			description: l.label,
			quantity: hasUnit ? l.quantity! : '1',
			unitCode: hasUnit ? (l.unitCode ?? 'C62') : 'C62',
			unitAmount: hasUnit ? l.unitAmount! : l.amount,
			amount: l.amount,
			vatRateBp: l.vatRateBp
		};
	});
}

/**
 * Splits an amount across VAT rates in proportion to weights (largest remainder, so the parts
 * always add up to the amount). A deposit or a refund of a booking with one VAT rate is one part.
 */
export function splitByWeights(
	amount: Minor,
	weights: readonly { rateBp: number; weight: Minor }[]
): { rateBp: number; amount: Minor }[] {
	const usable = weights.filter((w) => w.weight > 0);
	if (usable.length === 0) throw new RangeError('nothing to split against');
	const total = sumMinor(usable.map((w) => w.weight));
	const parts = usable.map((w) => {
		const exact = BigInt(amount) * BigInt(w.weight);
		const floor = exact / BigInt(total);
		return { rateBp: w.rateBp, amount: Number(floor), remainder: exact - floor * BigInt(total) };
	});
	let left = amount - sumMinor(parts.map((p) => p.amount));
	for (const part of [...parts].sort((a, b) => (b.remainder > a.remainder ? 1 : b.remainder < a.remainder ? -1 : 0))) {
		if (left <= 0) break;
		part.amount += 1;
		left -= 1;
	}
	return parts.filter((p) => p.amount > 0).map(({ rateBp, amount: a }) => ({ rateBp, amount: a }));
}

/**
 * Lines for money received or returned as a whole (a deposit on account, a refund), one line per
 * VAT rate of the underlying supply, each an amount incl. VAT. Directive 2006/112/EC, Article 65:
 * VAT becomes chargeable on receipt of a payment on account, on the amount received; Article 90:
 * the taxable amount is reduced by what is refunded.
 */
export function lumpSumLines(
	amount: Minor,
	kind: 'deposit' | 'refund',
	description: string,
	grossByRate: readonly { rateBp: number; weight: Minor }[]
): DocumentLineInput[] {
	if (!Number.isSafeInteger(amount) || amount <= 0) throw new RangeError('the amount must be a positive integer');
	const parts = splitByWeights(amount, grossByRate);
	return parts.map((part) => ({
		key: `${kind}:${part.rateBp}`,
		kind,
		description: parts.length > 1 ? `${description} (VAT ${basisPointsToPercent(part.rateBp)} % part)` : description,
		quantity: '1',
		unitCode: 'C62',
		unitAmount: part.amount,
		amount: part.amount,
		vatRateBp: part.rateBp
	}));
}

/** Gross per VAT rate of a set of totals (base + VAT), the weights a deposit or refund is split by. */
export function grossByRate(vat: readonly Pick<VatGroup, 'rateBp' | 'base' | 'amount'>[]): { rateBp: number; weight: Minor }[] {
	return vat.map((g) => ({ rateBp: g.rateBp, weight: g.base + g.amount }));
}

/**
 * A month's VAT by category and rate, across the documents issued in it (what the accountant
 * declares). Reverse-charged supplies (VAT category AE, UNTDID 5305) are a row of their own, apart
 * from anything zero-rated: they are declared differently (Directive 2006/112/EC, Article 262,
 * the recapitulative statement).
 *
 * - a deposit invoice (386) makes VAT chargeable when the payment on account is received
 *   (Directive 2006/112/EC, Article 65): its base and VAT count in full;
 * - a final invoice (380) states the whole supply; the part already taxed on the deposit invoice
 *   it refers to (BT-25) is taken off, so no euro of VAT is declared twice;
 * - a credit note (381) reduces the taxable amount (Article 90): it counts negatively.
 */
import { basisPointsToPercent } from '../money';
import type { Minor } from '../types';
import { DOCUMENT_TYPE } from './numbering';

export interface VatRow {
	rateBp: number;
	base: Minor;
	amount: Minor;
	/** BT-118 when it is not read from the rate: 'AE', reverse charge. */
	category?: 'AE';
}

/** BT-118 VAT category code (UNTDID 5305): 'AE' reverse charge, else 'S' above 0 % and 'Z' at 0 %. */
export type VatCategory = 'S' | 'Z' | 'AE';
export function vatCategoryOf(row: Pick<VatRow, 'rateBp' | 'category'>): VatCategory {
	if (row.category === 'AE') return 'AE';
	return row.rateBp > 0 ? 'S' : 'Z';
}

export interface LedgerDocument {
	typeCode: number;
	vat: readonly VatRow[];
	/** On a final invoice: the VAT breakdown of the deposit invoices it deducts. */
	prepaidVat?: readonly VatRow[];
}

export interface LedgerRow {
	category: VatCategory;
	rateBp: number;
	ratePercent: string;
	/** Taxable amount to declare at this rate (may be negative in a month of credit notes). */
	base: Minor;
	vat: Minor;
}

/** Standard rates first, highest rate first; then zero rated; reverse charge last. */
const CATEGORY_ORDER: Record<VatCategory, number> = { S: 0, Z: 1, AE: 2 };

export function vatLedger(docs: readonly LedgerDocument[]): LedgerRow[] {
	const rows = new Map<string, { category: VatCategory; rateBp: number; base: Minor; vat: Minor }>();
	const add = (g: VatRow, sign: number) => {
		const category = vatCategoryOf(g);
		const key = `${category}:${g.rateBp}`;
		const row = rows.get(key) ?? { category, rateBp: g.rateBp, base: 0, vat: 0 };
		row.base += sign * g.base;
		row.vat += sign * g.amount;
		rows.set(key, row);
	};
	for (const doc of docs) {
		const sign = doc.typeCode === DOCUMENT_TYPE.creditNote ? -1 : 1;
		for (const g of doc.vat) add(g, sign);
		if (doc.typeCode === DOCUMENT_TYPE.invoice) {
			for (const g of doc.prepaidVat ?? []) add(g, -1);
		}
	}
	return [...rows.values()]
		.sort((a, b) => CATEGORY_ORDER[a.category] - CATEGORY_ORDER[b.category] || b.rateBp - a.rateBp)
		.map((r) => ({
			category: r.category,
			rateBp: r.rateBp,
			ratePercent: basisPointsToPercent(r.rateBp),
			base: r.base,
			vat: r.vat
		}));
}

/**
 * A month's VAT by rate, across the documents issued in it (what the accountant declares).
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
}

export interface LedgerDocument {
	typeCode: number;
	vat: readonly VatRow[];
	/** On a final invoice: the VAT breakdown of the deposit invoices it deducts. */
	prepaidVat?: readonly VatRow[];
}

export interface LedgerRow {
	rateBp: number;
	ratePercent: string;
	/** Taxable amount to declare at this rate (may be negative in a month of credit notes). */
	base: Minor;
	vat: Minor;
}

export function vatLedger(docs: readonly LedgerDocument[]): LedgerRow[] {
	const rows = new Map<number, { base: Minor; vat: Minor }>();
	const add = (rateBp: number, base: Minor, vat: Minor) => {
		const row = rows.get(rateBp) ?? { base: 0, vat: 0 };
		row.base += base;
		row.vat += vat;
		rows.set(rateBp, row);
	};
	for (const doc of docs) {
		const sign = doc.typeCode === DOCUMENT_TYPE.creditNote ? -1 : 1;
		for (const g of doc.vat) add(g.rateBp, sign * g.base, sign * g.amount);
		if (doc.typeCode === DOCUMENT_TYPE.invoice) {
			for (const g of doc.prepaidVat ?? []) add(g.rateBp, -g.base, -g.amount);
		}
	}
	return [...rows.entries()]
		.sort(([a], [b]) => b - a)
		.map(([rateBp, r]) => ({ rateBp, ratePercent: basisPointsToPercent(rateBp), base: r.base, vat: r.vat }));
}

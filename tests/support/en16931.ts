// EN 16931-1 business rules, checked on a UBL document parsed back with fast-xml-parser: the
// mandatory terms BR-01 to BR-27, the totals BR-CO-10 to BR-CO-17, BR-S-02 and the BR-DEC limit of
// two decimals (rules as published with the CEN validation artefacts, ConnectingEurope/
// eInvoicing-EN16931). Sums and the rate multiplication in decimal.js (ROUND_HALF_UP).
import { XMLParser } from 'fast-xml-parser';
import Decimal from 'decimal.js';
import currencyCodes from 'currency-codes';

export const CUSTOMIZATION_ID = 'urn:cen.eu:en16931:2017';

export const parser = new XMLParser({
	ignoreAttributes: false,
	removeNSPrefix: true,
	parseTagValue: false,
	isArray: (name) => ['TaxSubtotal', 'InvoiceLine', 'CreditNoteLine'].includes(name)
});
export type Node = Record<string, unknown>;
export const text = (v: unknown): string => (typeof v === 'object' && v !== null ? String((v as Node)['#text']) : String(v));
const dec = (v: unknown) => new Decimal(text(v));

/** The EN 16931 rules this project promises, on a parsed document; returns the broken ones. */
export function brokenRules(xml: string): string[] {
	const parsed = parser.parse(xml) as Node;
	const doc = (parsed.Invoice ?? parsed.CreditNote) as Node;
	const broken: string[] = [];
	const need = (rule: string, ok: unknown) => {
		if (!ok) broken.push(rule);
	};
	need('BR-01', doc.CustomizationID === CUSTOMIZATION_ID);
	need('BR-02', doc.ID);
	need('BR-03', /^\d{4}-\d{2}-\d{2}$/.test(String(doc.IssueDate)));
	need('BR-04', doc.InvoiceTypeCode ?? doc.CreditNoteTypeCode);
	need('BR-05', doc.DocumentCurrencyCode);
	const seller = (doc.AccountingSupplierParty as Node).Party as Node;
	const buyer = (doc.AccountingCustomerParty as Node).Party as Node;
	need('BR-06', (seller.PartyLegalEntity as Node).RegistrationName);
	need('BR-07', (buyer.PartyLegalEntity as Node).RegistrationName);
	need('BR-09', ((seller.PostalAddress as Node).Country as Node).IdentificationCode);
	need('BR-11', ((buyer.PostalAddress as Node).Country as Node).IdentificationCode);
	const lines = ((doc.InvoiceLine ?? doc.CreditNoteLine) as Node[] | undefined) ?? [];
	need('BR-16', lines.length > 0);
	for (const l of lines) {
		need('BR-21', l.ID);
		const qty = (l.InvoicedQuantity ?? l.CreditedQuantity) as Node;
		need('BR-22', qty);
		need('BR-23', qty?.['@_unitCode']);
		need('BR-24', l.LineExtensionAmount !== undefined);
		need('BR-25', (l.Item as Node).Name);
		need('BR-26', (l.Price as Node).PriceAmount !== undefined);
		need('BR-27', dec((l.Price as Node).PriceAmount).gte(0));
	}
	const totals = doc.LegalMonetaryTotal as Node;
	const taxTotal = doc.TaxTotal as Node;
	const subtotals = taxTotal.TaxSubtotal as Node[];
	const lineSum = lines.reduce((s, l) => s.plus(dec(l.LineExtensionAmount)), new Decimal(0));
	need('BR-CO-10', lineSum.eq(dec(totals.LineExtensionAmount)));
	need('BR-CO-13', dec(totals.TaxExclusiveAmount).eq(dec(totals.LineExtensionAmount)));
	need('BR-CO-14', subtotals.reduce((s, g) => s.plus(dec(g.TaxAmount)), new Decimal(0)).eq(dec(taxTotal.TaxAmount)));
	need('BR-CO-15', dec(totals.TaxInclusiveAmount).eq(dec(totals.TaxExclusiveAmount).plus(dec(taxTotal.TaxAmount))));
	const prepaid = totals.PrepaidAmount === undefined ? new Decimal(0) : dec(totals.PrepaidAmount);
	const rounding = totals.PayableRoundingAmount === undefined ? new Decimal(0) : dec(totals.PayableRoundingAmount);
	need('BR-CO-16', dec(totals.PayableAmount).eq(dec(totals.TaxInclusiveAmount).minus(prepaid).plus(rounding)));
	// BR-CO-17 rounds to 2 decimals; a currency with fewer minor digits (ISO 4217: JPY 0) can only
	// carry whole units, so there the rounding is to its own digits (our reading of the rule).
	const digits = Math.min(2, currencyCodes.code(String(doc.DocumentCurrencyCode))!.digits);
	for (const g of subtotals) {
		const rate = dec((g.TaxCategory as Node).Percent);
		need(
			'BR-CO-17',
			dec(g.TaxAmount).eq(dec(g.TaxableAmount).times(rate).dividedBy(100).toDecimalPlaces(digits, Decimal.ROUND_HALF_UP))
		);
		if (text((g.TaxCategory as Node).ID) === 'S') need('BR-S-02', (seller.PartyTaxScheme as Node | undefined)?.CompanyID);
	}
	for (const m of xml.matchAll(/currencyID="[A-Z]{3}">(-?[\d.]+)</g)) need('BR-DEC', /^-?\d+(\.\d{1,2})?$/.test(m[1]!));
	return broken;
}

// EN 16931-1 business rules, checked on a UBL document parsed back with fast-xml-parser: the
// mandatory terms BR-01 to BR-27, the buyer's (BR-07, BR-10, BR-11), the VAT identifier prefix
// BR-CO-09, the totals BR-CO-10 to BR-CO-17, BR-S-02, reverse charge BR-AE-01 to BR-AE-10 and the
// BR-DEC limit of two decimals (rules as published with the CEN validation artefacts,
// ConnectingEurope/eInvoicing-EN16931). Sums and the rate multiplication in decimal.js
// (ROUND_HALF_UP). Each rule is said in our own words beside its check.
import { XMLParser } from 'fast-xml-parser';
import Decimal from 'decimal.js';
import currencyCodes from 'currency-codes';
import { getCountry } from 'countries-and-timezones';

export const CUSTOMIZATION_ID = 'urn:cen.eu:en16931:2017';

export const parser = new XMLParser({
	ignoreAttributes: false,
	removeNSPrefix: true,
	parseTagValue: false,
	isArray: (name) => ['TaxSubtotal', 'InvoiceLine', 'CreditNoteLine', 'AllowanceCharge'].includes(name)
});
export type Node = Record<string, unknown>;
export const text = (v: unknown): string => (typeof v === 'object' && v !== null ? String((v as Node)['#text']) : String(v));
const dec = (v: unknown) => new Decimal(text(v));
const sum = (values: unknown[]) => values.reduce<Decimal>((s, v) => s.plus(dec(v)), new Decimal(0));

/** BT-31 / BT-48: a party's VAT identifier, PartyTaxScheme/CompanyID under the VAT scheme. */
function vatIdOf(party: Node): string | undefined {
	const scheme = party.PartyTaxScheme as Node | undefined;
	if (!scheme || text((scheme.TaxScheme as Node | undefined)?.ID) !== 'VAT') return undefined;
	return scheme.CompanyID === undefined ? undefined : text(scheme.CompanyID);
}

/**
 * BR-CO-09's prefix: an ISO 3166-1 alpha-2 code (countries-and-timezones knows them all), or EL,
 * the prefix Greece uses, or XI, Northern Ireland's (both allowed by the CEN artefacts' list).
 */
const vatPrefixOk = (id: string) =>
	/^[A-Z]{2}/.test(id) && (['EL', 'XI'].includes(id.slice(0, 2)) || !!getCountry(id.slice(0, 2)));

/**
 * Rules EN 16931 states that Slateroom knowingly leaves open on some documents, found separately
 * so a test can say exactly which it expects: BR-10 (every invoice has a buyer postal address) on a
 * document whose buyer gave no address, where we print none rather than invent one.
 */
export function knownGaps(xml: string): string[] {
	const parsed = parser.parse(xml) as Node;
	const doc = (parsed.Invoice ?? parsed.CreditNote) as Node;
	const buyer = (doc.AccountingCustomerParty as Node).Party as Node;
	return buyer.PostalAddress === undefined ? ['BR-10'] : [];
}

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
	// BR-07: the buyer is named (BT-44), not left blank.
	need('BR-07', text((buyer.PartyLegalEntity as Node | undefined)?.RegistrationName ?? '').trim());
	need('BR-08', seller.PostalAddress);
	need('BR-09', ((seller.PostalAddress as Node | undefined)?.Country as Node | undefined)?.IdentificationCode);
	// BR-10, when the buyer gave an address: the address the document gives is a real one (some part
	// of it filled in). A buyer with no address at all is knownGaps(), not a broken rule here.
	const buyerAddress = buyer.PostalAddress as Node | undefined;
	if (buyerAddress !== undefined) {
		need(
			'BR-10',
			['StreetName', 'CityName', 'PostalZone', 'Country'].some((k) => buyerAddress[k] !== undefined)
		);
		// BR-11: an address of the buyer names its country (BT-55), a two-letter ISO 3166-1 code.
		const country = (buyerAddress.Country as Node | undefined)?.IdentificationCode;
		need('BR-11', country !== undefined && /^[A-Z]{2}$/.test(text(country)));
	}
	// BR-CO-09: a seller's or buyer's VAT identifier starts with the two letters of the state that
	// issued it.
	const sellerVat = vatIdOf(seller);
	const buyerVat = vatIdOf(buyer);
	for (const id of [sellerVat, buyerVat]) if (id !== undefined) need('BR-CO-09', vatPrefixOk(id));
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

	// Reverse charge (VAT category AE).
	const categoryOf = (n: Node | undefined) => text(n?.ID ?? '');
	const aeLines = lines.filter((l) => categoryOf((l.Item as Node).ClassifiedTaxCategory as Node) === 'AE');
	const allowances = ((doc.AllowanceCharge as Node[] | undefined) ?? []).filter(
		(a) => categoryOf(a.TaxCategory as Node) === 'AE'
	);
	const aeAllowances = allowances.filter((a) => text(a.ChargeIndicator) === 'false');
	const aeCharges = allowances.filter((a) => text(a.ChargeIndicator) === 'true');
	const aeGroups = subtotals.filter((g) => categoryOf(g.TaxCategory as Node) === 'AE');
	// Both parties identified for tax: the seller by VAT ID (BT-31, or BT-32/BT-63 if it had them),
	// the buyer by VAT ID (BT-48) or legal registration (BT-47).
	const buyerIdentified = buyerVat !== undefined || (buyer.PartyLegalEntity as Node | undefined)?.CompanyID !== undefined;
	const bothIdentified = sellerVat !== undefined && buyerIdentified;
	// BR-AE-01: a line, allowance or charge under reverse charge means exactly one AE group in the VAT breakdown.
	if (aeLines.length || allowances.length) need('BR-AE-01', aeGroups.length === 1);
	// BR-AE-02: reverse-charged lines need both parties' tax identifiers.
	if (aeLines.length) need('BR-AE-02', bothIdentified);
	// BR-AE-03 and BR-AE-04: so do a reverse-charged document allowance and charge.
	if (aeAllowances.length) need('BR-AE-03', bothIdentified);
	if (aeCharges.length) need('BR-AE-04', bothIdentified);
	// BR-AE-05: a reverse-charged line carries a 0 % rate.
	for (const l of aeLines) need('BR-AE-05', dec(((l.Item as Node).ClassifiedTaxCategory as Node).Percent).eq(0));
	// BR-AE-06 and BR-AE-07: so do a reverse-charged allowance and charge.
	for (const a of aeAllowances) need('BR-AE-06', dec((a.TaxCategory as Node).Percent).eq(0));
	for (const a of aeCharges) need('BR-AE-07', dec((a.TaxCategory as Node).Percent).eq(0));
	for (const g of aeGroups) {
		// BR-AE-08: the AE group's base is its lines' nets, less its allowances, plus its charges.
		const base = sum(aeLines.map((l) => l.LineExtensionAmount))
			.minus(sum(aeAllowances.map((a) => a.Amount)))
			.plus(sum(aeCharges.map((a) => a.Amount)));
		need('BR-AE-08', dec(g.TaxableAmount).eq(base));
		// BR-AE-09: and no VAT is in it.
		need('BR-AE-09', dec(g.TaxAmount).eq(0));
		// BR-AE-10: it says why, by the code VATEX-EU-AE or the words "Reverse charge".
		const cat = g.TaxCategory as Node;
		need(
			'BR-AE-10',
			(cat.TaxExemptionReasonCode !== undefined && text(cat.TaxExemptionReasonCode) === 'VATEX-EU-AE') ||
				(cat.TaxExemptionReason !== undefined && /^reverse charge$/i.test(text(cat.TaxExemptionReason).trim()))
		);
	}

	for (const m of xml.matchAll(/currencyID="[A-Z]{3}">(-?[\d.]+)</g)) need('BR-DEC', /^-?\d+(\.\d{1,2})?$/.test(m[1]!));
	return broken;
}

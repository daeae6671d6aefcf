// A document as an EN 16931 e-invoice in the UBL 2.1 syntax (ISO/IEC 19845:2015): an Invoice for
// the final invoice (UNTDID 1001 code 380) and the deposit invoice (386, a prepayment invoice), a
// CreditNote for the credit note (381). Business terms (BT-n) are named beside the elements; the
// element order is UBL 2.1's. Amounts are the document's as issued, in its currency's minor unit
// written with two decimals (BR-DEC rules), so BR-CO-10 to BR-CO-17 hold here because they held
// when the document was issued ($lib/domain/invoice/totals.ts).
//
// The buyer (BG-7) is the document's own copy of it: name (BT-44), postal address (BG-8: BT-50
// street, BT-52 city, BT-53 postal code, BT-55 country) and VAT identifier (BT-48) when the artist
// gave billing details. A document whose buyer has no address (issued before billing details
// existed, or for an artist who gave none) carries no BG-8: no country is made up for it, the
// studio's least of all. That leaves EN 16931's BR-10 unmet for those documents, knowingly: we
// print what the buyer told us and nothing else.
//
// Reverse charge (VAT category AE, $lib/domain/vat-treatment.ts): lines and the VAT breakdown
// carry category AE at 0 %; the breakdown also carries the exemption reason code VATEX-EU-AE
// (BT-121) and the text "Reverse charge" (BT-120), which EN 16931 has only at breakdown level.
import { create } from 'xmlbuilder2';
import type { XMLBuilder } from 'xmlbuilder2/lib/interfaces';
import { toDecimalString } from '$lib/domain/money';
import { localDateOf } from '$lib/domain/time';
import { DOCUMENT_TYPE } from '$lib/domain/invoice/numbering';
import { vatCategoryOf } from '$lib/domain/invoice/ledger';
import { REVERSE_CHARGE_REASON_CODE, REVERSE_CHARGE_WORDS } from '$lib/domain/vat-treatment';
import type { InvoiceLineRow, InvoiceRow, Party } from './issue';

const NS = {
	invoice: 'urn:oasis:names:specification:ubl:schema:xsd:Invoice-2',
	creditNote: 'urn:oasis:names:specification:ubl:schema:xsd:CreditNote-2',
	cac: 'urn:oasis:names:specification:ubl:schema:xsd:CommonAggregateComponents-2',
	cbc: 'urn:oasis:names:specification:ubl:schema:xsd:CommonBasicComponents-2'
};
/** BT-24: the specification the document follows, the core of EN 16931-1. */
export const CUSTOMIZATION_ID = 'urn:cen.eu:en16931:2017';

export interface UblInput {
	invoice: InvoiceRow;
	lines: InvoiceLineRow[];
	preceding: { number: string; issuedAt: Date } | null;
	timeZone: string;
}

const percent = (rateBp: number) => (rateBp / 100).toFixed(2).replace(/\.?0+$/, '');

/** Whether a party's copy holds any part of a postal address. */
const hasAddress = (p: Party) =>
	p.street !== undefined || p.postalCode !== undefined || p.city !== undefined || !!p.addressLines?.length || !!p.country;

function party(node: XMLBuilder, p: Party) {
	const partyNode = node.ele('cac:Party');
	if (p.email) partyNode.ele('cbc:EndpointID', { schemeID: 'EM' }).txt(p.email);
	if (hasAddress(p)) {
		const address = partyNode.ele('cac:PostalAddress');
		if (p.street !== undefined || p.postalCode !== undefined || p.city !== undefined) {
			if (p.street) address.ele('cbc:StreetName').txt(p.street); // BT-35 / BT-50
			if (p.city) address.ele('cbc:CityName').txt(p.city); // BT-37 / BT-52
			if (p.postalCode) address.ele('cbc:PostalZone').txt(p.postalCode); // BT-38 / BT-53
		} else {
			// A document issued before the address had its own fields: its lines as they were printed.
			const [street, ...rest] = p.addressLines ?? [];
			if (street) address.ele('cbc:StreetName').txt(street); // BT-35 / BT-50
			if (rest.length) address.ele('cbc:AdditionalStreetName').txt(rest.join(', ')); // BT-36 / BT-51
		}
		if (p.country) address.ele('cac:Country').ele('cbc:IdentificationCode').txt(p.country); // BT-40 / BT-55
	}
	if (p.vatId) {
		const tax = partyNode.ele('cac:PartyTaxScheme');
		tax.ele('cbc:CompanyID').txt(p.vatId); // BT-31 / BT-48
		tax.ele('cac:TaxScheme').ele('cbc:ID').txt('VAT');
	}
	partyNode.ele('cac:PartyLegalEntity').ele('cbc:RegistrationName').txt(p.name); // BT-27 / BT-44
}

export function documentAsUbl({ invoice: d, lines, preceding, timeZone }: UblInput): string {
	const credit = d.typeCode === DOCUMENT_TYPE.creditNote;
	const money = (minor: number) => toDecimalString(minor, d.currency);
	const amount = (node: XMLBuilder, name: string, minor: number) => node.ele(name, { currencyID: d.currency }).txt(money(minor));
	const supplier = d.supplier as Party;
	const customer = d.customer as Party;

	const root = create({ version: '1.0', encoding: 'UTF-8' }).ele(
		credit ? NS.creditNote : NS.invoice,
		credit ? 'CreditNote' : 'Invoice',
		{
			'xmlns:cac': NS.cac,
			'xmlns:cbc': NS.cbc
		}
	);
	root.ele('cbc:CustomizationID').txt(CUSTOMIZATION_ID); // BT-24
	root.ele('cbc:ID').txt(d.displayNumber); // BT-1
	root.ele('cbc:IssueDate').txt(localDateOf(d.issuedAt, timeZone)); // BT-2
	root.ele(credit ? 'cbc:CreditNoteTypeCode' : 'cbc:InvoiceTypeCode').txt(String(d.typeCode)); // BT-3
	if (d.note) root.ele('cbc:Note').txt(d.note); // BT-22
	root.ele('cbc:DocumentCurrencyCode').txt(d.currency); // BT-5
	if (preceding) {
		// BT-25 and BT-26: the invoice a credit note corrects, or the deposit invoice a final invoice deducts.
		const ref = root.ele('cac:BillingReference').ele('cac:InvoiceDocumentReference');
		ref.ele('cbc:ID').txt(preceding.number);
		ref.ele('cbc:IssueDate').txt(localDateOf(preceding.issuedAt, timeZone));
	}
	party(root.ele('cac:AccountingSupplierParty'), supplier);
	party(root.ele('cac:AccountingCustomerParty'), customer);
	if (d.supplyDate) root.ele('cac:Delivery').ele('cbc:ActualDeliveryDate').txt(String(d.supplyDate)); // BT-72

	// BT-118 and BT-151: a line's category is its rate's in the document's VAT breakdown.
	const categoryByRate = new Map(d.vatBreakdown.map((g) => [g.rateBp, vatCategoryOf(g)]));
	const category = (rateBp: number) => categoryByRate.get(rateBp) ?? vatCategoryOf({ rateBp });

	const taxTotal = root.ele('cac:TaxTotal');
	amount(taxTotal, 'cbc:TaxAmount', d.vatTotal); // BT-110
	for (const g of d.vatBreakdown) {
		const sub = taxTotal.ele('cac:TaxSubtotal');
		amount(sub, 'cbc:TaxableAmount', g.base); // BT-116
		amount(sub, 'cbc:TaxAmount', g.amount); // BT-117
		const cat = sub.ele('cac:TaxCategory');
		const code = vatCategoryOf(g);
		cat.ele('cbc:ID').txt(code); // BT-118
		cat.ele('cbc:Percent').txt(percent(g.rateBp)); // BT-119
		if (code === 'AE') {
			cat.ele('cbc:TaxExemptionReasonCode').txt(REVERSE_CHARGE_REASON_CODE); // BT-121
			cat.ele('cbc:TaxExemptionReason').txt(REVERSE_CHARGE_WORDS); // BT-120
		}
		cat.ele('cac:TaxScheme').ele('cbc:ID').txt('VAT');
	}

	const totals = root.ele('cac:LegalMonetaryTotal');
	amount(totals, 'cbc:LineExtensionAmount', d.lineNetTotal); // BT-106
	amount(totals, 'cbc:TaxExclusiveAmount', d.net); // BT-109
	amount(totals, 'cbc:TaxInclusiveAmount', d.gross); // BT-112
	if (d.prepaid) amount(totals, 'cbc:PrepaidAmount', d.prepaid); // BT-113
	if (d.rounding) amount(totals, 'cbc:PayableRoundingAmount', d.rounding); // BT-114
	amount(totals, 'cbc:PayableAmount', d.amountDue); // BT-115

	for (const l of [...lines].sort((a, b) => a.position - b.position)) {
		const line = root.ele(credit ? 'cac:CreditNoteLine' : 'cac:InvoiceLine');
		line.ele('cbc:ID').txt(String(l.position)); // BT-126
		line.ele(credit ? 'cbc:CreditedQuantity' : 'cbc:InvoicedQuantity', { unitCode: l.unitCode }).txt(l.quantity); // BT-129, BT-130
		amount(line, 'cbc:LineExtensionAmount', l.net); // BT-131
		const item = line.ele('cac:Item');
		item.ele('cbc:Name').txt(l.description); // BT-153
		const cat = item.ele('cac:ClassifiedTaxCategory');
		cat.ele('cbc:ID').txt(category(l.vatRateBp)); // BT-151
		cat.ele('cbc:Percent').txt(percent(l.vatRateBp)); // BT-152
		cat.ele('cac:TaxScheme').ele('cbc:ID').txt('VAT');
		amount(line.ele('cac:Price'), 'cbc:PriceAmount', l.unitPriceNet); // BT-146
	}
	return root.end({ prettyPrint: true });
}

// The UBL e-invoice checked, after parsing it back with fast-xml-parser, against EN 16931-1's
// business rules as published with the CEN validation artefacts (ConnectingEurope/eInvoicing-
// EN16931): the mandatory terms BR-01 to BR-26, the buyer's BR-07/10/11, BR-CO-09, the totals
// BR-CO-10 to BR-CO-17, BR-S-02, reverse charge BR-AE-01 to BR-AE-10 and the BR-DEC limits of two
// decimals; sums and the rate multiplication in decimal.js (ROUND_HALF_UP).
import { describe, expect, it } from 'vitest';
import { brokenRules, knownGaps, parser, text, type Node } from '../../../../tests/support/en16931';
import { documentTotals, type DocumentLineInput } from '$lib/domain/invoice/totals';
import { documentAsUbl } from './ubl';
import type { InvoiceLineRow, InvoiceRow, Party } from './issue';

const supplier = {
	name: 'Hollow Pine Studio',
	street: 'Kuusikkotie 14',
	postalCode: '33980',
	city: 'Pirkkala',
	country: 'FI',
	vatId: 'FI00000000',
	email: 'hello@hollowpine.test'
};
const customer = { name: 'Noa Virta (The Lantern Static)', email: 'artist@slateroom.test' };

/** An invented organisation in Germany with an invented VAT ID whose check digit is valid. */
const organisation = {
	name: 'Nachtfalter Tonträger GmbH',
	street: 'Lindenhof 7',
	postalCode: '50667',
	city: 'Köln',
	country: 'DE',
	vatId: 'DE294817367',
	email: 'artist@slateroom.test'
};

function document(
	typeCode: 380 | 381 | 386,
	inputs: DocumentLineInput[],
	opts: { incl?: boolean; prepaid?: number; currency?: string; buyer?: Party; reverseCharge?: boolean } = {}
) {
	const t = documentTotals(inputs, {
		currency: opts.currency ?? 'EUR',
		amountsIncludeVat: opts.incl ?? true,
		prepaid: opts.prepaid,
		vatCategory: opts.reverseCharge ? 'AE' : undefined
	});
	const id = '0e0c7f43-2f7a-4b9e-8d55-1f2a3b4c5d6e';
	const studioId = 'a3c1e2f0-5d4b-4c3a-9e8f-7a6b5c4d3e2f';
	const invoice = {
		id,
		studioId,
		series: typeCode === 381 ? 'CRN' : typeCode === 386 ? 'DEP' : 'INV',
		year: 2027,
		number: 7,
		displayNumber: `${typeCode === 381 ? 'CRN' : typeCode === 386 ? 'DEP' : 'INV'}-2027-0007`,
		typeCode,
		bookingId: null,
		precedingInvoiceId: null,
		issuedAt: new Date('2027-03-27T22:30:00Z'), // 28 March 00:30 in Helsinki: the local date is the issue date
		supplyDate: '2027-03-28',
		supplier,
		customer: opts.buyer ?? customer,
		currency: t.currency,
		net: t.taxable,
		vatTotal: t.vatTotal,
		gross: t.gross,
		prepaid: t.prepaid,
		rounding: t.rounding,
		amountsIncludeVat: t.amountsIncludeVat,
		amountDue: t.amountDue,
		vatBreakdown: t.vat.map((g) => ({
			rateBp: g.rateBp,
			base: g.base,
			amount: g.amount,
			...(g.category ? { category: g.category } : {})
		})),
		prepaidVatBreakdown: [],
		lineNetTotal: t.lineNetTotal,
		sourceKey: null,
		paymentId: null,
		refundId: null,
		note: '',
		createdAt: new Date()
	} satisfies InvoiceRow;
	const lines: InvoiceLineRow[] = t.lines.map((l, i) => ({
		id: i + 1,
		studioId,
		invoiceId: id,
		position: i + 1,
		description: l.description,
		quantity: l.quantity,
		unitCode: l.unitCode,
		unitPriceNet: l.unitPriceNet,
		net: l.net,
		vatRateBp: l.vatRateBp,
		kind: l.kind,
		unitAmount: l.unitAmount,
		amount: l.amount
	}));
	return { invoice, lines };
}

const line = (description: string, amount: number, vatRateBp = 2550, quantity = '1', unitCode = 'C62'): DocumentLineInput => ({
	key: description,
	kind: 'room',
	description,
	quantity,
	unitCode,
	unitAmount: amount,
	amount,
	vatRateBp
});

describe('UBL e-invoices (EN 16931)', () => {
	it('writes a final invoice whose totals and mandatory terms hold, with the local issue date', () => {
		const d = document(380, [line('Live room, half day (4 h)', 16000), line('Engineer, half day (4 h)', 12000)], {
			prepaid: 8400
		});
		const xml = documentAsUbl({
			...d,
			preceding: { number: 'DEP-2027-0003', issuedAt: new Date('2027-03-01T10:00:00Z') },
			timeZone: 'Europe/Helsinki'
		});
		expect(brokenRules(xml)).toEqual([]);
		const doc = (parser.parse(xml) as Node).Invoice as Node;
		expect(doc.IssueDate).toBe('2027-03-28');
		expect(String(doc.InvoiceTypeCode)).toBe('380');
		expect(((doc.BillingReference as Node).InvoiceDocumentReference as Node).ID).toBe('DEP-2027-0003');
		// 280.00 incl. 25.5 % VAT: net 223.11, VAT 56.89, less the 84.00 deposit: 196.00 due.
		expect(text((doc.LegalMonetaryTotal as Node).PayableAmount)).toBe('196.00');
		expect(text((doc.TaxTotal as Node).TaxAmount)).toBe('56.89');
		expect(xml).toContain('xmlns="urn:oasis:names:specification:ubl:schema:xsd:Invoice-2"');
	});

	it('writes the seller’s street, city and postal code as their own terms (BT-35, BT-37, BT-38), and a document issued before them with its lines', () => {
		const d = document(380, [line('Mixing', 18323, 600)], { incl: false });
		const xml = documentAsUbl({ ...d, preceding: null, timeZone: 'Europe/Helsinki' });
		expect(brokenRules(xml)).toEqual([]);
		const seller = (((parser.parse(xml) as Node).Invoice as Node).AccountingSupplierParty as Node).Party as Node;
		const address = seller.PostalAddress as Node;
		expect(address.StreetName).toBe('Kuusikkotie 14');
		expect(address.CityName).toBe('Pirkkala');
		expect(String(address.PostalZone)).toBe('33980');
		// UBL 2.1's AddressType order: StreetName, CityName, PostalZone, Country.
		expect(xml.indexOf('<cbc:CityName>')).toBeLessThan(xml.indexOf('<cbc:PostalZone>'));

		const before = {
			...d,
			invoice: {
				...d.invoice,
				supplier: {
					...supplier,
					street: undefined,
					postalCode: undefined,
					city: undefined,
					addressLines: ['Kuusikkotie 14', '33980 Pirkkala']
				}
			}
		};
		const oldXml = documentAsUbl({ ...before, preceding: null, timeZone: 'Europe/Helsinki' });
		expect(brokenRules(oldXml)).toEqual([]);
		const oldAddress = ((((parser.parse(oldXml) as Node).Invoice as Node).AccountingSupplierParty as Node).Party as Node)
			.PostalAddress as Node;
		expect(oldAddress.StreetName).toBe('Kuusikkotie 14');
		expect(oldAddress.AdditionalStreetName).toBe('33980 Pirkkala');
	});

	it('carries the EN 16931 worked figure: base 183.23 at 6 % gives VAT 10.99 (BR-CO-17)', () => {
		const d = document(380, [line('Mixing', 18323, 600)], { incl: false });
		const xml = documentAsUbl({ ...d, preceding: null, timeZone: 'Europe/Helsinki' });
		expect(brokenRules(xml)).toEqual([]);
		const sub = ((((parser.parse(xml) as Node).Invoice as Node).TaxTotal as Node).TaxSubtotal as Node[])[0]!;
		expect(text(sub.TaxableAmount)).toBe('183.23');
		expect(text(sub.TaxAmount)).toBe('10.99');
		expect(String((sub.TaxCategory as Node).Percent)).toBe('6');
	});

	it('writes a deposit invoice as a prepayment invoice (386) with nothing left to pay, and a credit note as a CreditNote (381)', () => {
		const deposit = document(386, [line('Deposit on account for Live room', 8400)], { prepaid: 8400 });
		const depositXml = documentAsUbl({ ...deposit, preceding: null, timeZone: 'Europe/Helsinki' });
		expect(brokenRules(depositXml)).toEqual([]);
		expect(String(((parser.parse(depositXml) as Node).Invoice as Node).InvoiceTypeCode)).toBe('386');
		expect(depositXml).toMatch(/<cbc:PayableAmount currencyID="EUR">0.00<\/cbc:PayableAmount>/);

		const credit = document(381, [line('Refund of the deposit', 8400)], { prepaid: 8400 });
		const creditXml = documentAsUbl({
			...credit,
			preceding: { number: 'DEP-2027-0003', issuedAt: new Date('2027-03-01T10:00:00Z') },
			timeZone: 'Europe/Helsinki'
		});
		expect(brokenRules(creditXml)).toEqual([]);
		const doc = (parser.parse(creditXml) as Node).CreditNote as Node;
		expect(String(doc.CreditNoteTypeCode)).toBe('381');
		expect((doc.CreditNoteLine as Node[]).length).toBe(1);
	});

	it('writes a zero-decimal currency without decimals (ISO 4217: JPY 0)', () => {
		const d = document(380, [line('Room', 12000)], { currency: 'JPY' });
		const xml = documentAsUbl({ ...d, preceding: null, timeZone: 'Asia/Tokyo' });
		expect(brokenRules(xml)).toEqual([]);
		expect(xml).toMatch(/<cbc:PayableAmount currencyID="JPY">\d+<\/cbc:PayableAmount>/);
	});

	it('finds a broken total (the checker itself can fail)', () => {
		const d = document(380, [line('Room', 16000)]);
		const xml = documentAsUbl({ ...d, preceding: null, timeZone: 'Europe/Helsinki' }).replace(
			/<cbc:PayableAmount currencyID="EUR">[\d.]+</,
			'<cbc:PayableAmount currencyID="EUR">1.00<'
		);
		expect(brokenRules(xml)).toContain('BR-CO-16');
	});
});

const ublOf = (d: ReturnType<typeof document>, preceding: { number: string; issuedAt: Date } | null = null) =>
	documentAsUbl({ ...d, preceding, timeZone: 'Europe/Helsinki' });
const buyerOf = (xml: string) => {
	const parsed = parser.parse(xml) as Node;
	return (((parsed.Invoice ?? parsed.CreditNote) as Node).AccountingCustomerParty as Node).Party as Node;
};

describe('the buyer in UBL (EN 16931 BG-7, BG-8, BT-48)', () => {
	it('names an organisation with its address, its own country and its VAT ID, on an invoice and a credit note', () => {
		for (const typeCode of [380, 381] as const) {
			const xml = ublOf(document(typeCode, [line('Live room, half day (4 h)', 16000)], { buyer: organisation }));
			expect(brokenRules(xml)).toEqual([]);
			expect(knownGaps(xml)).toEqual([]);
			const buyer = buyerOf(xml);
			expect((buyer.PartyLegalEntity as Node).RegistrationName).toBe('Nachtfalter Tonträger GmbH'); // BT-44
			const address = buyer.PostalAddress as Node;
			expect([address.StreetName, address.CityName, String(address.PostalZone)]).toEqual(['Lindenhof 7', 'Köln', '50667']); // BT-50, 52, 53
			expect((address.Country as Node).IdentificationCode).toBe('DE'); // BT-55: the buyer's, not the studio's FI
			const tax = buyer.PartyTaxScheme as Node;
			expect([tax.CompanyID, (tax.TaxScheme as Node).ID]).toEqual(['DE294817367', 'VAT']); // BT-48
		}
	});

	it('names a person with an address and no VAT ID', () => {
		const person = { name: 'Ilona Saarinen', street: 'Rantakatu 3 B 12', postalCode: '90100', city: 'Oulu', country: 'FI' };
		const xml = ublOf(document(380, [line('Vocal booth, 2 h', 9000)], { buyer: person }));
		expect(brokenRules(xml)).toEqual([]);
		const buyer = buyerOf(xml);
		expect(((buyer.PostalAddress as Node).Country as Node).IdentificationCode).toBe('FI');
		expect(buyer.PartyTaxScheme).toBeUndefined();
	});

	it('invents no address for a buyer who gave none: no BG-8, and BR-10 is the one rule left open', () => {
		const xml = ublOf(document(380, [line('Room', 16000)]));
		expect(brokenRules(xml)).toEqual([]);
		expect(buyerOf(xml).PostalAddress).toBeUndefined();
		expect(knownGaps(xml)).toEqual(['BR-10']);
		// The studio's country is still its own address's.
		expect(xml.match(/<cbc:IdentificationCode>/g)?.length).toBe(1);
	});

	it('finds a buyer without a name (BR-07), an address without its country (BR-11) and a VAT ID without a state prefix (BR-CO-09)', () => {
		const xml = ublOf(document(380, [line('Room', 16000)], { buyer: organisation }));
		expect(brokenRules(xml.replace('<cbc:RegistrationName>Nachtfalter Tonträger GmbH<', '<cbc:RegistrationName> <'))).toContain(
			'BR-07'
		);
		expect(brokenRules(xml.replace('<cbc:IdentificationCode>DE</cbc:IdentificationCode>', ''))).toContain('BR-11');
		expect(brokenRules(xml.replace('<cbc:IdentificationCode>DE<', '<cbc:IdentificationCode>Germany<'))).toContain('BR-11');
		expect(brokenRules(xml.replace('>DE294817367<', '>294817367<'))).toContain('BR-CO-09');
		expect(brokenRules(xml.replace('>DE294817367<', '>QQ294817367<'))).toContain('BR-CO-09');
		expect(brokenRules(xml.replace('>DE294817367<', '>EL094014201<'))).toEqual([]); // Greece's own prefix
	});
});

describe('reverse charge in UBL (VAT category AE)', () => {
	// 160.00 + 45.00 at 0 %: what a studio with prices incl. VAT asks of a reverse-charged buyer is the nets.
	const lines = [line('Live room, half day (4 h)', 12749, 0), line('Live room, 1 h', 3586, 0)];

	it('writes an invoice whose lines and VAT breakdown are AE at 0 %, with the reason, and both VAT IDs', () => {
		const xml = ublOf(document(380, lines, { incl: false, buyer: organisation, reverseCharge: true }));
		expect(brokenRules(xml)).toEqual([]);
		const doc = (parser.parse(xml) as Node).Invoice as Node;
		const sub = ((doc.TaxTotal as Node).TaxSubtotal as Node[])[0]!;
		const cat = sub.TaxCategory as Node;
		expect([cat.ID, String(cat.Percent), cat.TaxExemptionReasonCode, cat.TaxExemptionReason]).toEqual([
			'AE',
			'0',
			'VATEX-EU-AE',
			'Reverse charge'
		]);
		expect([text(sub.TaxableAmount), text(sub.TaxAmount)]).toEqual(['163.35', '0.00']);
		for (const l of doc.InvoiceLine as Node[]) {
			const c = (l.Item as Node).ClassifiedTaxCategory as Node;
			expect([c.ID, String(c.Percent)]).toEqual(['AE', '0']);
		}
		expect(text((doc.LegalMonetaryTotal as Node).PayableAmount)).toBe('163.35');
		// UBL 2.1's TaxCategoryType order: ID, Percent, TaxExemptionReasonCode, TaxExemptionReason, TaxScheme.
		expect(xml.indexOf('<cbc:TaxExemptionReasonCode>')).toBeLessThan(xml.indexOf('<cbc:TaxExemptionReason>'));
	});

	it('writes a credit note of a reverse-charged invoice as AE too', () => {
		const xml = ublOf(
			document(381, [line('Refund of the deposit', 5000, 0)], { prepaid: 5000, buyer: organisation, reverseCharge: true }),
			{
				number: 'DEP-2027-0003',
				issuedAt: new Date('2027-03-01T10:00:00Z')
			}
		);
		expect(brokenRules(xml)).toEqual([]);
		expect(xml).toContain('<cbc:ID>AE</cbc:ID>');
	});

	it('finds each broken reverse-charge rule', () => {
		const xml = ublOf(document(380, lines, { incl: false, buyer: organisation, reverseCharge: true }));
		// BR-AE-02: no buyer VAT ID.
		expect(
			brokenRules(xml.replace(/<cac:PartyTaxScheme>\s*<cbc:CompanyID>DE294817367[\s\S]*?<\/cac:PartyTaxScheme>/, ''))
		).toContain('BR-AE-02');
		// BR-AE-05: a line at a rate above 0.
		expect(
			brokenRules(xml.replace(/(<cac:ClassifiedTaxCategory>\s*<cbc:ID>AE<\/cbc:ID>\s*<cbc:Percent>)0</, '$125.5<'))
		).toContain('BR-AE-05');
		// BR-AE-08 and BR-AE-09: the breakdown's base and VAT.
		expect(
			brokenRules(xml.replace('<cbc:TaxableAmount currencyID="EUR">163.35<', '<cbc:TaxableAmount currencyID="EUR">160.00<'))
		).toContain('BR-AE-08');
		expect(
			brokenRules(
				xml
					.replace(/<cbc:TaxAmount currencyID="EUR">0.00</g, '<cbc:TaxAmount currencyID="EUR">1.00<')
					.replace(/(<cbc:TaxInclusiveAmount currencyID="EUR">)163.35/, '$1164.35')
			)
		).toContain('BR-AE-09');
		// BR-AE-10: no reason.
		expect(
			brokenRules(
				xml.replace(
					/<cbc:TaxExemptionReasonCode>[^<]*<\/cbc:TaxExemptionReasonCode>\s*<cbc:TaxExemptionReason>[^<]*<\/cbc:TaxExemptionReason>/,
					''
				)
			)
		).toContain('BR-AE-10');
		// BR-AE-01: lines under reverse charge with a breakdown that is not AE.
		expect(brokenRules(xml.replace(/(<cac:TaxSubtotal>[\s\S]*?<cac:TaxCategory>\s*<cbc:ID>)AE</, '$1Z<'))).toContain('BR-AE-01');
	});
});

// The UBL e-invoice checked, after parsing it back with fast-xml-parser, against EN 16931-1's
// business rules as published with the CEN validation artefacts (ConnectingEurope/eInvoicing-
// EN16931): the mandatory terms BR-01 to BR-26, the totals BR-CO-10 to BR-CO-17, BR-S-02 and the
// BR-DEC limits of two decimals; sums and the rate multiplication in decimal.js (ROUND_HALF_UP).
import { describe, expect, it } from 'vitest';
import { brokenRules, parser, text, type Node } from '../../../../tests/support/en16931';
import { documentTotals, type DocumentLineInput } from '$lib/domain/invoice/totals';
import { documentAsUbl } from './ubl';
import type { InvoiceLineRow, InvoiceRow } from './issue';

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

function document(
	typeCode: 380 | 381 | 386,
	inputs: DocumentLineInput[],
	opts: { incl?: boolean; prepaid?: number; currency?: string } = {}
) {
	const t = documentTotals(inputs, {
		currency: opts.currency ?? 'EUR',
		amountsIncludeVat: opts.incl ?? true,
		prepaid: opts.prepaid
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
		customer,
		currency: t.currency,
		net: t.taxable,
		vatTotal: t.vatTotal,
		gross: t.gross,
		prepaid: t.prepaid,
		rounding: t.rounding,
		amountsIncludeVat: t.amountsIncludeVat,
		amountDue: t.amountDue,
		vatBreakdown: t.vat.map((g) => ({ rateBp: g.rateBp, base: g.base, amount: g.amount })),
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

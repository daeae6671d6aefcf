// The PDF of a document renders with the fonts the app ships (@fontsource WOFF2 files), including
// letters fontkit 2.0 cannot subset by itself (composite glyphs: ä, ö, é, curly quotes).
import { describe, expect, it } from 'vitest';
import { encodeSimpleGlyph } from './fonts';
import { renderInvoicePdf } from './pdf';
import type { InvoiceLineRow, InvoiceRow } from './issue';

const invoice: InvoiceRow = {
	id: '00000000-0000-4000-8000-000000000001',
	studioId: '00000000-0000-4000-8000-0000000000aa',
	series: 'INV',
	year: 2027,
	number: 1,
	displayNumber: 'INV-2027-0001',
	typeCode: 380,
	bookingId: null,
	precedingInvoiceId: null,
	issuedAt: new Date('2027-03-02T16:00:00Z'),
	supplyDate: '2027-03-02',
	supplier: {
		name: 'Hollow Pine Studio',
		street: 'Kuusikkotie 14',
		postalCode: '33980',
		city: 'Pirkkala',
		country: 'FI',
		vatId: 'FI00000000',
		email: 'hello@hollowpine.test'
	},
	customer: { name: 'Äänilevy “Öljy” Éclair', email: 'band@example.test', addressLines: [] },
	currency: 'EUR',
	lineNetTotal: 16335,
	net: 16335,
	vatTotal: 4165,
	gross: 20500,
	prepaid: 6200,
	rounding: 0,
	amountsIncludeVat: true,
	amountDue: 14300,
	vatBreakdown: [{ rateBp: 2550, base: 16335, amount: 4165 }],
	prepaidVatBreakdown: [],
	sourceKey: null,
	paymentId: null,
	refundId: null,
	note: 'Session: Live room, Tuesday 2 March 2027 — “tracking”, naïve façade; ł is not in the font.',
	createdAt: new Date('2027-03-02T16:00:00Z')
};

const line = (position: number, description: string, net: number, amount: number): InvoiceLineRow => ({
	id: position,
	studioId: invoice.studioId,
	invoiceId: invoice.id,
	position,
	description,
	quantity: '1',
	unitCode: 'C62',
	unitPriceNet: net,
	net,
	vatRateBp: 2550,
	kind: 'room',
	unitAmount: amount,
	amount
});

describe('invoice PDF', () => {
	it('renders a document with accented names and quotes in the shipped fonts', async () => {
		const pdf = await renderInvoicePdf({
			invoice,
			lines: [line(1, 'Live room, half day (4 h)', 12749, 16000), line(2, 'Live room, hourly (1 h) – “överdub”', 3586, 4500)],
			timeZone: 'Europe/Helsinki',
			bookingReference: '7K3Q-XM2P',
			preceding: { number: 'DEP-2027-0001', issuedAt: new Date('2027-02-01T10:00:00Z') }
		});
		expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
		const text = pdf.toString('latin1');
		expect(text).toMatch(/\/BaseFont \/[A-Z]{6}\+Inter-Regular/);
		expect(text).toMatch(/\/BaseFont \/[A-Z]{6}\+IBMPlexMono-SemiBold/);
		expect(pdf.length).toBeGreaterThan(5_000);
	});

	it('writes outlines as TrueType simple glyphs (OpenType spec, glyf table)', () => {
		const square = encodeSimpleGlyph([
			{ command: 'moveTo', args: [0, 0] },
			{ command: 'lineTo', args: [100, 0] },
			{ command: 'quadraticCurveTo', args: [150, 50, 100, 100] },
			{ command: 'closePath', args: [] }
		]);
		const view = new DataView(square.buffer);
		expect(view.getInt16(0)).toBe(1); // one contour
		expect([view.getInt16(2), view.getInt16(4), view.getInt16(6), view.getInt16(8)]).toEqual([0, 0, 150, 100]); // bbox
		expect(view.getUint16(10)).toBe(3); // last point index of the contour
		expect(square.length % 4).toBe(0);
		expect(encodeSimpleGlyph([])).toHaveLength(0);
	});
});

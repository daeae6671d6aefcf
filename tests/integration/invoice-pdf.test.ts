// What an invoice PDF says, read back as text (Mozilla's PDF.js) and checked against the document
// as the database holds it: number, dates, seller, buyer, every line, the VAT per rate and the
// totals. A deposit invoice, a final invoice with two VAT rates and a credit note.
// Sources named beside the checks:
// - Council Directive 2006/112/EC, Article 226 (what an invoice shows), Article 219 (a credit
//   note names the invoice it corrects);
// - EN 16931-1: BT-106 sum of line nets, BT-109 taxable amount, BT-110 VAT, BT-112 total with VAT,
//   BT-113 paid, BT-114 rounding, BT-115 amount due, BG-23 VAT per rate; UNTDID 1001 codes 380, 381, 386;
// - the demo rates (src/lib/domain/demo.ts): live room 45.00/h, 160.00 the half day; prices include VAT; deposit 30 %
//   rounded up to whole euros; overtime per started 15 minutes at the hourly rate.
import { afterAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { signedIn, type Client } from '../support/http';
import { DEMO } from '../support/env';
import { studioIdOf, testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { bookAndPay as bookAndPayOn } from '../support/booking';
import { TZ, workdaysAhead, ymdInZone } from '../support/dates';
import { pdfRows, type PdfRow } from '../support/pdf-text';
import { moveIntoPast } from '../support/started';
import * as t from '../../src/lib/server/db/schema';
import { linesOf, type InvoiceRow, type Party } from '../../src/lib/server/invoices/issue';

const { db, client } = testDb();
const studioId = await studioIdOf(db);
const [studioAtStart] = await db.select().from(t.studio).where(eq(t.studio.id, studioId));
afterAll(async () => {
	// The two-rate test changes the studio's VAT rate for one booking; never leave it changed.
	await db.update(t.studio).set({ vatRateBp: studioAtStart!.vatRateBp }).where(eq(t.studio.id, studioId));
	await client.end();
});

const MONTHS = [
	'January',
	'February',
	'March',
	'April',
	'May',
	'June',
	'July',
	'August',
	'September',
	'October',
	'November',
	'December'
];

/** '2027-03-02' → '2 March 2027', the way the document prints a date. */
function dateWords(ymd: string): string {
	const [y, m, d] = ymd.split('-').map(Number) as [number, number, number];
	return `${d} ${MONTHS[m - 1]} ${y}`;
}

/** '€1,234.56' or '-€0.01' → cents (the demo studio invoices in euros). */
function cents(text: string): number {
	const m = /^(-?)€(\d{1,3}(?:,\d{3})*)\.(\d{2})$/.exec(text);
	if (!m) throw new Error(`not an amount in euros: "${text}"`);
	return (m[1] ? -1 : 1) * (Number(m[2]!.replace(/,/g, '')) * 100 + Number(m[3]));
}

/** Basis points as the percent a reader sees: 2550 → '25.5', 2400 → '24'. */
const percent = (bp: number) => String(bp / 100);

/** The A4 page is 595 pt wide: the seller, the buyer and VAT by rate sit left, the document's identity and totals right. */
const MIDDLE = 595.28 / 2;
const side = (row: PdfRow, which: 'left' | 'right') =>
	row.pieces
		.filter((p) => (which === 'left' ? p.x < MIDDLE : p.x >= MIDDLE))
		.map((p) => p.text.trim())
		.join(' ');
const squeeze = (s: string) => s.replace(/\s+/g, '');

const TITLE: Record<number, string> = { 380: 'INVOICE', 381: 'CREDIT NOTE', 386: 'DEPOSIT INVOICE' };
const SUPPLY: Record<number, string> = { 380: 'Date of supply', 381: 'Date of refund', 386: 'Deposit received' };
const PAID: Record<number, string> = { 380: 'Deposit paid (deducted)', 381: 'Refunded', 386: 'Paid on account' };

/** This file's days: working weekdays from 80 days ahead, tried in order. */
const DAYS = workdaysAhead(80, 14);

/** Books `room` from 10:00 to `endHour` on the first free one of this file's days and pays the deposit on the fake. */
const bookAndPay = (who: Client, room: string, endHour: string) =>
	bookAndPayOn(db, who, { room, days: DAYS, slots: [['10:00', endHour]] });

const docsOf = (bookingId: string) => db.select().from(t.invoice).where(eq(t.invoice.bookingId, bookingId));

async function pdfOf(who: Client, doc: InvoiceRow): Promise<PdfRow[]> {
	const res = await who.fetch(`/invoices/${doc.id}/pdf`);
	expect(res.status).toBe(200);
	expect(res.headers.get('content-type')).toBe('application/pdf');
	return pdfRows(new Uint8Array(await res.arrayBuffer()));
}

interface PrintedLine {
	description: string;
	quantity: string;
	unit: string;
	unitPriceNet: number;
	rate: string;
	net: number;
}

/**
 * Checks the PDF of `doc` shows exactly what the database holds for it (the expected values), and
 * returns what it read, for the figures worked out by hand in the tests.
 */
async function expectPdfShows(
	rows: PdfRow[],
	doc: InvoiceRow,
	context: { bookingReference: string; preceding: InvoiceRow | null }
) {
	const lines = await linesOf(db, doc.id);
	const supplier = doc.supplier as Party;
	const customer = doc.customer as Party;
	const lefts = rows.map((r) => side(r, 'left'));
	const rights = rows.map((r) => side(r, 'right'));
	const index = (text: string) => {
		const i = rows.findIndex((r) => r.text === text || r.text.startsWith(`${text} `));
		expect(i, `a row starting "${text}"`).toBeGreaterThanOrEqual(0);
		return i;
	};
	expect(rows.every((r) => r.page === 1)).toBe(true);

	// The document's identity (Article 226(1), (2), (7); UNTDID 1001).
	const identity = rights.slice(0, index(customer.name)).join(' ');
	expect(rights[0]).toBe(TITLE[doc.typeCode]);
	expect(identity).toContain(`Number ${doc.displayNumber}`);
	expect(identity).toContain(`Issue date ${dateWords(ymdInZone(doc.issuedAt, TZ))}`);
	expect(identity).toContain(`${SUPPLY[doc.typeCode]} ${dateWords(doc.supplyDate!)}`);
	expect(identity).toContain(`Booking ${context.bookingReference}`);
	expect(identity).toContain(`Document type UNTDID 1001 code ${doc.typeCode}`);
	if (context.preceding) {
		const label = doc.typeCode === 381 ? 'Corrects invoice' : 'Deposit invoice';
		expect(identity).toContain(
			`${label} ${context.preceding.displayNumber} of ${dateWords(ymdInZone(context.preceding.issuedAt, TZ))}`
		);
	} else {
		expect(identity).not.toMatch(/Corrects invoice|Deposit invoice [A-Z]/);
	}

	// The seller (Article 226(3), (5)): name, address, VAT ID, e-mail, in that order.
	const buyerAt = index(doc.typeCode === 381 ? 'Credited to' : 'Billed to');
	expect(supplier.vatId).toBeTruthy();
	expect(lefts.slice(0, buyerAt).filter(Boolean)).toEqual([
		supplier.name,
		supplier.street,
		`${supplier.postalCode} ${supplier.city}`,
		'Finland',
		`VAT ID ${supplier.vatId}`,
		supplier.email
	]);
	// The buyer (Article 226(5)): the artist's name and e-mail.
	expect(lefts.slice(buyerAt + 1, buyerAt + 3)).toEqual([customer.name, customer.email]);

	// Every line (Article 226(6), (8), (9)): description, quantity, unit price excl. VAT, rate, net.
	const header = index('Service');
	expect(rows[header]!.text).toBe('Service Quantity Unit price excl. VAT VAT Net amount');
	const vatAt = index('VAT by rate');
	const cells = /^(.*?) ?(\d+(?:\.\d+)?)( h| days|) (-?€[\d,]+\.\d{2}) (\d+(?:\.\d+)?) % (-?€[\d,]+\.\d{2})$/;
	const printed: PrintedLine[] = [];
	for (const row of rows.slice(header + 1, vatAt)) {
		const m = cells.exec(row.text);
		if (m) {
			printed.push({
				description: m[1]!,
				quantity: m[2]!,
				unit: m[3]!.trim(),
				unitPriceNet: cents(m[4]!),
				rate: m[5]!,
				net: cents(m[6]!)
			});
		} else {
			// A long description wraps onto rows of its own below the amounts.
			expect(printed.length, `"${row.text}" continues a line`).toBeGreaterThan(0);
			printed.at(-1)!.description += ` ${row.text}`;
		}
	}
	expect(printed.map((l) => ({ ...l, description: squeeze(l.description) }))).toEqual(
		lines.map((l) => ({
			description: squeeze(l.description),
			quantity: l.quantity,
			unit: l.unitCode === 'HUR' ? 'h' : '',
			unitPriceNet: l.unitPriceNet,
			rate: percent(l.vatRateBp),
			net: l.net
		}))
	);

	// VAT per rate (BG-23; Article 226(8), (10)), left, below the lines.
	const vatRows = lefts
		.slice(vatAt + 1)
		.map((text) => /^(\d+(?:\.\d+)?) % on (€[\d,]+\.\d{2}): (€[\d,]+\.\d{2})$/.exec(text))
		.filter((m) => m !== null)
		.map((m) => ({ rate: m[1]!, base: cents(m[2]!), amount: cents(m[3]!) }));
	expect(vatRows).toEqual(doc.vatBreakdown.map((g) => ({ rate: percent(g.rateBp), base: g.base, amount: g.amount })));

	// The totals, right, in order (BT-106, -109, -110, -112, -114, -113, -115).
	const totals = rights
		.slice(vatAt)
		.map((text) => /^(.+?) (-?€[\d,]+\.\d{2})$/.exec(text))
		.filter((m) => m !== null)
		.map((m) => [m[1]!, cents(m[2]!)]);
	expect(totals).toEqual([
		['Sum of lines excl. VAT', doc.lineNetTotal],
		['Taxable amount', doc.net],
		['VAT', doc.vatTotal],
		['Total incl. VAT', doc.gross],
		...(doc.rounding !== 0
			? [
					['Rounding', doc.rounding],
					['Total', doc.gross + doc.rounding]
				]
			: []),
		...(doc.prepaid !== 0 ? [[PAID[doc.typeCode], -doc.prepaid]] : []),
		[doc.typeCode === 381 ? 'Still to refund' : 'Amount due', doc.amountDue]
	]);

	// The footer names the seller and the number.
	expect(rows.at(-1)!.text).toBe(`${supplier.name} · ${doc.displayNumber} · page 1 of 1`);
	return { printed, vatRows, totals: new Map(totals as [string, number][]) };
}

describe('invoice PDFs say what the documents say', () => {
	it('a deposit at 24 %, then a final invoice with the booking at 24 % and overtime at 25.5 % after the rate changed', async () => {
		// Finland raised its standard rate from 24 % to 25.5 % on 1 September 2024: a session booked
		// before such a change and run over after it is invoiced at both rates.
		const studio = studioAtStart;
		const artist = await signedIn(DEMO.artist);
		const owner = await signedIn(DEMO.owner);
		await db.update(t.studio).set({ vatRateBp: 2400 }).where(eq(t.studio.id, studioId));
		const b = await bookAndPay(artist, 'live-room', '15:00').finally(() =>
			db.update(t.studio).set({ vatRateBp: studio!.vatRateBp }).where(eq(t.studio.id, studioId))
		);
		expect(studio!.vatRateBp).toBe(2550);
		expect([b.quote.total, b.quote.deposit]).toEqual([20500, 6200]);

		const deposit = (await docsOf(b.id)).find((d) => d.typeCode === 386)!;
		const depositPdf = await expectPdfShows(await pdfOf(artist, deposit), deposit, {
			bookingReference: b.reference,
			preceding: null
		});
		// By hand: 62.00 received incl. 24 % VAT = 50.00 + 12.00 (Article 65).
		expect(depositPdf.vatRows).toEqual([{ rate: '24', base: 5000, amount: 1200 }]);
		expect(depositPdf.totals.get('Paid on account')).toBe(-6200);
		expect(depositPdf.totals.get('Amount due')).toBe(0);

		// A session's end is recorded only once it has begun: move it back to the same weekday and hours.
		const held = await moveIntoPast(db, b.id);
		const res = await owner.json(`/api/bookings/${b.id}/close`, { actualEnd: held.end.replace('T15:00', 'T15:20') });
		expect(res.status).toBe(200);
		const final = (await docsOf(b.id)).find((d) => d.typeCode === 380)!;
		const finalPdf = await expectPdfShows(await pdfOf(owner, final), final, {
			bookingReference: b.reference,
			preceding: deposit
		});
		// By hand: 160.00 / 1.24 = 129.03, 45.00 / 1.24 = 36.29 (base 165.32, VAT 39.6768 → 39.68);
		// overtime 22.50 / 1.255 = 17.93 (VAT 4.57215 → 4.57); 227.50 in all, 62.00 paid, 165.50 due.
		expect(finalPdf.printed.map((l) => [l.quantity, l.unit, l.rate, l.net])).toEqual([
			['1', '', '24', 12903],
			['1', 'h', '24', 3629],
			['0.5', 'h', '25.5', 1793]
		]);
		expect(finalPdf.vatRows).toEqual([
			{ rate: '25.5', base: 1793, amount: 457 },
			{ rate: '24', base: 16532, amount: 3968 }
		]);
		expect([...finalPdf.totals]).toEqual([
			['Sum of lines excl. VAT', 18325],
			['Taxable amount', 18325],
			['VAT', 4425],
			['Total incl. VAT', 22750],
			['Deposit paid (deducted)', -6200],
			['Amount due', 16550]
		]);
	});

	it('a credit note names the deposit invoice it corrects and shows the refund', async () => {
		const artist = await signedIn(DEMO.artist);
		const b = await bookAndPay(artist, 'vocal-booth', '14:00');
		expect((await artist.json(`/api/bookings/${b.id}/cancel`, {})).status).toBe(200);
		const credit = await waitFor(async () => (await docsOf(b.id)).find((d) => d.typeCode === 381), 'credit note');
		const deposit = (await docsOf(b.id)).find((d) => d.typeCode === 386)!;
		const accountant = await signedIn(DEMO.accountant);
		const shown = await expectPdfShows(await pdfOf(accountant, credit), credit, {
			bookingReference: b.reference,
			preceding: deposit
		});
		expect(shown.printed.every((l) => l.net > 0 && l.unitPriceNet > 0)).toBe(true); // BR-27: positive amounts
		// By hand: the vocal booth's half day is 100.00; 30 % is 30.00, below the studio's minimum deposit
		// of 50.00, refunded in full so far ahead: 50.00 / 1.255 = 39.84, VAT 10.1592 → 10.16.
		expect(shown.vatRows).toEqual([{ rate: '25.5', base: 3984, amount: 1016 }]);
		expect([...shown.totals]).toEqual([
			['Sum of lines excl. VAT', 3984],
			['Taxable amount', 3984],
			['VAT', 1016],
			['Total incl. VAT', 5000],
			['Refunded', -5000],
			['Still to refund', 0]
		]);
	});
});

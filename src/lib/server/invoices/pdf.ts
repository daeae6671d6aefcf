// A document as a PDF, in Slateroom's own plain layout. What it prints is what Directive
// 2006/112/EC, Article 226 asks of an invoice: issue date (1), sequential number (2), supplier's
// VAT id (3), names and addresses (5), nature and extent of the services (6), date of supply or of
// the payment on account (7), taxable amount per rate, unit price excl. VAT (8), the rate (9) and
// the VAT payable (10); a credit note names the invoice it corrects (Article 219). Totals carry
// EN 16931's: sum of lines, VAT per rate, total with VAT, rounding, paid, amount due. The buyer
// block prints the buyer as the document keeps them: name, address lines, country and VAT ID
// when billing details were given (Article 226(4) and (5)). A reverse-charged document says
// "Reverse charge" (Article 226(11a)) beside its VAT.
import { createRequire } from 'node:module';
import type PDFKit from 'pdfkit';
import type { InvoiceLineRow, InvoiceRow, Party } from './issue';
import { invoiceFonts } from './fonts';
import { basisPointsToPercent, formatMoney } from '$lib/domain/money';
import { payableTotal, vatCategoryOf } from '$lib/domain/invoice';
import { REVERSE_CHARGE_WORDS } from '$lib/domain/vat-treatment';
import { RECEIVED_BEFORE_INVOICE } from '$lib/domain/recorded-payments';
import { formatCalendarDate, localDateOf } from '$lib/domain/time';
import { postalLines } from '$lib/domain/setup';

/** A party's address as printed: its street, postal code and city, and country, or the lines of a document issued before those had their own fields. */
function partyLines(party: Party): string[] {
	if (party.street === undefined && party.postalCode === undefined && party.city === undefined) return party.addressLines ?? [];
	const lines = postalLines(party);
	if (lines.length && party.country) lines.push(regionName(party.country));
	return lines;
}

/** An ISO 3166 country code in words, FI → Finland (ECMA-402 Intl.DisplayNames). */
function regionName(code: string): string {
	try {
		return new Intl.DisplayNames(['en-GB'], { type: 'region' }).of(code) ?? code;
	} catch {
		return code;
	}
}

const require = createRequire(import.meta.url);
// CommonJS pdfkit, the build that uses the fontkit copy fonts.ts adjusts.
const PDFDocument = require('pdfkit') as typeof PDFKit;

const TITLES: Record<number, string> = { 380: 'Invoice', 381: 'Credit note', 386: 'Deposit invoice' };
const SUPPLY_LABEL: Record<number, string> = { 380: 'Date of supply', 381: 'Date of refund', 386: 'Deposit received' };
/** UN/ECE Recommendation 20 units as printed after a quantity ('C62', one, prints nothing). */
const UNIT_WORDS: Record<string, string> = { HUR: ' h', C62: '', DAY: ' days' };

const LONG_DATE = { day: 'numeric', month: 'long', year: 'numeric' } as const;

const INK = '#1d2a24';
const SOFT = '#5b6b63';
const LINE = '#c9d3cd';

/** An instant's date in the studio's zone, or a calendar date as it is, e.g. '28 March 2027'. */
function longDate(value: Date | string, timeZone: string): string {
	return formatCalendarDate(typeof value === 'string' ? value : localDateOf(value, timeZone), LONG_DATE);
}

export interface PdfInput {
	invoice: InvoiceRow;
	lines: InvoiceLineRow[];
	timeZone: string;
	bookingReference: string | null;
	preceding: { number: string; issuedAt: Date } | null;
}

export function renderInvoicePdf(input: PdfInput): Promise<Buffer> {
	const { invoice: inv, lines, timeZone } = input;
	const fonts = invoiceFonts();
	const p = fonts.printable;
	const money = (n: number) => formatMoney(n, inv.currency);
	const supplier = inv.supplier as Party;
	const customer = inv.customer as Party;

	const doc = new PDFDocument({
		size: 'A4',
		margins: { top: 50, bottom: 50, left: 50, right: 50 },
		font: fonts.text as unknown as string,
		info: { Title: `${TITLES[inv.typeCode] ?? 'Invoice'} ${inv.displayNumber}`, Author: supplier.name, Creator: 'Slateroom' },
		bufferPages: true
	});
	doc.registerFont('text', fonts.text);
	doc.registerFont('mono', fonts.mono);
	doc.registerFont('monoBold', fonts.monoBold);
	const chunks: Buffer[] = [];
	doc.on('data', (c: Buffer) => chunks.push(c));
	const done = new Promise<Buffer>((resolve, reject) => {
		doc.on('end', () => resolve(Buffer.concat(chunks)));
		doc.on('error', reject);
	});

	const left = doc.page.margins.left;
	const right = doc.page.width - doc.page.margins.right;
	const width = right - left;
	const bottom = () => doc.page.height - doc.page.margins.bottom - 30;

	// ---- supplier (left) and the document's identity (right)
	doc
		.font('monoBold')
		.fontSize(15)
		.fillColor(INK)
		.text(p(supplier.name), left, 50, { width: width * 0.55 });
	doc.font('text').fontSize(9).fillColor(SOFT);
	for (const l of partyLines(supplier)) doc.text(p(l), { width: width * 0.55 });
	if (supplier.vatId) doc.text(`VAT ID ${supplier.vatId}`, { width: width * 0.55 });
	if (supplier.email) doc.text(supplier.email, { width: width * 0.55 });
	const afterSupplier = doc.y;

	const metaX = left + width * 0.58;
	const metaW = right - metaX;
	doc
		.font('monoBold')
		.fontSize(17)
		.fillColor(INK)
		.text((TITLES[inv.typeCode] ?? 'Invoice').toUpperCase(), metaX, 50, { width: metaW, align: 'right' });
	const meta: [string, string][] = [
		['Number', inv.displayNumber],
		['Issue date', longDate(inv.issuedAt, timeZone)]
	];
	if (inv.supplyDate) meta.push([SUPPLY_LABEL[inv.typeCode] ?? 'Date of supply', longDate(inv.supplyDate, timeZone)]);
	if (input.bookingReference) meta.push(['Booking', input.bookingReference]);
	if (input.preceding)
		meta.push([
			inv.typeCode === 381 ? 'Corrects invoice' : 'Deposit invoice',
			`${input.preceding.number} of ${longDate(input.preceding.issuedAt, timeZone)}`
		]);
	meta.push(['Document type', `UNTDID 1001 code ${inv.typeCode}`]);
	doc.moveDown(0.4);
	for (const [k, v] of meta) {
		const rowTop = doc.y;
		doc
			.font('text')
			.fontSize(8.5)
			.fillColor(SOFT)
			.text(k, metaX, rowTop, { width: metaW * 0.4 });
		const afterLabel = doc.y;
		doc
			.font('mono')
			.fontSize(8.5)
			.fillColor(INK)
			.text(p(v), metaX + metaW * 0.4, rowTop, { width: metaW * 0.6, align: 'right' });
		doc.y = Math.max(afterLabel, doc.y) + 2;
	}
	let y = Math.max(afterSupplier, doc.y) + 22;

	// ---- customer
	doc
		.font('text')
		.fontSize(8.5)
		.fillColor(SOFT)
		.text(inv.typeCode === 381 ? 'Credited to' : 'Billed to', left, y);
	doc
		.font('text')
		.fontSize(10.5)
		.fillColor(INK)
		.text(p(customer.name), left, doc.y + 2, { width: width * 0.6 });
	doc.fontSize(9).fillColor(SOFT);
	for (const l of partyLines(customer)) doc.text(p(l), { width: width * 0.6 });
	if (customer.vatId) doc.text(`VAT ID ${customer.vatId}`);
	if (customer.email) doc.text(customer.email);
	y = doc.y + 20;

	// ---- lines: nature and extent of the services, quantities, unit price excl. VAT, rate, net
	const cols = [
		{ key: 'desc', label: 'Service', w: width - 300, align: 'left' as const },
		{ key: 'qty', label: 'Quantity', w: 62, align: 'right' as const },
		{ key: 'unit', label: 'Unit price excl. VAT', w: 86, align: 'right' as const },
		{ key: 'vat', label: 'VAT', w: 52, align: 'right' as const },
		{ key: 'net', label: 'Net amount', w: 100, align: 'right' as const }
	];
	const header = () => {
		let x = left;
		doc.font('text').fontSize(8).fillColor(SOFT);
		for (const c of cols) {
			doc.text(c.label, x, y, { width: c.w - (c.align === 'left' ? 8 : 0), align: c.align });
			x += c.w;
		}
		y = doc.y + 4;
		doc.moveTo(left, y).lineTo(right, y).lineWidth(0.6).strokeColor(LINE).stroke();
		y += 6;
	};
	header();
	for (const l of lines) {
		const desc = p(l.description);
		doc.font('text').fontSize(9);
		const h = Math.max(doc.heightOfString(desc, { width: cols[0]!.w - 8 }), 11);
		if (y + h > bottom()) {
			doc.addPage();
			y = doc.page.margins.top;
			header();
		}
		const cells = [
			desc,
			`${l.quantity}${UNIT_WORDS[l.unitCode] ?? ` ${l.unitCode}`}`,
			money(l.unitPriceNet),
			`${basisPointsToPercent(l.vatRateBp)} %`,
			money(l.net)
		];
		let x = left;
		cols.forEach((c, i) => {
			doc
				.font(i === 0 ? 'text' : 'mono')
				.fontSize(9)
				.fillColor(INK)
				.text(cells[i]!, x, y, { width: c.w - (c.align === 'left' ? 8 : 0), align: c.align });
			x += c.w;
		});
		y += h + 6;
	}
	doc.moveTo(left, y).lineTo(right, y).lineWidth(0.6).strokeColor(LINE).stroke();
	y += 10;

	// ---- VAT by rate (left) and totals (right)
	if (y + 170 > bottom()) {
		doc.addPage();
		y = doc.page.margins.top;
	}
	const top = y;
	doc.font('text').fontSize(8).fillColor(SOFT).text('VAT by rate', left, y);
	y = doc.y + 3;
	for (const g of inv.vatBreakdown) {
		doc
			.font('mono')
			.fontSize(8.5)
			.fillColor(INK)
			.text(`${basisPointsToPercent(g.rateBp)} % on ${money(g.base)}: ${money(g.amount)}`, left, y, { width: width * 0.45 });
		y = doc.y + 2;
	}
	if (inv.vatBreakdown.some((g) => vatCategoryOf(g) === 'AE')) {
		doc
			.font('monoBold')
			.fontSize(9)
			.fillColor(INK)
			.text(REVERSE_CHARGE_WORDS, left, y + 4, { width: width * 0.45 });
		doc
			.font('text')
			.fontSize(8)
			.fillColor(SOFT)
			.text('The customer accounts for the VAT (Directive 2006/112/EC, Article 196).', { width: width * 0.45 });
		y = doc.y + 2;
	}
	const vatEnd = y;

	y = top;
	const tx = left + width * 0.5;
	const tw = right - tx;
	// A final invoice deducts its deposit, and any payment recorded before it (its note lists them).
	const paidLabel =
		inv.typeCode === 381
			? 'Refunded'
			: inv.typeCode === 386
				? 'Paid on account'
				: inv.note.includes(RECEIVED_BEFORE_INVOICE)
					? 'Paid before this invoice (deducted)'
					: 'Deposit paid (deducted)';
	const rows: [string, string, boolean][] = [
		['Sum of lines excl. VAT', money(inv.lineNetTotal), false],
		['Taxable amount', money(inv.net), false],
		['VAT', money(inv.vatTotal), false],
		['Total incl. VAT', money(inv.gross), false]
	];
	if (inv.rounding !== 0) rows.push(['Rounding', money(inv.rounding), false], ['Total', money(payableTotal(inv)), false]);
	if (inv.prepaid !== 0) rows.push([paidLabel, money(-inv.prepaid), false]);
	rows.push([inv.typeCode === 381 ? 'Still to refund' : 'Amount due', money(inv.amountDue), true]);
	for (const [k, v, strong] of rows) {
		if (strong) {
			doc.moveTo(tx, y).lineTo(right, y).lineWidth(0.8).strokeColor(INK).stroke();
			y += 4;
		}
		doc
			.font(strong ? 'monoBold' : 'text')
			.fontSize(strong ? 10.5 : 9)
			.fillColor(strong ? INK : SOFT)
			.text(k, tx, y, { width: tw * 0.55 });
		doc
			.font(strong ? 'monoBold' : 'mono')
			.fontSize(strong ? 10.5 : 9)
			.fillColor(INK)
			.text(v, tx + tw * 0.55, y, { width: tw * 0.45, align: 'right' });
		y = doc.y + 3;
	}
	y = Math.max(y, vatEnd) + 18;

	// ---- note
	if (inv.note) {
		doc.font('text').fontSize(8.5).fillColor(SOFT).text(p(inv.note), left, y, { width });
	}

	// ---- footer on every page
	const range = doc.bufferedPageRange();
	for (let i = 0; i < range.count; i++) {
		doc.switchToPage(range.start + i);
		const fy = doc.page.height - doc.page.margins.bottom - 10;
		doc.font('text').fontSize(7.5).fillColor(SOFT);
		doc.text(`${p(supplier.name)} · ${inv.displayNumber} · page ${i + 1} of ${range.count}`, left, fy, {
			width,
			align: 'center',
			lineBreak: false
		});
	}
	doc.end();
	return done;
}

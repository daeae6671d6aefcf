// The month for the accountant, as files: CSV registers (RFC 4180, see $lib/domain/csv) of the
// documents, payments, refunds and VAT by rate, and ZIP archives of those registers with every
// document's PDF and EN 16931 e-invoice (ubl.ts). The documents register names each buyer with
// their VAT ID and country when the document has them; the VAT register has a row per category
// and rate, reverse charge apart. Amounts are exact decimal text in the currency's ISO 4217 minor unit; credit
// notes and refunds count negatively, so each amount column adds up to the month's figure. The
// payments register has a row per Checkout payment, per payment recorded by hand and per reversal
// of one (negative), with its method and note or reason.
import { zipSync, strToU8 } from 'fflate';
import { toDecimalString } from '$lib/domain/money';
import { localDateOf } from '$lib/domain/time';
import { toCsv, type CsvColumn } from '$lib/domain/csv';
import { DOCUMENT_TYPE } from '$lib/domain/invoice/numbering';
import { documentForViewer } from './access';
import type { MonthReport } from './month';
import { renderInvoicePdf } from './pdf';
import { documentAsUbl } from './ubl';
import type { SessionUser } from '../auth';

type Doc = MonthReport['documents'][number];
type Pay = MonthReport['payments'][number];
type Ref = MonthReport['refunds'][number];
type Vat = MonthReport['vatByRate'][number];

export function monthRegisters(report: MonthReport, timeZone: string): Record<string, string> {
	const amount = (minor: number) => toDecimalString(minor, report.currency);
	const signOf = (d: Doc) => (d.typeCode === DOCUMENT_TYPE.creditNote ? -1 : 1);
	const documents: CsvColumn<Doc>[] = [
		{ header: 'Number', kind: 'text', value: (d) => d.number },
		{ header: 'Type code (UNTDID 1001)', kind: 'number', value: (d) => String(d.typeCode) },
		{ header: 'Kind', kind: 'text', value: (d) => d.kind },
		{ header: 'Issue date', kind: 'date', value: (d) => localDateOf(d.issuedAt, timeZone) },
		{ header: 'Booking', kind: 'text', value: (d) => d.bookingReference ?? '' },
		{ header: 'Customer', kind: 'text', value: (d) => d.customer },
		{ header: 'Customer VAT ID', kind: 'text', value: (d) => d.customerVatId },
		{ header: 'Customer country', kind: 'text', value: (d) => d.customerCountry },
		{ header: 'Refers to', kind: 'text', value: (d) => d.precedingNumber ?? '' },
		{ header: 'Net', kind: 'number', value: (d) => amount(signOf(d) * d.net) },
		{ header: 'VAT', kind: 'number', value: (d) => amount(signOf(d) * d.vat) },
		{ header: 'VAT declared this month', kind: 'number', value: (d) => amount(d.vatDeclared) },
		{ header: 'Gross', kind: 'number', value: (d) => amount(signOf(d) * d.gross) },
		{ header: 'Rounding', kind: 'number', value: (d) => amount(signOf(d) * d.rounding) },
		{ header: 'Paid on account', kind: 'number', value: (d) => amount(signOf(d) * d.prepaid) },
		{ header: 'Amount due', kind: 'number', value: (d) => amount(signOf(d) * d.amountDue) },
		{ header: 'Currency', kind: 'text', value: (d) => d.currency }
	];
	const payments: CsvColumn<Pay>[] = [
		{ header: 'Paid on', kind: 'date', value: (p) => p.paidOn },
		{ header: 'Booking', kind: 'text', value: (p) => p.bookingReference },
		{ header: 'Artist', kind: 'text', value: (p) => p.artist },
		{ header: 'For', kind: 'text', value: (p) => p.kind },
		// card (Checkout), cash or bank_transfer (recorded by the owner); a reversal is negative.
		{ header: 'Method', kind: 'text', value: (p) => p.method },
		{ header: 'Amount', kind: 'number', value: (p) => amount(p.amount) },
		{ header: 'Currency', kind: 'text', value: (p) => p.currency },
		{ header: 'Note', kind: 'text', value: (p) => p.note }
	];
	const refunds: CsvColumn<Ref>[] = [
		{ header: 'Created on', kind: 'date', value: (r) => localDateOf(r.createdAt, timeZone) },
		{ header: 'Booking', kind: 'text', value: (r) => r.bookingReference },
		{ header: 'Artist', kind: 'text', value: (r) => r.artist },
		{ header: 'Status', kind: 'text', value: (r) => r.status },
		{ header: 'Reason', kind: 'text', value: (r) => r.reason },
		{ header: 'Amount', kind: 'number', value: (r) => amount(-r.amount) },
		{ header: 'Currency', kind: 'text', value: (r) => r.currency }
	];
	const vat: CsvColumn<Vat>[] = [
		// UNTDID 5305, as EN 16931 BT-118: S standard rate, Z zero rated, AE reverse charge.
		{ header: 'VAT category', kind: 'text', value: (v) => v.category },
		{ header: 'VAT rate %', kind: 'number', value: (v) => v.ratePercent },
		{ header: 'Taxable amount', kind: 'number', value: (v) => amount(v.base) },
		{ header: 'VAT', kind: 'number', value: (v) => amount(v.vat) },
		{ header: 'Currency', kind: 'text', value: () => report.currency }
	];
	const m = report.month;
	return {
		[`documents-${m}.csv`]: toCsv(documents, report.documents),
		[`payments-${m}.csv`]: toCsv(payments, report.payments),
		[`refunds-${m}.csv`]: toCsv(refunds, report.refunds),
		[`vat-${m}.csv`]: toCsv(vat, report.vatByRate)
	};
}

/**
 * A ZIP archive of the month. 'all': the registers, each document's PDF (pdf/<number>.pdf) and
 * its EN 16931 e-invoice in UBL (ubl/<number>.xml); 'ubl': the e-invoices alone.
 */
export async function monthArchive(
	report: MonthReport,
	timeZone: string,
	viewer: SessionUser,
	contents: 'all' | 'ubl' = 'all'
): Promise<Uint8Array> {
	const files: Record<string, Uint8Array> = {};
	if (contents === 'all') {
		for (const [name, text] of Object.entries(monthRegisters(report, timeZone))) files[name] = strToU8(text);
	}
	for (const { id } of report.documents) {
		const found = await documentForViewer(viewer, id);
		if (!found.ok) continue;
		const number = found.invoice.displayNumber;
		files[`ubl/${number}.xml`] = strToU8(documentAsUbl({ ...found, timeZone }));
		if (contents === 'all') files[`pdf/${number}.pdf`] = new Uint8Array(await renderInvoicePdf({ ...found, timeZone }));
	}
	// A fixed time stamp: the same month gives the same archive.
	return zipSync(files, { level: 6, mtime: new Date('2000-01-01T00:00:00Z') });
}

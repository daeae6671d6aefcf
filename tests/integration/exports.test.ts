// The accountant's month as files, over real HTTP against the real database. Checked against:
// RFC 4180 (CRLF records, quoting; parsed back with csv-parse), OWASP "CSV Injection" (text cells
// that start like a formula are neutralised, amounts are not), and the month report's own totals
// (sums with decimal.js, so no float rounding hides a cent). The ZIP is opened with fflate.
import { afterAll, describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import Decimal from 'decimal.js';
import { unzipSync, strFromU8 } from 'fflate';
import { and, eq } from 'drizzle-orm';
import { Client, signedIn } from '../support/http';
import { DEMO } from '../support/env';
import { testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { workdaysAhead, ymdInZone } from '../support/dates';
import { expectRefused } from '../support/refusal';
import { bookAndPay as bookAndPayOn } from '../support/booking';
import { brokenRules } from '../support/en16931';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

/** This file's days: working weekdays from 120 days ahead. */
const DAYS = workdaysAhead(120, 20);

/** Books two hours in the vocal booth on the first free one of this file's days and pays the deposit on the fake. */
async function bookAndPay(who: Client): Promise<string> {
	return (await bookAndPayOn(db, who, { room: 'vocal-booth', days: DAYS, slots: [['16:00', '18:00']] })).id;
}

/**
 * The studio month in which the booking's deposit invoice was issued: the month the test opens. Read
 * from the invoice, not from the clock, so a test that runs across the turn of a month opens the
 * month its own document is in.
 */
async function monthOfDeposit(bookingId: string): Promise<string> {
	const invoice = await waitFor(async () => {
		const [row] = await db
			.select({ issuedAt: t.invoice.issuedAt })
			.from(t.invoice)
			.where(and(eq(t.invoice.bookingId, bookingId), eq(t.invoice.typeCode, 386)));
		return row;
	}, 'the deposit invoice');
	return ymdInZone(invoice.issuedAt).slice(0, 7);
}

/** A paid booking of the demo artist's in a month of its own: each test makes its own document. */
async function monthWithADocument(): Promise<string> {
	return monthOfDeposit(await bookAndPay(await signedIn(DEMO.artist)));
}

const sum = (values: string[]) => values.reduce((s, v) => s.plus(new Decimal(v)), new Decimal(0)).toFixed(2);
const euros = (minor: number) => new Decimal(minor).dividedBy(100).toFixed(2);

interface Report {
	documents: { number: string; customer: string }[];
	totals: { invoiced: number; deposits: number; credited: number; received: number; refunded: number; vat: number };
	vatByRate: { ratePercent: string; base: number; vat: number }[];
	refunds: { status: string }[];
}

describe('the month export', () => {
	it('gives CSV registers that parse back, add up to the month’s totals and neutralise formula-like names', async () => {
		// An artist whose name a spreadsheet would run as a formula, with a quote, a comma and a line break.
		const sneaky = `=HYPERLINK("x", "y"), Ltd ${Date.now()}`;
		const artist = new Client();
		const signUp = await artist.form('/sign-up', {
			name: sneaky,
			email: `export-${Date.now()}@slateroom.test`,
			password: 'a-long-enough-pass'
		});
		expect(signUp.status).toBe(303);
		const month = await monthOfDeposit(await bookAndPay(artist));

		const accountant = await signedIn(DEMO.accountant);
		const report = (await (await accountant.json(`/api/studios/hollow-pine/invoices?month=${month}`)).json()) as Report;

		const res = await accountant.fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=csv`);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
		expect(res.headers.get('content-disposition')).toBe(`attachment; filename="documents-${month}.csv"`);
		const text = await res.text();
		// RFC 4180 §2.1: every record ends in CRLF (line breaks inside quoted fields aside).
		expect(text.endsWith('\r\n')).toBe(true);
		const rows = parse<Record<string, string>>(text, { columns: true });
		expect(rows.map((r) => r.Number)).toEqual(report.documents.map((d) => d.number));

		const mine = rows.find((r) => r.Customer!.includes('HYPERLINK'));
		expect(mine?.Customer).toBe(`'${sneaky}`);
		// Gross plus its rounding (BT-112 + BT-114, what is payable): final and deposit invoices count,
		// credit notes count against. A session closed with overtime can carry a cent of rounding.
		expect(sum(rows.flatMap((r) => [r.Gross!, r.Rounding!]))).toBe(
			euros(report.totals.invoiced + report.totals.deposits - report.totals.credited)
		);
		expect(sum(rows.map((r) => r['VAT declared this month']!))).toBe(euros(report.totals.vat));
		for (const r of rows) expect(r.Net).toMatch(/^-?\d+\.\d{2}$/);

		const payments = parse<Record<string, string>>(
			await (
				await accountant.fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=csv&register=payments`)
			).text(),
			{
				columns: true
			}
		);
		expect(sum(payments.map((p) => p.Amount!))).toBe(euros(report.totals.received));

		const refunds = parse<Record<string, string>>(
			await (
				await accountant.fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=csv&register=refunds`)
			).text(),
			{
				columns: true
			}
		);
		expect(refunds).toHaveLength(report.refunds.length);
		expect(sum(refunds.filter((r) => r.Status === 'succeeded').map((r) => r.Amount!))).toBe(euros(-report.totals.refunded));

		const vat = parse<Record<string, string>>(
			await (await accountant.fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=csv&register=vat`)).text(),
			{
				columns: true
			}
		);
		expect(vat.map((v) => [v['VAT rate %'], v.VAT])).toEqual(report.vatByRate.map((v) => [v.ratePercent, euros(v.vat)]));
	});

	it('gives a ZIP of every register and each document’s PDF', async () => {
		const month = await monthWithADocument();
		const owner = await signedIn(DEMO.owner);
		const report = (await (await owner.json(`/api/studios/hollow-pine/invoices?month=${month}`)).json()) as Report;
		expect(report.documents.length).toBeGreaterThan(0);
		const res = await owner.fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=zip`);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toBe('application/zip');
		const files = unzipSync(new Uint8Array(await res.arrayBuffer()));
		for (const register of ['documents', 'payments', 'refunds', 'vat']) {
			expect(strFromU8(files[`${register}-${month}.csv`]!)).toMatch(/\r\n$/);
		}
		for (const d of report.documents) {
			const pdf = files[`pdf/${d.number}.pdf`];
			expect(pdf, d.number).toBeDefined();
			expect(strFromU8(pdf!.slice(0, 5))).toBe('%PDF-');
			expect(files[`ubl/${d.number}.xml`], d.number).toBeDefined();
		}
	});

	it('gives every document of the month as an EN 16931 e-invoice in UBL whose rules hold', async () => {
		const month = await monthWithADocument();
		const accountant = await signedIn(DEMO.accountant);
		const report = (await (await accountant.json(`/api/studios/hollow-pine/invoices?month=${month}`)).json()) as Report & {
			documents: { number: string; typeCode: number; amountDue: number }[];
		};
		const res = await accountant.fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=ubl`);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-disposition')).toBe(`attachment; filename="e-invoices-${month}.zip"`);
		const files = unzipSync(new Uint8Array(await res.arrayBuffer()));
		expect(report.documents.length).toBeGreaterThan(0);
		expect(Object.keys(files).sort()).toEqual(report.documents.map((d) => `ubl/${d.number}.xml`).sort());
		for (const d of report.documents) {
			const xml = strFromU8(files[`ubl/${d.number}.xml`]!);
			expect(brokenRules(xml), d.number).toEqual([]);
			expect(xml).toContain(`<cbc:ID>${d.number}</cbc:ID>`);
			expect(xml).toContain(d.typeCode === 381 ? '<cbc:CreditNoteTypeCode>381' : `<cbc:InvoiceTypeCode>${d.typeCode}`);
			expect(xml).toContain(`<cbc:PayableAmount currencyID="EUR">${euros(d.amountDue)}</cbc:PayableAmount>`);
		}
	});

	it('is for the accountant and the owner only, and names a bad setting', async () => {
		const month = await monthWithADocument();
		const [doc] = (
			(await (await (await signedIn(DEMO.accountant)).json(`/api/studios/hollow-pine/invoices?month=${month}`)).json()) as Report
		).documents;
		// Nothing of the month in a refusal: not a document number, not a customer.
		const secrets = [doc!.number, doc!.customer];
		await expectRefused(await new Client().fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=csv`), 401, {
			secrets
		});
		for (const who of [DEMO.artist, DEMO.engineer]) {
			await expectRefused(
				await (await signedIn(who)).fetch(`/api/studios/hollow-pine/invoices/export?month=${month}&format=zip`),
				403,
				{
					secrets
				}
			);
		}
		const accountant = await signedIn(DEMO.accountant);
		const bad = await accountant.fetch('/api/studios/hollow-pine/invoices/export?month=2027-13&format=xls&register=people');
		expect(bad.status).toBe(422);
		const body = (await bad.json()) as { error: string; fields: Record<string, string[]> };
		expect(body.error).toBe('invalid');
		expect(Object.keys(body.fields).sort()).toEqual(['format', 'month', 'register']);
	});
});

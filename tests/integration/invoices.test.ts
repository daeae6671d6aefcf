// Invoices, deposit invoices and credit notes against the real database and the running app.
// Sources named beside the checks:
// - Council Directive 2006/112/EC, Article 226 (what an invoice shows), Article 219 (a credit
//   note refers to the invoice it amends), Article 65 (VAT on a payment on account);
// - EN 16931-1 business rules (CEN validation artefacts, github.com/ConnectingEurope/eInvoicing-EN16931):
//   BR-CO-10, -13, -14, -15, -16, -17, BR-27; UNTDID 1001 codes 380, 381, 386; BT-25;
// - the demo rates (src/lib/domain/demo.ts): live room 45.00/h, 160.00 the half day; prices include 25.5 % VAT;
//   deposit 30 % rounded up to whole euros; overtime per started 15 minutes at the hourly rate.
import { afterAll, describe, expect, it } from 'vitest';
import { and, desc, eq, inArray, isNotNull } from 'drizzle-orm';
import { Client, signedIn } from '../support/http';
import { DATABASE_URL, DEMO } from '../support/env';
import { studioIdOf, testDb } from '../support/db';
import { sleep, waitFor } from '../support/wait';
import { bookAndPay as bookAndPayOn } from '../support/booking';
import { moveIntoPast } from '../support/started';
import { createDb } from '../../src/lib/server/db/client';
import * as t from '../../src/lib/server/db/schema';
import { issueDocument, linesOf, storedTotals, type InvoiceRow } from '../../src/lib/server/invoices/issue';
import { supplierOf } from '../../src/lib/server/invoices/documents';
import {
	documentTotals,
	documentViolations,
	formatDocumentNumber,
	lumpSumLines,
	missingNumbers
} from '../../src/lib/domain/invoice';
import { workdaysAhead } from '../support/dates';
import { expectRefused } from '../support/refusal';
import type { Quote } from '../../src/lib/domain/pricing';

const { db, client } = testDb();
afterAll(() => client.end());

/** This file's days: working weekdays from 100 days ahead (no surcharge), tried in order. */
const DAYS = workdaysAhead(100, 45);

/** Books `room` from 10:00 to `endHour` on the first free one of this file's days and pays the deposit on the fake. */
const bookAndPay = (who: Client, room: string, endHour: string) =>
	bookAndPayOn(db, who, { room, days: DAYS, slots: [['10:00', endHour]] });

const docsOf = (bookingId: string) => db.select().from(t.invoice).where(eq(t.invoice.bookingId, bookingId));

/** Directive 2006/112/EC, Article 226, point by point, on an issued document as stored. */
async function expectArticle226(doc: InvoiceRow) {
	const lines = await linesOf(db, doc.id);
	const supplier = doc.supplier as { name: string; street: string; postalCode: string; city: string; vatId: string };
	const customer = doc.customer as { name: string; email: string };
	expect(doc.issuedAt).toBeInstanceOf(Date); // (1) date of issue
	expect(doc.displayNumber).toBe(formatDocumentNumber(doc.series, doc.year, doc.number)); // (2) sequential number in its series
	expect(supplier.vatId).toMatch(/^[A-Z]{2}\w+$/); // (3) the supplier's VAT identification number
	expect(supplier.name.length).toBeGreaterThan(0); // (5) supplier's full name and address
	expect(supplier.street.length).toBeGreaterThan(0);
	expect(supplier.postalCode.length).toBeGreaterThan(0);
	expect(supplier.city.length).toBeGreaterThan(0);
	expect(customer.name.length).toBeGreaterThan(0); // (5) customer's full name (Slateroom keeps no artist's postal address)
	expect(customer.email).toMatch(/@/);
	expect(lines.length).toBeGreaterThan(0); // (6) quantity and nature of the services
	for (const l of lines) {
		expect(l.description.length).toBeGreaterThan(3);
		expect(Number(l.quantity)).toBeGreaterThan(0);
		expect(['HUR', 'C62']).toContain(l.unitCode); // UN/ECE Recommendation 20
		expect(l.unitPriceNet).toBeGreaterThanOrEqual(0); // (8) unit price exclusive of VAT; BR-27 not negative
		expect(l.vatRateBp).toBe(2550); // (9) the VAT rate applied
	}
	expect(doc.supplyDate).toMatch(/^\d{4}-\d{2}-\d{2}$/); // (7) date of supply, or of the payment on account
	expect(doc.vatBreakdown.length).toBeGreaterThan(0); // (8) taxable amount per rate
	expect(doc.vatTotal).toBe(doc.vatBreakdown.reduce((s, g) => s + g.amount, 0)); // (10) VAT payable
	// EN 16931: BR-CO-10 (Σ line nets), BR-CO-13 (taxable total), BR-CO-14 (Σ VAT by rate),
	// BR-CO-15 (gross = taxable + VAT), BR-CO-16 (due = gross − paid + rounding), BR-CO-17 (VAT per rate), BR-27.
	expect(documentViolations(storedTotals(doc, lines))).toEqual([]);
	expect([380, 381, 386]).toContain(doc.typeCode); // UNTDID 1001
	return lines;
}

describe('documents of a booking', () => {
	it('deposit invoice, final invoice with overtime, and the worked figures (BR-CO-16 with rounding)', async () => {
		const artist = await signedIn(DEMO.artist);
		// Demo rates: live room 10:00–15:00 = half day 160.00 + 1 h 45.00 = 205.00; deposit 62.00.
		const b = await bookAndPay(artist, 'live-room', '15:00');
		expect(b.quote.total).toBe(20500);
		expect(b.quote.deposit).toBe(6200);
		const [deposit] = await docsOf(b.id);
		expect(deposit!.typeCode).toBe(386);
		expect(deposit!.displayNumber).toMatch(/^DEP-\d{4}-\d{4}$/);
		// Article 65: VAT on the 62.00 received: 62.00 / 1.255 = 49.40, VAT 12.60.
		expect([deposit!.net, deposit!.vatTotal, deposit!.gross, deposit!.prepaid, deposit!.amountDue]).toEqual([
			4940, 1260, 6200, 6200, 0
		]);
		await expectArticle226(deposit!);

		const owner = await signedIn(DEMO.owner);
		const held = await moveIntoPast(db, b.id);
		const res = await owner.json(`/api/bookings/${b.id}/close`, { actualEnd: held.end.replace('T15:00', 'T15:20') });
		expect(res.status).toBe(200);
		const final = (await docsOf(b.id)).find((d) => d.typeCode === 380)!;
		expect(final.displayNumber).toMatch(/^INV-\d{4}-\d{4}$/);
		expect(final.precedingInvoiceId).toBe(deposit!.id); // BT-25: the deposit invoice it deducts
		// 160.00 + 45.00 + overtime 22.50 (two started 15 min at 45.00/h): nets 127.49 + 35.86 + 17.93 = 181.28,
		// VAT 46.23, gross 227.51 against 227.50 advertised: rounding −0.01 (BT-114); due 227.51 − 62.00 − 0.01 = 165.50.
		expect([final.lineNetTotal, final.vatTotal, final.gross, final.rounding, final.prepaid, final.amountDue]).toEqual([
			18128, 4623, 22751, -1, 6200, 16550
		]);
		expect(final.prepaidVatBreakdown).toEqual(deposit!.vatBreakdown);
		const lines = await expectArticle226(final);
		expect(lines.map((l) => l.kind)).toEqual(['room', 'room', 'overtime']);
		const overtime = lines.at(-1)!;
		expect([overtime.quantity, overtime.unitCode, overtime.unitAmount, overtime.amount]).toEqual(['0.5', 'HUR', 4500, 2250]);
	});

	it('a session that ends on time is invoiced at exactly the quoted gross', async () => {
		const b = await bookAndPay(await signedIn(DEMO.artist), 'control-room', '16:30');
		const engineer = await signedIn(DEMO.engineer);
		const held = await moveIntoPast(db, b.id);
		expect((await engineer.json(`/api/bookings/${b.id}/close`, { actualEnd: held.end })).status).toBe(200);
		const [row] = await db.select().from(t.booking).where(eq(t.booking.id, b.id));
		const quote = row!.quote as Quote;
		const final = (await docsOf(b.id)).find((d) => d.typeCode === 380)!;
		expect(final.gross).toBe(quote.gross); // the invoice gross = the quoted gross
		expect(final.rounding).toBe(quote.rounding); // BT-114 carried from the quote
		expect(final.gross + final.rounding).toBe(quote.total);
		expect(final.net).toBe(quote.net);
		expect(final.vatBreakdown).toEqual(quote.vat.map((g) => ({ rateBp: g.rateBp, base: g.base, amount: g.amount })));
		expect(final.amountDue).toBe(quote.total - quote.deposit);
		await expectArticle226(final);
	});

	it('a credit note refers to the deposit invoice (Article 219, BT-25) with positive amounts', async () => {
		const artist = await signedIn(DEMO.artist);
		const b = await bookAndPay(artist, 'vocal-booth', '14:00');
		expect((await artist.json(`/api/bookings/${b.id}/cancel`, {})).status).toBe(200);
		const credit = await waitFor(async () => (await docsOf(b.id)).find((d) => d.typeCode === 381), 'credit note');
		const deposit = (await docsOf(b.id)).find((d) => d.typeCode === 386)!;
		expect(credit.precedingInvoiceId).toBe(deposit.id);
		expect(credit.customer).toEqual(deposit.customer);
		expect(credit.gross + credit.rounding).toBe(b.quote.deposit);
		expect(credit.net).toBeGreaterThan(0);
		expect(credit.note).toContain(deposit.displayNumber);
		await expectArticle226(credit);
	});
});

describe('numbering (Article 226(2): sequential, unique within its series)', () => {
	it('gives 20 documents issued at once 20 consecutive numbers, no gap and no duplicate', async () => {
		const wide = createDb(DATABASE_URL, { max: 20 });
		try {
			const [studio] = await wide.db.select().from(t.studio);
			const series = 'TST';
			// Issued in 2099 so the check's documents stay out of every month anyone looks at.
			const issuedAt = new Date('2099-01-15T12:00:00Z');
			const lines = lumpSumLines(1000, 'deposit', 'Numbering check (integration test)', [{ rateBp: 2550, weight: 1 }]);
			const totals = documentTotals(lines, { currency: 'EUR', amountsIncludeVat: true, prepaid: 1000 });
			const issued = await Promise.all(
				Array.from({ length: 20 }, () =>
					wide.db.transaction(async (tx) => {
						const { invoice } = await issueDocument(tx, {
							studioId: studio!.id,
							typeCode: 386,
							series,
							issuedAt,
							timeZone: studio!.timeZone,
							supplyDate: '2027-01-01',
							supplier: supplierOf(studio!),
							customer: { name: 'Numbering check', email: 'check@slateroom.test', addressLines: [] },
							bookingId: null,
							totals
						});
						// Hold the lock a moment so the others really queue on the counter row.
						await sleep(5);
						return invoice;
					})
				)
			);
			const year = issued[0]!.year;
			const numbers = issued.map((i) => i.number).sort((a, b) => a - b);
			expect(new Set(numbers).size).toBe(20);
			expect(numbers.at(-1)! - numbers[0]!).toBe(19);
			// A transaction that takes a number and then fails gives it back: no gap.
			await expect(
				wide.db.transaction(async (tx) => {
					await issueDocument(tx, {
						studioId: studio!.id,
						typeCode: 386,
						series,
						issuedAt,
						timeZone: studio!.timeZone,
						supplyDate: null,
						supplier: supplierOf(studio!),
						customer: { name: 'x', addressLines: [] },
						bookingId: null,
						totals
					});
					throw new Error('rolled back');
				})
			).rejects.toThrow('rolled back');
			const all = await wide.db
				.select({ n: t.invoice.number })
				.from(t.invoice)
				.where(and(eq(t.invoice.series, series), eq(t.invoice.year, year)));
			expect(missingNumbers(all.map((r) => r.n))).toEqual([]);
			const [counter] = await wide.db
				.select()
				.from(t.invoiceCounter)
				.where(and(eq(t.invoiceCounter.series, series), eq(t.invoiceCounter.year, year)));
			expect(counter!.lastNumber).toBe(Math.max(...all.map((r) => r.n)));
		} finally {
			await wide.client.end();
		}
	});

	it('leaves no gap in any series of the database', async () => {
		const rows = await db.select({ series: t.invoice.series, year: t.invoice.year, n: t.invoice.number }).from(t.invoice);
		const bySeries = new Map<string, number[]>();
		for (const r of rows) bySeries.set(`${r.series}-${r.year}`, [...(bySeries.get(`${r.series}-${r.year}`) ?? []), r.n]);
		expect(bySeries.size).toBeGreaterThan(0);
		for (const [key, numbers] of bySeries) expect(missingNumbers(numbers), key).toEqual([]);
	});

	it('refuses to issue a document that breaks an EN 16931 rule, before taking a number', async () => {
		const [studio] = await db.select().from(t.studio);
		const totals = documentTotals(lumpSumLines(1000, 'deposit', 'Broken', [{ rateBp: 2550, weight: 1 }]), {
			currency: 'EUR',
			amountsIncludeVat: true
		});
		const [before] = await db.select().from(t.invoiceCounter).where(eq(t.invoiceCounter.series, 'TST'));
		await expect(
			db.transaction((tx) =>
				issueDocument(tx, {
					studioId: studio!.id,
					typeCode: 386,
					series: 'TST',
					issuedAt: new Date('2099-01-15T12:00:00Z'),
					timeZone: studio!.timeZone,
					supplyDate: null,
					supplier: supplierOf(studio!),
					customer: { name: 'x', addressLines: [] },
					bookingId: null,
					totals: { ...totals, gross: totals.gross + 1 }
				})
			)
		).rejects.toThrow(/BR-CO-15/);
		const [after] = await db.select().from(t.invoiceCounter).where(eq(t.invoiceCounter.series, 'TST'));
		expect(after?.lastNumber).toBe(before?.lastNumber);
	});
});

describe('issued documents are immutable (corrections only by credit note)', () => {
	it('the database refuses UPDATE and DELETE on invoices and their lines, and a counter that skips', async () => {
		const [doc] = await db.select().from(t.invoice).limit(1);
		expect(doc).toBeDefined();
		const refused = async (work: () => Promise<unknown>) => {
			const e = await work().then(
				() => null,
				(err: unknown) => err as { cause?: { code?: string }; code?: string }
			);
			expect(e, 'the statement should have failed').not.toBeNull();
			expect(e!.cause?.code ?? e!.code).toBe('55000');
		};
		await refused(() =>
			db
				.update(t.invoice)
				.set({ gross: doc!.gross + 100 })
				.where(eq(t.invoice.id, doc!.id))
		);
		await refused(() => db.update(t.invoice).set({ note: 'edited' }).where(eq(t.invoice.id, doc!.id)));
		await refused(() => db.delete(t.invoice).where(eq(t.invoice.id, doc!.id)));
		await refused(() => db.update(t.invoiceLine).set({ net: 1 }).where(eq(t.invoiceLine.invoiceId, doc!.id)));
		await refused(() => db.delete(t.invoiceLine).where(eq(t.invoiceLine.invoiceId, doc!.id)));
		await refused(() => db.update(t.invoiceCounter).set({ lastNumber: 999_999 }).where(eq(t.invoiceCounter.series, doc!.series)));
		const [same] = await db.select().from(t.invoice).where(eq(t.invoice.id, doc!.id));
		expect(same).toEqual(doc);
	});
});

describe('PDFs and the month', () => {
	it('serves the PDF to the booking’s artist, the owner and the accountant only', async () => {
		const artist = await signedIn(DEMO.artist);
		const b = await bookAndPay(artist, 'vocal-booth', '13:00');
		const [doc] = await docsOf(b.id);
		const path = `/invoices/${doc!.id}/pdf`;
		const res = await artist.fetch(path);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toBe('application/pdf');
		expect(res.headers.get('content-disposition')).toContain(`${doc!.displayNumber}.pdf`);
		const bytes = Buffer.from(await res.arrayBuffer());
		expect(bytes.subarray(0, 5).toString()).toBe('%PDF-');
		// The fonts the app ships (@fontsource: Inter, IBM Plex Mono), embedded as subsets.
		const text = bytes.toString('latin1');
		expect(text).toMatch(/\/BaseFont \/[A-Z]{6}\+Inter/);
		expect(text).toMatch(/\/BaseFont \/[A-Z]{6}\+IBMPlexMono/);

		expect((await (await signedIn(DEMO.owner)).fetch(path)).status).toBe(200);
		expect((await (await signedIn(DEMO.accountant)).fetch(path)).status).toBe(200);
		// The refusals carry no part of the document.
		const secrets = ['%PDF', doc!.displayNumber];
		await expectRefused(await (await signedIn(DEMO.artist2)).fetch(path), 404, { secrets });
		await expectRefused(await (await signedIn(DEMO.engineer)).fetch(path), 403, { secrets });
		await expectRefused(await new Client().fetch(path), 401, { secrets });
		await expectRefused(await artist.fetch(`/invoices/${crypto.randomUUID()}/pdf`), 404);
	});

	it('GET /api/studios/hollow-pine/invoices?month lists the month’s documents, payments and VAT by rate for the accountant', async () => {
		const ids = await db
			.select({ id: t.invoice.id, issuedAt: t.invoice.issuedAt })
			.from(t.invoice)
			.where(
				and(
					eq(t.invoice.studioId, await studioIdOf(db)),
					inArray(t.invoice.typeCode, [380, 381, 386]),
					isNotNull(t.invoice.bookingId)
				)
			)
			.orderBy(desc(t.invoice.issuedAt))
			.limit(1);
		const month = new Intl.DateTimeFormat('en-CA', { timeZone: 'Europe/Helsinki', year: 'numeric', month: '2-digit' })
			.format(ids[0]!.issuedAt)
			.slice(0, 7);
		const accountant = await signedIn(DEMO.accountant);
		const res = await accountant.fetch(`/api/studios/hollow-pine/invoices?month=${month}`);
		expect(res.status).toBe(200);
		const body = (await res.json()) as {
			documents: { id: string; typeCode: number; total: number }[];
			payments: { amount: number }[];
			vatByRate: { rateBp: number; base: number; vat: number }[];
			totals: { received: number };
		};
		expect(body.documents.map((d) => d.id)).toContain(ids[0]!.id);
		expect(body.payments.length).toBeGreaterThan(0);
		expect(body.totals.received).toBe(body.payments.reduce((s, p) => s + p.amount, 0));
		expect(body.vatByRate.map((v) => v.rateBp)).toContain(2550);
		const secrets = [ids[0]!.id];
		await expectRefused(await (await signedIn(DEMO.artist)).fetch(`/api/studios/hollow-pine/invoices?month=${month}`), 403, {
			secrets
		});
		await expectRefused(await new Client().fetch(`/api/studios/hollow-pine/invoices?month=${month}`), 401, { secrets });
		const bad = await accountant.fetch('/api/studios/hollow-pine/invoices?month=2027-13');
		expect(bad.status).toBe(422);
		expect(((await bad.json()) as { error: string }).error).toBe('invalid');
	});
});

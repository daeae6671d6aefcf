// Issuing a document: the next number of its series and year, and the invoice with its lines,
// in the caller's transaction. Takes a transaction handle and imports nothing from SvelteKit, so
// scripts and integration tests can issue with their own database handle.
//
// Numbers without gaps, even when many are issued at once (Directive 2006/112/EC, Article
// 226(2)), in each studio's own series: the counter row of (studio, series, year) is taken with INSERT … ON CONFLICT DO UPDATE, which
// row-locks it until the issuing transaction ends. A second issuer waits; if the first rolls back,
// its increment rolls back with it, so no number is ever skipped or used twice.
import { asc, eq, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { invoice, invoiceLine, type VatBreakdownRow } from '../db/schema';
import {
	SERIES_FOR_TYPE,
	documentViolations,
	documentYear,
	formatDocumentNumber,
	type DocumentLine,
	type DocumentTotals,
	type DocumentTypeCode
} from '$lib/domain/invoice';
import { basisPointsToPercent } from '$lib/domain/money';

export type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];
export type InvoiceRow = typeof invoice.$inferSelect;
export type InvoiceLineRow = typeof invoiceLine.$inferSelect;

/**
 * A party as printed on the document (Article 226(3)–(5)), copied onto it when it is issued and
 * never changed after (drizzle/0003). The buyer's address and VAT ID are there when the artist
 * gave billing details; a document issued before that keeps only a name and an e-mail.
 */
export interface Party {
	/** EN 16931 BT-27 / BT-44. */
	name: string;
	/** EN 16931 BT-35 / BT-50. */
	street?: string;
	/** BT-38 / BT-53. */
	postalCode?: string;
	/** BT-37 / BT-52. */
	city?: string;
	/** The address of documents issued before the address had its own fields (their text never changes). */
	addressLines?: string[];
	/** ISO 3166-1 alpha-2, BT-40 / BT-55. */
	country?: string;
	/** BT-31 / BT-48, with its country prefix. */
	vatId?: string;
	/** BT-34 / BT-49. */
	email?: string;
}

export interface DocumentDraft {
	/** The issuing studio: its own series and numbers. */
	studioId: string;
	typeCode: DocumentTypeCode;
	/** Defaults to the type's series (INV, DEP, CN). */
	series?: string;
	/** Defaults to now. */
	issuedAt?: Date;
	/** The studio's zone: the year of the number and the dates printed are local to it. */
	timeZone: string;
	/** Article 226(7): date of the supply, or of the payment on account; 'YYYY-MM-DD'. */
	supplyDate: string | null;
	supplier: Party;
	customer: Party;
	bookingId: string | null;
	/** EN 16931 BT-25. */
	precedingInvoiceId?: string | null;
	paymentId?: string | null;
	refundId?: string | null;
	/** One document per business fact (unique). */
	sourceKey?: string | null;
	totals: DocumentTotals;
	/** On a final invoice: the VAT breakdown of the deposit invoice it deducts. */
	prepaidVat?: VatBreakdownRow[];
	note?: string;
}

export class InvoiceRuleError extends Error {
	constructor(readonly rules: string[]) {
		super(`the document breaks ${rules.join(', ')}`);
	}
}

/** Takes a studio's next number of a series and year; the row stays locked until the transaction ends. */
export async function takeNumber(tx: Tx, studioId: string, series: string, year: number): Promise<number> {
	const rows = await tx.execute<{ last_number: number }>(sql`
		insert into invoice_counter (studio_id, series, year, last_number) values (${studioId}, ${series}, ${year}, 1)
		on conflict (studio_id, series, year) do update set last_number = invoice_counter.last_number + 1
		returning last_number`);
	const n = Number(rows[0]?.last_number);
	if (!Number.isSafeInteger(n) || n < 1) throw new Error('the invoice counter gave no number');
	return n;
}

export async function issueDocument(tx: Tx, draft: DocumentDraft): Promise<{ invoice: InvoiceRow; lines: InvoiceLineRow[] }> {
	// EN 16931 BR-CO-10/13/14/15/16/17 and BR-27 are checked before a number is taken.
	const broken = documentViolations(draft.totals);
	if (broken.length) throw new InvoiceRuleError(broken);
	const issuedAt = draft.issuedAt ?? new Date();
	const series = draft.series ?? SERIES_FOR_TYPE[draft.typeCode];
	const year = documentYear(issuedAt, draft.timeZone);
	const number = await takeNumber(tx, draft.studioId, series, year);
	const t = draft.totals;
	const [row] = await tx
		.insert(invoice)
		.values({
			studioId: draft.studioId,
			series,
			year,
			number,
			displayNumber: formatDocumentNumber(series, year, number),
			typeCode: draft.typeCode,
			bookingId: draft.bookingId,
			precedingInvoiceId: draft.precedingInvoiceId ?? null,
			issuedAt,
			supplyDate: draft.supplyDate,
			supplier: draft.supplier,
			customer: draft.customer,
			currency: t.currency,
			lineNetTotal: t.lineNetTotal,
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
			prepaidVatBreakdown: draft.prepaidVat ?? [],
			sourceKey: draft.sourceKey ?? null,
			paymentId: draft.paymentId ?? null,
			refundId: draft.refundId ?? null,
			note: draft.note ?? ''
		})
		.returning();
	const lines = await tx
		.insert(invoiceLine)
		.values(
			t.lines.map((l, i) => ({
				studioId: draft.studioId,
				invoiceId: row!.id,
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
			}))
		)
		.returning();
	return { invoice: row!, lines };
}

/** The document issued for a business fact, if any (deposit:<payment>, final:<booking>, credit:<refund>). */
export async function findBySource(tx: Tx, sourceKey: string): Promise<InvoiceRow | undefined> {
	const [row] = await tx.select().from(invoice).where(eq(invoice.sourceKey, sourceKey));
	return row;
}

export async function linesOf(tx: Pick<Tx, 'select'>, invoiceId: string): Promise<InvoiceLineRow[]> {
	return tx.select().from(invoiceLine).where(eq(invoiceLine.invoiceId, invoiceId)).orderBy(asc(invoiceLine.position));
}

/** The totals of an issued document as stored, in the domain's shape (for checks and the PDF). */
export function storedTotals(row: InvoiceRow, lines: readonly InvoiceLineRow[]): DocumentTotals {
	const docLines: DocumentLine[] = lines.map((l) => ({
		key: `line:${l.position}`,
		kind: l.kind,
		description: l.description,
		quantity: l.quantity,
		unitCode: l.unitCode,
		unitAmount: l.unitAmount,
		amount: l.amount,
		vatRateBp: l.vatRateBp,
		net: l.net,
		unitPriceNet: l.unitPriceNet
	}));
	return {
		currency: row.currency,
		amountsIncludeVat: row.amountsIncludeVat,
		lines: docLines,
		lineNetTotal: row.lineNetTotal,
		allowances: 0,
		charges: 0,
		taxable: row.net,
		vat: row.vatBreakdown.map((g) => ({ ...g, ratePercent: basisPointsToPercent(g.rateBp) })),
		vatTotal: row.vatTotal,
		gross: row.gross,
		prepaid: row.prepaid,
		rounding: row.rounding,
		amountDue: row.amountDue
	};
}

// A month of the books, for the accountant and the owner: the documents issued in it, the
// payments received in it (through Checkout, and those the owner recorded by hand with their
// reversals) and refunds made in it, what is still owed, refunds that failed, and VAT by
// category and rate (ledger.ts: reverse charge apart). Months are calendar months in the studio's zone.
import { and, asc, eq, gte, inArray, lt } from 'drizzle-orm';
import { db } from '../db';
import { booking, invoice, payment, recordedPayment, refund, user } from '../db/schema';
import { owedOn } from '../payments/balance';
import { documentKindLabel, payableTotal, vatLedger, type LedgerRow } from '$lib/domain/invoice';
import { unresolvedFailures } from '../payments/state';
import type { Party } from './issue';
import { addMonths, localDateOf, localToInstant } from '$lib/domain/time';

export const MONTH_PATTERN = /^\d{4}-(0[1-9]|1[0-2])$/;

export function monthRange(month: string, timeZone: string): { from: Date; to: Date; prev: string; next: string } {
	const next = addMonths(month, 1);
	return {
		from: localToInstant(`${month}-01`, 0, timeZone).instant,
		to: localToInstant(`${next}-01`, 0, timeZone).instant,
		prev: addMonths(month, -1),
		next
	};
}

export function currentMonth(timeZone: string): string {
	return localDateOf(new Date(), timeZone).slice(0, 7);
}

export interface MonthReport {
	month: string;
	currency: string;
	documents: {
		id: string;
		number: string;
		typeCode: number;
		kind: string;
		issuedAt: string;
		bookingId: string | null;
		bookingReference: string | null;
		customer: string;
		/** The buyer's VAT ID (EN 16931 BT-48) and country (BT-55) as the document keeps them; '' when it has none. */
		customerVatId: string;
		customerCountry: string;
		precedingNumber: string | null;
		net: number;
		vat: number;
		/** This document's part of the month's VAT by rate (ledger.ts): credit notes negative, deposits deducted from final invoices. */
		vatDeclared: number;
		gross: number;
		rounding: number;
		total: number;
		prepaid: number;
		amountDue: number;
		currency: string;
		pdfUrl: string;
	}[];
	/**
	 * Money received: Checkout payments by the day Stripe took them, and payments the owner
	 * recorded by hand (cash, bank transfer) by their day paid, each reversal a row of its own with
	 * a negative amount (by the day it was recorded), so the amounts add up to `totals.received`.
	 */
	payments: {
		id: string;
		bookingId: string;
		bookingReference: string;
		artist: string;
		/** 'deposit', 'balance' (Checkout), 'recorded' (by hand) or 'reversal'. */
		kind: string;
		/** 'card', 'cash' or 'bank_transfer'. */
		method: string;
		amount: number;
		/** The instant for a Checkout payment; noon of the day paid (studio time) for a recorded one. */
		paidAt: string;
		/** The day paid in the studio's calendar, 'YYYY-MM-DD'. */
		paidOn: string;
		/** A recorded payment's note, or a reversal's reason. */
		note: string;
		currency: string;
	}[];
	refunds: {
		id: string;
		bookingId: string;
		bookingReference: string;
		artist: string;
		amount: number;
		status: string;
		reason: string;
		failureReason: string | null;
		createdAt: string;
		currency: string;
	}[];
	/** Failed refunds not yet tried again, whatever their month: to resolve. */
	failedRefunds: MonthReport['refunds'];
	/** Final invoices issued up to the end of the month whose balance is not paid (as of now). */
	outstanding: {
		bookingId: string;
		bookingReference: string;
		artist: string;
		invoiceNumber: string;
		amountDue: number;
		paid: number;
		owed: number;
		currency: string;
	}[];
	vatByRate: LedgerRow[];
	/** invoiced: final invoices (380); deposits: deposit invoices (386, deducted again on the 380s); credited: credit notes (381). */
	/** received: every row of `payments`; recorded: the part recorded by hand (less reversals). */
	totals: {
		invoiced: number;
		deposits: number;
		credited: number;
		received: number;
		recorded: number;
		refunded: number;
		owed: number;
		vat: number;
	};
}

type RefundWithBooking = { r: typeof refund.$inferSelect; reference: string; artist: string };

function refundRow(x: RefundWithBooking): MonthReport['refunds'][number] {
	return {
		id: x.r.id,
		bookingId: x.r.bookingId,
		bookingReference: x.reference,
		artist: x.artist,
		amount: x.r.amount,
		status: x.r.status,
		reason: x.r.reason,
		failureReason: x.r.failureReason,
		createdAt: x.r.createdAt.toISOString(),
		currency: x.r.currency
	};
}

/** Failed refunds not yet tried again, whatever their month: to resolve (the month report and the studio desk). */
export async function unresolvedFailedRefunds(studioId: string): Promise<MonthReport['failedRefunds']> {
	const rows = await db
		.select({ r: refund, reference: booking.reference, artist: user.name })
		.from(refund)
		.innerJoin(booking, eq(booking.id, refund.bookingId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(
			and(
				eq(refund.studioId, studioId),
				inArray(
					refund.bookingId,
					db
						.select({ id: refund.bookingId })
						.from(refund)
						.where(and(eq(refund.studioId, studioId), eq(refund.status, 'failed')))
				)
			)
		);
	const unresolved = new Set(unresolvedFailures(rows.map((x) => x.r)).map((r) => r.id));
	return rows.filter((x) => unresolved.has(x.r.id)).map(refundRow);
}

/** Final invoices issued before `to` whose balance is not paid (as of now): payments/balance.ts decides what is owed. */
export async function outstandingBalances(studioId: string, to: Date): Promise<MonthReport['outstanding']> {
	const finals = await db
		.select({ doc: invoice, reference: booking.reference, artist: user.name, total: booking.total })
		.from(invoice)
		.innerJoin(booking, eq(booking.id, invoice.bookingId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(and(eq(invoice.studioId, studioId), eq(invoice.typeCode, 380), lt(invoice.issuedAt, to)));
	const rows: MonthReport['outstanding'] = [];
	for (const f of finals) {
		const { owed } = await owedOn(db, { id: f.doc.bookingId!, total: f.total });
		if (owed <= 0) continue;
		rows.push({
			bookingId: f.doc.bookingId!,
			bookingReference: f.reference,
			artist: f.artist,
			invoiceNumber: f.doc.displayNumber,
			amountDue: f.doc.amountDue,
			paid: Math.max(0, f.doc.amountDue - owed),
			owed,
			currency: f.doc.currency
		});
	}
	return rows;
}

/** A studio's month: its documents, payments and refunds, and what is still to resolve. */
export async function monthReport(studioId: string, month: string, timeZone: string, currency: string): Promise<MonthReport> {
	const { from, to } = monthRange(month, timeZone);
	// Recorded payments are dated by calendar day, so the month is its days.
	const fromDay = `${month}-01`;
	const toDay = `${addMonths(month, 1)}-01`;
	const [docs, paid, refunds, failedRefunds, outstanding, recorded] = await Promise.all([
		db
			.select({ doc: invoice, reference: booking.reference })
			.from(invoice)
			.leftJoin(booking, eq(booking.id, invoice.bookingId))
			.where(and(eq(invoice.studioId, studioId), gte(invoice.issuedAt, from), lt(invoice.issuedAt, to)))
			.orderBy(asc(invoice.issuedAt), asc(invoice.displayNumber)),
		db
			.select({ p: payment, reference: booking.reference, artist: user.name })
			.from(payment)
			.innerJoin(booking, eq(booking.id, payment.bookingId))
			.innerJoin(user, eq(user.id, booking.artistId))
			.where(and(eq(payment.studioId, studioId), eq(payment.status, 'paid'), gte(payment.paidAt, from), lt(payment.paidAt, to)))
			.orderBy(asc(payment.paidAt)),
		db
			.select({ r: refund, reference: booking.reference, artist: user.name })
			.from(refund)
			.innerJoin(booking, eq(booking.id, refund.bookingId))
			.innerJoin(user, eq(user.id, booking.artistId))
			.where(and(eq(refund.studioId, studioId), gte(refund.createdAt, from), lt(refund.createdAt, to)))
			.orderBy(asc(refund.createdAt)),
		unresolvedFailedRefunds(studioId),
		outstandingBalances(studioId, to),
		db
			.select({ r: recordedPayment, reference: booking.reference, artist: user.name })
			.from(recordedPayment)
			.innerJoin(booking, eq(booking.id, recordedPayment.bookingId))
			.innerJoin(user, eq(user.id, booking.artistId))
			.where(and(eq(recordedPayment.studioId, studioId), gte(recordedPayment.paidOn, fromDay), lt(recordedPayment.paidOn, toDay)))
			.orderBy(asc(recordedPayment.paidOn), asc(recordedPayment.createdAt))
	]);
	const byId = new Map(docs.map((d) => [d.doc.id, d.doc.displayNumber]));
	const precedingIds = docs.map((d) => d.doc.precedingInvoiceId).filter((x): x is string => !!x && !byId.has(x));
	if (precedingIds.length) {
		for (const p of await db
			.select({ id: invoice.id, n: invoice.displayNumber })
			.from(invoice)
			.where(and(eq(invoice.studioId, studioId), inArray(invoice.id, precedingIds))))
			byId.set(p.id, p.n);
	}

	const documents = docs.map(({ doc: d, reference }) => ({
		id: d.id,
		number: d.displayNumber,
		typeCode: d.typeCode,
		kind: documentKindLabel(d.typeCode),
		issuedAt: d.issuedAt.toISOString(),
		bookingId: d.bookingId,
		bookingReference: reference,
		customer: (d.customer as Party).name ?? '',
		customerVatId: (d.customer as Party).vatId ?? '',
		customerCountry: (d.customer as Party).country ?? '',
		precedingNumber: d.precedingInvoiceId ? (byId.get(d.precedingInvoiceId) ?? null) : null,
		net: d.net,
		vat: d.vatTotal,
		vatDeclared: vatLedger([{ typeCode: d.typeCode, vat: d.vatBreakdown, prepaidVat: d.prepaidVatBreakdown }]).reduce(
			(s, r) => s + r.vat,
			0
		),
		gross: d.gross,
		rounding: d.rounding,
		total: payableTotal(d),
		prepaid: d.prepaid,
		amountDue: d.amountDue,
		currency: d.currency,
		pdfUrl: `/invoices/${d.id}/pdf`
	}));
	const vatByRate = vatLedger(
		docs.map(({ doc: d }) => ({ typeCode: d.typeCode, vat: d.vatBreakdown, prepaidVat: d.prepaidVatBreakdown }))
	);
	const refundRows = refunds.map(refundRow);
	const payments: MonthReport['payments'] = [
		...paid.map(({ p, reference, artist }) => ({
			id: p.id,
			bookingId: p.bookingId,
			bookingReference: reference,
			artist,
			kind: p.kind,
			method: 'card',
			amount: p.amount,
			paidAt: p.paidAt!.toISOString(),
			paidOn: localDateOf(p.paidAt!, timeZone),
			note: '',
			currency: p.currency
		})),
		...recorded.map(({ r, reference, artist }) => ({
			id: r.id,
			bookingId: r.bookingId,
			bookingReference: reference,
			artist,
			kind: r.reversesId ? 'reversal' : 'recorded',
			method: r.method,
			amount: r.amount,
			paidAt: localToInstant(r.paidOn, 12 * 60, timeZone).instant.toISOString(),
			paidOn: r.paidOn,
			note: r.reason ?? r.note,
			currency: r.currency
		}))
	].sort((a, b) => (a.paidOn < b.paidOn ? -1 : a.paidOn > b.paidOn ? 1 : a.paidAt.localeCompare(b.paidAt)));
	return {
		month,
		currency,
		documents,
		payments,
		refunds: refundRows,
		failedRefunds,
		outstanding,
		vatByRate,
		totals: {
			invoiced: documents.filter((d) => d.typeCode === 380).reduce((s, d) => s + d.total, 0),
			deposits: documents.filter((d) => d.typeCode === 386).reduce((s, d) => s + d.total, 0),
			credited: documents.filter((d) => d.typeCode === 381).reduce((s, d) => s + d.total, 0),
			received: payments.reduce((s, x) => s + x.amount, 0),
			recorded: recorded.reduce((s, x) => s + x.r.amount, 0),
			refunded: refundRows.filter((r) => r.status === 'succeeded').reduce((s, r) => s + r.amount, 0),
			owed: outstanding.reduce((s, o) => s + o.owed, 0),
			vat: vatByRate.reduce((s, r) => s + r.vat, 0)
		}
	};
}

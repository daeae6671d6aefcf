// Payments the owner records by hand (cash at the desk, a bank transfer) and their reversals. Only
// the owner of the booking's own studio records or reverses one; the rules are
// $lib/domain/recorded-payments.ts. Each entry is written under the booking's row lock, so the
// amount owed it is checked against cannot change meanwhile (a Checkout balance arriving at the
// same moment waits, then finds less owed and refunds what is over: state.ts). Entries are never
// changed: the database refuses UPDATE and DELETE (drizzle/0011_session_lifecycle.sql).
//
// A recorded payment is not a VAT event of its own: the VAT of the session is on its invoices
// (the deposit invoice when the deposit came, the final invoice for the rest, Directive
// 2006/112/EC Articles 63, 65 and 66). Recording cash only settles what is owed; a final invoice
// issued later shows it as paid (EN 16931 BT-113, invoices/documents.ts).
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { db } from '../db';
import { booking, recordedPayment, studio } from '../db/schema';
import type { SessionUser } from '../auth';
import { roleAt } from '../bookings/read';
import { queueReceipt } from '../mail/receipt';
import { inTransaction, lockBooking, pgCode } from './core';
import { auditTx } from './state';
import { owedOn, recordedOf, type RecordedRow } from './balance';
import {
	acceptsRecordedPayment,
	NOTE_MAX,
	RECORDED_METHODS,
	recordRefusals,
	reversalOf,
	type RecordRefusal
} from '$lib/domain/recorded-payments';
import { formatMoney } from '$lib/domain/money';
import { payableTotal } from '$lib/domain/invoice';
import { localDateOf } from '$lib/domain/time';
import { dateProblem, multilineText } from '$lib/schemas/input';

/** The JSON API's body: the amount in integer minor units, as every amount the API takes. */
export const recordSchema = z.object({
	amount: z
		.number({ error: 'Give the amount in minor units (cents), e.g. 15000 for 150.00.' })
		.int({ error: 'Give the amount in whole minor units (cents).' })
		.positive({ error: 'The amount must be more than 0.' })
		.max(Number.MAX_SAFE_INTEGER, { error: 'That amount is too large.' }),
	method: z.enum(RECORDED_METHODS, { error: 'Choose cash or bank_transfer.' }),
	paidOn: z.string({ error: 'Give the day it was paid, e.g. 2027-03-12.' }).superRefine((text, ctx) => {
		const problem = dateProblem(text);
		if (problem) ctx.addIssue({ code: 'custom', message: problem });
	}),
	note: multilineText()
		.trim()
		.max(NOTE_MAX, { error: `Keep the note under ${NOTE_MAX} characters.` })
		.optional()
		.default('')
});

export const reverseSchema = z.object({
	reason: multilineText({ error: 'Say why this payment is reversed.' })
		.trim()
		.min(1, { error: 'Say why this payment is reversed.' })
		.max(NOTE_MAX, { error: `Keep the reason under ${NOTE_MAX} characters.` })
});

export type RecordedRefusal = {
	ok: false;
	status: 403 | 404 | 409 | 422;
	code: string;
	message: string;
	fields?: Record<string, string[]>;
	/** On an overpayment: what is owed (minor units). */
	owed?: number;
};

/** An entry as the API and the booking page show it. */
export interface RecordedEntryView {
	id: string;
	bookingId: string;
	amount: number;
	currency: string;
	method: string;
	paidOn: string;
	note: string;
	reversesId: string | null;
	reason: string | null;
	/** Whether a later entry reverses this one. */
	reversed: boolean;
	recordedAt: string;
}

export function entryView(r: RecordedRow, all: readonly RecordedRow[]): RecordedEntryView {
	return {
		id: r.id,
		bookingId: r.bookingId,
		amount: r.amount,
		currency: r.currency,
		method: r.method,
		paidOn: r.paidOn,
		note: r.note,
		reversesId: r.reversesId,
		reason: r.reason,
		reversed: all.some((o) => o.reversesId === r.id),
		recordedAt: r.createdAt.toISOString()
	};
}

const notFound: RecordedRefusal = { ok: false, status: 404, code: 'not_found', message: 'No such booking.' };

/**
 * The owner of the booking's own studio may; the booking's artist and the rest of its team are
 * refused (403: they know the booking); anyone else gets a 404, as for closing a session.
 */
async function ownerOf(actor: SessionUser, bookingId: string): Promise<{ ok: true; studioId: string } | RecordedRefusal> {
	const [head] = await db
		.select({ studioId: booking.studioId, artistId: booking.artistId })
		.from(booking)
		.where(eq(booking.id, bookingId));
	if (!head) return notFound;
	const role = await roleAt(actor.id, head.studioId);
	if (role === 'owner') return { ok: true, studioId: head.studioId };
	if (role === 'artist' && head.artistId !== actor.id) return notFound;
	return { ok: false, status: 403, code: 'forbidden', message: 'Only the studio’s owner records payments.' };
}

function invalid(issues: z.core.$ZodIssue[]): RecordedRefusal {
	const fields: Record<string, string[]> = {};
	for (const issue of issues) (fields[String(issue.path[0] ?? '_')] ??= []).push(issue.message);
	return { ok: false, status: 422, code: 'invalid', message: 'Some details need another look.', fields };
}

function refusalWords(r: RecordRefusal, currency: string): string {
	switch (r.code) {
		case 'not_positive':
			return 'The amount must be more than 0.';
		case 'overpayment':
			return r.owed > 0
				? `Only ${formatMoney(r.owed, currency)} is owed on this booking; record at most that.`
				: 'Nothing is owed on this booking.';
		case 'future':
			return 'The day paid cannot be after today (studio time).';
		case 'before_booking':
			return 'The day paid cannot be before the booking was made.';
	}
}

export type RecordOutcome = { ok: true; entry: RecordedEntryView; owed: number } | RecordedRefusal;

/** Records a payment taken outside Checkout: 201 with the entry, or why not. */
export async function recordPayment(
	actor: SessionUser,
	bookingId: string,
	input: unknown,
	now = new Date()
): Promise<RecordOutcome> {
	const who = await ownerOf(actor, bookingId);
	if (!who.ok) return who;
	const parsed = recordSchema.safeParse(input);
	if (!parsed.success) return invalid(parsed.error.issues);
	const { amount, method, paidOn, note } = parsed.data;
	return inTransaction<RecordOutcome>(async (tx) => {
		const b = await lockBooking(tx, bookingId);
		if (!b) return notFound;
		if (!acceptsRecordedPayment(b.status)) {
			return {
				ok: false,
				status: 409,
				code: 'not_accepting',
				message:
					b.status === 'no_show'
						? 'A no-show keeps its deposit and bills nothing more: there is no payment to record.'
						: 'Payments are recorded on a confirmed or completed booking only.'
			};
		}
		const [place] = await tx.select({ timeZone: studio.timeZone }).from(studio).where(eq(studio.id, b.studioId));
		const tz = place!.timeZone;
		const before = await owedOn(tx, b);
		const refusals = recordRefusals({
			amount,
			paidOn,
			owed: before.owed,
			today: localDateOf(now, tz),
			bookedOn: localDateOf(b.createdAt, tz)
		});
		if (refusals.length) {
			const fields: Record<string, string[]> = {};
			for (const r of refusals) (fields[r.field] ??= []).push(refusalWords(r, b.currency));
			const over = refusals.find((r) => r.code === 'overpayment');
			return {
				ok: false,
				status: 422,
				code: over ? 'overpayment' : 'invalid',
				message: over ? refusalWords(over, b.currency) : 'Some details need another look.',
				fields,
				...(over ? { owed: before.owed } : {})
			};
		}
		const [row] = await tx
			.insert(recordedPayment)
			.values({ studioId: b.studioId, bookingId: b.id, amount, currency: b.currency, method, paidOn, note, recordedBy: actor.id })
			.returning();
		await auditTx(tx, 'payment.recorded', b.id, { recordedId: row!.id, amount, method, paidOn }, actor.id);
		await queueReceipt(tx, { bookingId: b.id, paymentId: row!.id, amount, method, paidOn });
		const all = [...before.recorded, row!];
		return { ok: true, entry: entryView(row!, all), owed: before.owed - amount };
	});
}

/** Reverses a recorded payment with a reason: a negative entry for its whole amount, once (409 after). */
export async function reversePayment(
	actor: SessionUser,
	bookingId: string,
	recordedId: string,
	input: unknown,
	now = new Date()
): Promise<RecordOutcome> {
	const who = await ownerOf(actor, bookingId);
	if (!who.ok) return who;
	const parsed = reverseSchema.safeParse(input);
	if (!parsed.success) return invalid(parsed.error.issues);
	try {
		return await inTransaction<RecordOutcome>(async (tx) => {
			const b = await lockBooking(tx, bookingId);
			if (!b) return notFound;
			const entries = await recordedOf(tx, b.id);
			const original = entries.find((e) => e.id === recordedId);
			if (!original) return { ok: false, status: 404, code: 'not_found', message: 'No such recorded payment on this booking.' };
			const reversal = reversalOf(original, entries);
			if (!reversal.ok) {
				return reversal.code === 'already_reversed'
					? { ok: false, status: 409, code: 'already_reversed', message: 'This payment has been reversed already.' }
					: { ok: false, status: 409, code: 'is_reversal', message: 'A reversal is not reversed; record the payment again.' };
			}
			const [place] = await tx.select({ timeZone: studio.timeZone }).from(studio).where(eq(studio.id, b.studioId));
			// The reversal is dated the day it is recorded, in the studio's calendar.
			const paidOn = localDateOf(now, place!.timeZone);
			const [row] = await tx
				.insert(recordedPayment)
				.values({
					studioId: b.studioId,
					bookingId: b.id,
					amount: reversal.amount,
					currency: original.currency,
					method: original.method,
					paidOn,
					reversesId: original.id,
					reason: parsed.data.reason,
					recordedBy: actor.id
				})
				.returning();
			await auditTx(tx, 'payment.recorded_reversed', b.id, { recordedId: row!.id, reverses: original.id }, actor.id);
			await queueReceipt(tx, {
				bookingId: b.id,
				paymentId: row!.id,
				amount: reversal.amount,
				method: original.method as 'cash' | 'bank_transfer',
				paidOn,
				reversal: { reason: parsed.data.reason }
			});
			const all = [...entries, row!];
			const { owed } = await owedOn(tx, b);
			return { ok: true, entry: entryView(row!, all), owed };
		});
	} catch (e) {
		// Two reversals of one entry at once: the unique index on reverses_id lets one through.
		if (pgCode(e).code === '23505') {
			return { ok: false, status: 409, code: 'already_reversed', message: 'This payment has been reversed already.' };
		}
		throw e;
	}
}

/** A booking's recorded entries as the viewer's panel and JSON show them (the caller has checked they may see the booking). */
export async function recordedEntries(bookingId: string): Promise<RecordedEntryView[]> {
	const rows = await recordedOf(db, bookingId);
	return rows.map((r) => entryView(r, rows));
}

/**
 * A booking's money as its JSON gives it to everyone who may see the booking: paid by card (less
 * nothing), recorded by hand (less reversals), refunded, still owed, and the recorded entries.
 */
export async function moneyFigures(b: { id: string; total: number }) {
	const owing = await owedOn(db, b);
	return {
		money: {
			paidByCard: owing.state.paid,
			recorded: owing.recordedTotal,
			refunded: owing.state.refunded,
			invoiced: owing.final ? payableTotal(owing.final) : null,
			balanceOwed: owing.owed
		},
		recordedPayments: owing.recorded.map((r) => entryView(r, owing.recorded))
	};
}

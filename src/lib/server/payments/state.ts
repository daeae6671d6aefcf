// What a payment fact does to a booking. Called from the webhook (and the payments job when it
// reconciles), always inside a transaction that holds the booking's row lock, and written so
// that a fact applied twice, or two events carrying one fact, or facts in any order end in one
// state (Stripe docs, "Webhooks": delivery at least once, in no guaranteed order):
//
// - a payment only moves forward: open → processing → paid, open/processing → failed or expired;
//   nothing moves a paid payment back, so `expired` after `completed` changes nothing;
// - a booking is confirmed once, by its first paid deposit, and issues one deposit invoice;
// - a deposit that arrives for a booking that can no longer take it (the hold ran out and the slot
//   was taken, the booking was cancelled, or a deposit was already paid) is refunded in full,
//   automatically. Whether a freed slot is still free is for the exclusion constraints to say.
import { and, eq, isNull, sql } from 'drizzle-orm';
import { auditLog, booking, invoice, payment, refund, studio } from '../db/schema';
import { issueCreditNote, issueDepositInvoice } from '../invoices/documents';
import {
	isLiveDeposit,
	lockBooking,
	paymentsOf,
	pgCode,
	refundsOf,
	setBookingStatus,
	type AfterCommit,
	type BookingRow,
	type PaymentRow,
	type RefundRow,
	type Tx
} from './core';
import { queueConfirmation } from '../mail';
import { syncBookingMessagesQuietly } from '../messages';
import { queueReceipt } from '../mail/receipt';
import { owedOn } from './balance';
import { sendRefund } from './refunds';
import { expireAndReconcile } from './jobs';
import type Stripe from 'stripe';
import { formatMoney, fromStripeAmount, toStripeAmount } from '$lib/domain/money';
import { awaitsDeposit } from '$lib/domain/lifecycle';
import { isUuid } from '$lib/uuid';
import { moveArrived, moveUnpaid } from '../bookings/move';
import { localDateOf } from '$lib/domain/time';

export async function auditTx(tx: Tx, action: string, bookingId: string, data: unknown, actorId: string | null = null) {
	await tx.insert(auditLog).values({
		studioId: sql`(select ${booking.studioId} from ${booking} where ${booking.id} = ${bookingId})`,
		actorId,
		action,
		entity: 'booking',
		entityId: bookingId,
		data: data ?? null
	});
}

function paymentIntentOf(session: Pick<Stripe.Checkout.Session, 'payment_intent'>): string | null {
	const pi = session.payment_intent;
	if (!pi) return null;
	return typeof pi === 'string' ? pi : pi.id;
}

/** The payment row of a Checkout Session: by session id, else by the paymentId we put in its metadata. */
async function paymentForSession(tx: Tx, session: Stripe.Checkout.Session): Promise<PaymentRow | undefined> {
	const [bySession] = await tx.select().from(payment).where(eq(payment.checkoutSessionId, session.id));
	if (bySession) return bySession;
	const paymentId = session.metadata?.paymentId;
	const bookingId = session.metadata?.bookingId;
	if (!paymentId || !isUuid(paymentId) || !bookingId || !isUuid(bookingId)) return undefined;
	const [byMeta] = await tx
		.select()
		.from(payment)
		.where(and(eq(payment.id, paymentId), eq(payment.bookingId, bookingId), isNull(payment.checkoutSessionId)));
	return byMeta;
}

export type SessionFact = 'completed' | 'async_succeeded' | 'async_failed' | 'expired';

const MISMATCH_PREFIX = 'Stripe reported a payment of';

/**
 * What Stripe says was charged differs from what this payment asked for (another amount or
 * currency): a description of the difference, or null when they agree. Compared in Stripe's own
 * units (toStripeAmount), as the session was made.
 */
export function amountMismatch(
	session: Pick<Stripe.Checkout.Session, 'amount_total' | 'currency'>,
	p: Pick<PaymentRow, 'amount' | 'currency'>
): string | null {
	const expected = toStripeAmount(p.amount, p.currency);
	const currency = (session.currency ?? '').toUpperCase();
	if (session.amount_total === expected && currency === p.currency.toUpperCase()) return null;
	let reported = `${session.amount_total ?? 'no amount'} ${currency || '(no currency)'} in Stripe's units`;
	try {
		if (typeof session.amount_total === 'number' && /^[A-Z]{3}$/.test(currency)) {
			reported = formatMoney(fromStripeAmount(session.amount_total, currency), currency);
		}
	} catch {
		// An amount or currency we cannot read: shown as Stripe wrote it.
	}
	return `${MISMATCH_PREFIX} ${reported} where ${formatMoney(p.amount, p.currency)} was asked. Nothing was confirmed: check this payment at Stripe and refund it there.`;
}

/**
 * An event changes a payment or refund only when it comes from the account that payment was made
 * on (Stripe docs, "Connect webhooks": a connected account's event carries `account`; the
 * platform's own carry none, and match payments made before Connect). `eventAccount` is undefined
 * when the object was looked up on the payment's own account rather than delivered.
 */
function fromOtherAccount(rowAccount: string | null, eventAccount: string | null | undefined): boolean {
	return eventAccount !== undefined && (rowAccount ?? null) !== eventAccount;
}

export const OTHER_ACCOUNT = 'other_account';

/**
 * Applies what a Checkout Session event says; returns a word for the log and the webhook's answer.
 * `paidAt` is when Stripe took the money (the event's `created`, or the charge's time), not when
 * we heard of it: deliveries can be late by days, and the deposit invoice states the date of the
 * payment on account (Directive 2006/112/EC, Article 226(7)). `eventAccount`: the event's
 * account (null for the platform's), when the session came in an event.
 */
export async function applySession(
	tx: Tx,
	session: Stripe.Checkout.Session,
	fact: SessionFact,
	after: AfterCommit,
	paidAt?: Date,
	eventAccount?: string | null
): Promise<string> {
	const found = await paymentForSession(tx, session);
	if (!found) return 'unknown_session';
	if (fromOtherAccount(found.stripeAccountId, eventAccount)) return OTHER_ACCOUNT;
	const b = await lockBooking(tx, found.bookingId);
	if (!b) return 'unknown_booking';
	const [p] = await tx.select().from(payment).where(eq(payment.id, found.id)).for('update');
	if (!p) return 'unknown_session';
	if (!p.checkoutSessionId) {
		await tx
			.update(payment)
			.set({ checkoutSessionId: session.id, checkoutUrl: session.url ?? null })
			.where(eq(payment.id, p.id));
	}
	if (fact === 'completed' || fact === 'async_succeeded') {
		// The money Stripe took must be the money we asked for, or nothing is confirmed.
		const mismatch = amountMismatch(session, p);
		if (mismatch) return markMismatch(tx, b, p, session, mismatch);
	}
	switch (fact) {
		case 'completed':
			// Checkout fulfilment (Stripe docs): a completed session may still be unpaid for delayed methods.
			if (session.payment_status === 'paid' || session.payment_status === 'no_payment_required') {
				return markPaid(tx, b, p, session, after, paidAt);
			}
			return markProcessing(tx, b, p);
		case 'async_succeeded':
			return markPaid(tx, b, p, session, after, paidAt);
		case 'async_failed':
			return markEnded(tx, b, p, 'failed', 'The delayed payment failed.');
		case 'expired':
			return markEnded(tx, b, p, 'expired', null);
	}
}

async function markPaid(
	tx: Tx,
	b: BookingRow,
	p: PaymentRow,
	session: Stripe.Checkout.Session,
	after: AfterCommit,
	paidAt: Date = new Date()
): Promise<string> {
	if (p.status === 'paid') return 'already_paid';
	const [paid] = await tx
		.update(payment)
		.set({
			status: 'paid',
			paidAt,
			paymentIntentId: paymentIntentOf(session) ?? p.paymentIntentId,
			failureReason: null
		})
		.where(eq(payment.id, p.id))
		.returning();
	await auditTx(tx, `payment.${p.kind}.paid`, b.id, { paymentId: p.id, amount: p.amount, session: session.id });
	const outcome = await (p.kind === 'move'
		? moveArrived(tx, b, paid!, after)
		: p.kind === 'deposit'
			? depositArrived(tx, b, paid!, after)
			: balanceArrived(tx, b, paid!, after));
	// Every payment that becomes paid gets its receipt, once (keyed by the payment; this point is
	// reached once per payment, and the key holds however often the webhook comes). Money that
	// goes straight back is refunded by its own flow; the receipt still says what came in.
	const [studioRow] = await tx.select({ timeZone: studio.timeZone }).from(studio).where(eq(studio.id, b.studioId));
	await queueReceipt(tx, {
		bookingId: b.id,
		paymentId: p.id,
		amount: p.amount,
		method: 'card',
		paidOn: localDateOf(paidAt, studioRow?.timeZone ?? 'UTC')
	});
	return outcome;
}

/** Tries to put a freed booking back in the calendar; false when its slot has gone (SQLSTATE 23P01). */
async function revive(tx: Tx, bookingId: string, status: 'confirmed' | 'pending'): Promise<boolean> {
	try {
		await tx.transaction(async (sp) => {
			await sp.update(booking).set({ status, holdExpiresAt: null }).where(eq(booking.id, bookingId));
		});
		return true;
	} catch (e) {
		if (pgCode(e).code === '23P01') return false;
		throw e;
	}
}

async function depositArrived(tx: Tx, b: BookingRow, p: PaymentRow, after: AfterCommit): Promise<string> {
	const otherPaid = (await paymentsOf(tx, b.id)).some((x) => x.kind === 'deposit' && x.status === 'paid' && x.id !== p.id);
	if (otherPaid || b.status === 'confirmed' || b.status === 'completed' || b.status === 'no_show') {
		await queueRefund(tx, after, { booking: b, payment: p, amount: p.amount, reason: 'duplicate' });
		return 'refunded_duplicate';
	}
	if (b.status === 'cancelled') {
		if (p.refundOnArrival !== null) return settledAfterCancellation(tx, b, p, after);
		await queueRefund(tx, after, { booking: b, payment: p, amount: p.amount, reason: 'cancelled_before_payment' });
		return 'refunded_cancelled';
	}
	if (b.status === 'expired') {
		// The hold ran out before the payment came (a Checkout Session lives at least 30 minutes).
		if (!(await revive(tx, b.id, 'confirmed'))) {
			await queueRefund(tx, after, { booking: b, payment: p, amount: p.amount, reason: 'slot_unavailable' });
			await auditTx(tx, 'booking.late_payment_refunded', b.id, { paymentId: p.id });
			return 'refunded_slot_unavailable';
		}
		await auditTx(tx, 'booking.confirmed_late', b.id, { paymentId: p.id });
	} else {
		await setBookingStatus(tx, b, 'confirmed', { holdExpiresAt: null });
	}
	await confirmed(tx, b, p, after);
	return 'confirmed';
}

/**
 * A delayed deposit that was on its way when the booking was cancelled has arrived: it is a
 * payment on account for that booking (its invoice, Directive 2006/112/EC Article 65), and what
 * the cancellation preview said goes back of it (refundOnArrival, by the ladder at the moment of
 * cancelling) is refunded; the credit note follows the refund.
 */
async function settledAfterCancellation(tx: Tx, b: BookingRow, p: PaymentRow, after: AfterCommit): Promise<string> {
	const back = Math.min(p.amount, Math.max(0, p.refundOnArrival ?? p.amount));
	await issueDepositInvoice(tx, { paymentId: p.id });
	if (back > 0) await queueRefund(tx, after, { booking: b, payment: p, amount: back, reason: 'cancellation' });
	await auditTx(tx, 'booking.cancelled_payment_settled', b.id, { paymentId: p.id, refund: back, kept: p.amount - back });
	return back > 0 ? 'refunded_by_cancellation' : 'kept_by_cancellation';
}

async function confirmed(tx: Tx, b: BookingRow, p: PaymentRow, after: AfterCommit) {
	await issueDepositInvoice(tx, { paymentId: p.id });
	await auditTx(tx, 'booking.confirmed', b.id, { paymentId: p.id });
	// The confirmation e-mail is queued in the transaction that confirms, so it exists exactly once with it.
	await queueConfirmation(tx, b.id);
	// Its reminders are planned once the confirmation has committed.
	after.push(() => syncBookingMessagesQuietly(b.id));
	// Other open deposit sessions of this booking can no longer be wanted.
	for (const other of await paymentsOf(tx, b.id)) {
		if (other.kind === 'deposit' && other.status === 'open' && other.checkoutSessionId && other.id !== p.id) {
			const id = other.checkoutSessionId;
			after.push(() => expireAndReconcile(id, other.stripeAccountId));
		}
	}
}

async function balanceArrived(tx: Tx, b: BookingRow, p: PaymentRow, after: AfterCommit): Promise<string> {
	const [final] = await tx
		.select()
		.from(invoice)
		.where(eq(invoice.sourceKey, `final:${b.id}`));
	const paidBalance = (await paymentsOf(tx, b.id))
		.filter((x) => x.kind === 'balance' && x.status === 'paid')
		.reduce((s, x) => s + x.amount, 0);
	// A balance request not yet sent is no longer wanted once the balance is paid.
	after.push(() => syncBookingMessagesQuietly(b.id));
	// Paid beyond the final invoice: by card twice, or by card while the owner recorded cash at the
	// desk. What is over goes back to the card.
	const over = final ? -(await owedOn(tx, b)).shortfall : paidBalance;
	if (over > 0) {
		await queueRefund(tx, after, { booking: b, payment: p, amount: Math.min(over, p.amount), reason: 'duplicate' });
		return 'refunded_overpayment';
	}
	return 'balance_paid';
}

/**
 * Stripe reports another amount or currency than the payment asked for: the payment is not taken
 * as paid and the booking is not confirmed; the owner sees why on the booking and in the log.
 * The webhook still answers 2xx: Stripe retrying the same event would not change its amount.
 */
async function markMismatch(
	tx: Tx,
	b: BookingRow,
	p: PaymentRow,
	session: Stripe.Checkout.Session,
	reason: string
): Promise<string> {
	if (p.status === 'paid') return 'already_paid';
	if (p.status === 'failed' && p.failureReason?.startsWith(MISMATCH_PREFIX)) return 'amount_mismatch';
	await tx
		.update(payment)
		.set({ status: 'failed', failureReason: reason, paymentIntentId: paymentIntentOf(session) ?? p.paymentIntentId })
		.where(eq(payment.id, p.id));
	await auditTx(tx, 'payment.amount_mismatch', b.id, {
		paymentId: p.id,
		session: session.id,
		asked: { amount: p.amount, currency: p.currency },
		reported: { amount: session.amount_total ?? null, currency: session.currency ?? null }
	});
	if (p.kind === 'deposit' && awaitsDeposit(b.status)) {
		const live = (await paymentsOf(tx, b.id)).some((x) => x.id !== p.id && isLiveDeposit(x));
		if (!live) await setBookingStatus(tx, b, 'expired');
	}
	return 'amount_mismatch';
}

async function markProcessing(tx: Tx, b: BookingRow, p: PaymentRow): Promise<string> {
	if (p.status !== 'open') return `already_${p.status}`;
	await tx.update(payment).set({ status: 'processing' }).where(eq(payment.id, p.id));
	if (p.kind === 'deposit') {
		// A delayed method (bank debit): the slot stays the artist's while the money is on its way.
		if (b.status === 'held') await setBookingStatus(tx, b, 'pending', { holdExpiresAt: null });
		else if (b.status === 'expired') await revive(tx, b.id, 'pending'); // if the slot has gone, the settled payment is refunded
	}
	return 'processing';
}

async function markEnded(
	tx: Tx,
	b: BookingRow,
	p: PaymentRow,
	status: 'failed' | 'expired',
	reason: string | null
): Promise<string> {
	if (p.status === 'paid' || p.status === 'failed' || p.status === 'expired') return `already_${p.status}`;
	await tx.update(payment).set({ status, failureReason: reason }).where(eq(payment.id, p.id));
	// A move whose payment did not come is given up; the booking keeps its slot.
	if (p.kind === 'move') await moveUnpaid(tx, b, p);
	if (p.kind === 'deposit' && awaitsDeposit(b.status)) {
		const live = (await paymentsOf(tx, b.id)).some((x) => x.id !== p.id && isLiveDeposit(x));
		if (!live) {
			// The deposit did not come: the slot goes back to the calendar.
			await setBookingStatus(tx, b, 'expired');
			await auditTx(tx, 'booking.expired_unpaid', b.id, { paymentId: p.id, status });
			return `${status}_booking_expired`;
		}
	}
	return status;
}

export interface QueueRefund {
	booking: Pick<BookingRow, 'id' | 'studioId' | 'currency'>;
	payment: Pick<PaymentRow, 'id'>;
	amount: number;
	reason: 'cancellation' | 'slot_unavailable' | 'cancelled_before_payment' | 'duplicate' | 'move';
	requestedBy?: string | null;
}

/**
 * Records a refund to make and sends it after commit. Its Idempotency-Key comes from the booking,
 * the payment and how many refunds that payment already has: the same click or retry makes one
 * refund at Stripe; a deliberate new attempt (after a failure) makes a new one.
 */
export async function queueRefund(tx: Tx, after: AfterCommit, r: QueueRefund): Promise<RefundRow> {
	// A refund comes out of the account its payment was made on.
	const [paid] = await tx.select({ accountId: payment.stripeAccountId }).from(payment).where(eq(payment.id, r.payment.id));
	const [{ n } = { n: 0 }] = await tx
		.select({ n: sql<number>`count(*)::int` })
		.from(refund)
		.where(eq(refund.paymentId, r.payment.id));
	const [row] = await tx
		.insert(refund)
		.values({
			studioId: r.booking.studioId,
			bookingId: r.booking.id,
			paymentId: r.payment.id,
			amount: r.amount,
			currency: r.booking.currency,
			status: 'pending',
			reason: r.reason,
			requestedBy: r.requestedBy ?? null,
			stripeAccountId: paid?.accountId ?? null,
			idempotencyKey: `slateroom-refund-${r.booking.id}-${r.payment.id}-${n + 1}`
		})
		.returning();
	after.push(() => sendRefund(row!.id));
	return row!;
}

/**
 * Applies what Stripe says about a refund (its create answer, a look-up, refund.created/updated/
 * failed). `eventAccount` as for applySession: an event from another account changes nothing.
 */
export async function applyRefundObject(
	tx: Tx,
	r: Pick<Stripe.Refund, 'id' | 'status' | 'metadata' | 'failure_reason'>,
	eventAccount?: string | null
): Promise<string> {
	let [row] = await tx.select().from(refund).where(eq(refund.stripeRefundId, r.id));
	if (!row) {
		const refundId = r.metadata?.refundId;
		if (!refundId || !isUuid(refundId)) return 'unknown_refund';
		[row] = await tx
			.select()
			.from(refund)
			.where(and(eq(refund.id, refundId), isNull(refund.stripeRefundId)));
		if (!row) return 'unknown_refund';
	}
	if (fromOtherAccount(row.stripeAccountId, eventAccount)) return OTHER_ACCOUNT;
	await lockBooking(tx, row.bookingId);
	const [cur] = await tx.select().from(refund).where(eq(refund.id, row.id)).for('update');
	if (!cur) return 'unknown_refund';
	if (!cur.stripeRefundId) {
		await tx
			.update(refund)
			.set({ stripeRefundId: r.id, sentAt: cur.sentAt ?? new Date() })
			.where(eq(refund.id, cur.id));
	}
	const target = r.status === 'succeeded' ? 'succeeded' : r.status === 'failed' || r.status === 'canceled' ? 'failed' : 'pending';
	// A failed refund is final (Stripe docs, "Refunds": refund.failed); pending never overwrites an outcome.
	if (cur.status === 'failed' || target === 'pending' || target === cur.status) return `refund_${cur.status}`;
	if (target === 'succeeded') {
		await tx.update(refund).set({ status: 'succeeded', failureReason: null }).where(eq(refund.id, cur.id));
		const note = await issueCreditNote(tx, { refundId: cur.id });
		await auditTx(tx, 'refund.succeeded', cur.bookingId, { refundId: cur.id, creditNote: note?.displayNumber ?? null });
		return note ? 'refund_succeeded_credit_note' : 'refund_succeeded';
	}
	await tx
		.update(refund)
		.set({ status: 'failed', failureReason: r.failure_reason ?? 'failed' })
		.where(eq(refund.id, cur.id));
	await auditTx(tx, 'refund.failed', cur.bookingId, { refundId: cur.id, reason: r.failure_reason ?? null });
	return 'refund_failed';
}

/** Failed refunds nobody has tried again yet (no later refund of the same payment): to resolve. */
export function unresolvedFailures(refunds: readonly RefundRow[]): RefundRow[] {
	return refunds.filter(
		(r) => r.status === 'failed' && !refunds.some((o) => o.paymentId === r.paymentId && o.createdAt > r.createdAt)
	);
}

export { refundsOf };

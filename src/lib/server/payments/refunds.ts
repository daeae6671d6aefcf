// Cancelling a booking and refunding by the policy, and sending refunds to Stripe.
//
// The refund is decided and recorded in the transaction that cancels (under the booking's row
// lock, so a double click cancels once and records one refund), then sent to Stripe after commit
// with an Idempotency-Key from the booking and the payment (Stripe docs, "Idempotent requests").
// Stripe may answer `pending` and fail later (refund.failed): the refund row follows what Stripe
// says (state.ts), a credit note is issued only once the money has gone back, and a failed refund
// stays visible to the owner and the accountant until someone tries again.
//
// A refund comes out of the account its payment was made on (payment.stripeAccountId: the
// studio's connected account; null, the platform's own, for payments made before Connect), and
// every call about it runs there.
import { and, asc, eq, isNull, isNotNull, lt } from 'drizzle-orm';
import type Stripe from 'stripe';
import { db } from '../db';
import { booking, payment, refund } from '../db/schema';
import { getPolicy } from '../studio';
import type { SessionUser } from '../auth';
import { actorAt } from '../bookings/read';
import {
	eachIsolated,
	inTransaction,
	isMissing,
	loadMoneyState,
	lockBooking,
	setBookingStatus,
	type BookingRow,
	type MoneyState,
	type PaymentRow,
	type RefundRow
} from './core';
import { applyRefundObject, auditTx, queueRefund, unresolvedFailures } from './state';
import { expireSession } from './checkout';
import { onAccount, stripe } from './stripe';
import { queueCancellation } from '../mail';
import { syncBookingMessagesQuietly } from '../messages';
import { refundForCancellation } from '$lib/domain/pricing';
import { isCancellable } from '$lib/domain/lifecycle';
import { toStripeAmount } from '$lib/domain/money';

export interface CancellationFact {
	bookingId: string;
	/** The status the booking had before it was cancelled. */
	was: string;
	/** What the ladder gives back now, in minor units, and the rung that decided it. */
	refund: number;
	rule: string;
	/** What was paid and stays with the studio. */
	retained: number;
}

/**
 * Who may cancel: the booking's artist and its studio's owner; another artist's booking is not
 * theirs to know of, nor is another studio's. `actor` is the person as they stand at the
 * booking's studio (`actorAt`).
 */
export function cancelAccess(actor: SessionUser, b: Pick<BookingRow, 'artistId'>): 'ok' | 'not_found' | 'forbidden' {
	if (actor.role === 'owner') return 'ok';
	if (actor.role === 'artist') return b.artistId === actor.id ? 'ok' : 'not_found';
	return 'forbidden';
}

/** The studio a booking belongs to and its artist, read before a transaction that needs its policy. */
async function studioOf(bookingId: string): Promise<{ studioId: string; artistId: string } | undefined> {
	const [row] = await db
		.select({ studioId: booking.studioId, artistId: booking.artistId })
		.from(booking)
		.where(eq(booking.id, bookingId));
	return row;
}

export interface CancellationPreview {
	cancellable: boolean;
	status: string;
	/** What would be refunded now, minor units. */
	refund: number;
	currency: string;
	/** Notice from now to the start, hours (2 decimals, floored). */
	noticeHours: number;
	/** The rung of the ladder that applies, in words. */
	rule: string;
	/** What the studio holds for the booking: paid − refunded. */
	paid: number;
	/**
	 * A deposit still on its way (a delayed bank payment): its amount, and how much of it goes back
	 * when it arrives after the cancellation (the same ladder, at the same moment). Null when none.
	 */
	onArrival: { amount: number; refund: number } | null;
}

/** Deposits on their way (processing) and the ladder's refund on them if they arrive. */
function onArrivalOf(
	state: MoneyState,
	b: Pick<BookingRow, 'deposit' | 'startsAt'>,
	now: Date,
	policy: Parameters<typeof refundForCancellation>[0]['policy'],
	refundNow: number
): { amount: number; refund: number; payments: PaymentRow[] } | null {
	const coming = state.payments.filter((p) => p.kind === 'deposit' && p.status === 'processing');
	const amount = coming.reduce((s, p) => s + p.amount, 0);
	if (amount <= 0) return null;
	const whenAll = refundForCancellation({
		paid: state.held + amount,
		deposit: b.deposit,
		bookingStart: b.startsAt,
		cancelledAt: now,
		policy
	});
	const refund = Math.min(amount, Math.max(0, whenAll.refund - refundNow));
	return { amount, refund, payments: coming };
}

export async function previewCancellation(b: BookingRow, now = new Date()): Promise<CancellationPreview> {
	const [{ policy }, state] = await Promise.all([getPolicy(b.studioId), loadMoneyState(db, b.id)]);
	const r = refundForCancellation({ paid: state.held, deposit: b.deposit, bookingStart: b.startsAt, cancelledAt: now, policy });
	const coming = onArrivalOf(state, b, now, policy, r.refund);
	return {
		cancellable: isCancellable(b.status),
		status: b.status,
		refund: r.refund,
		currency: b.currency,
		noticeHours: r.noticeHours,
		rule: r.rungLabel,
		paid: state.held,
		onArrival: coming && { amount: coming.amount, refund: coming.refund }
	};
}

export type CancelOutcome =
	| { ok: true; already: boolean; preview: CancellationPreview; refunds: RefundRow[] }
	| { ok: false; status: 404 | 403 | 409; code: string; message: string };

export async function cancelBooking(
	actor: SessionUser,
	bookingId: string,
	input: { reason?: string } = {},
	now = new Date()
): Promise<CancelOutcome> {
	const of = await studioOf(bookingId);
	if (!of) return { ok: false, status: 404, code: 'not_found', message: 'No such booking.' };
	// The booking's own studio's ladder, and the person's role there.
	const [{ policy }, as] = await Promise.all([getPolicy(of.studioId), actorAt(actor, of.studioId)]);
	const result = await inTransaction<CancelOutcome>(async (tx, after) => {
		const b = await lockBooking(tx, bookingId);
		if (!b) return { ok: false, status: 404, code: 'not_found', message: 'No such booking.' };
		const access = cancelAccess(as, b);
		if (access === 'not_found') return { ok: false, status: 404, code: 'not_found', message: 'No such booking.' };
		if (access === 'forbidden')
			return { ok: false, status: 403, code: 'forbidden', message: 'Only the artist or the owner may cancel.' };
		const state = await loadMoneyState(tx, b.id);
		if (b.status === 'cancelled') {
			// A second click: the first one decided everything.
			const refunded = state.refunds.filter((r) => r.reason === 'cancellation');
			const preview: CancellationPreview = {
				cancellable: false,
				status: b.status,
				refund: refunded.filter((r) => r.status !== 'failed').reduce((s, r) => s + r.amount, 0),
				currency: b.currency,
				noticeHours: Math.floor((b.startsAt.getTime() - (b.cancelledAt ?? now).getTime()) / 36_000) / 100,
				rule: 'Already cancelled',
				paid: state.held,
				onArrival: null
			};
			return { ok: true, already: true, preview, refunds: refunded };
		}
		if (!isCancellable(b.status)) {
			const message =
				b.status === 'completed'
					? 'This session has taken place; it can no longer be cancelled.'
					: b.status === 'no_show'
						? 'Nobody came to this session, and that has been recorded; it can no longer be cancelled.'
						: 'This booking has lapsed already.';
			return { ok: false, status: 409, code: 'not_cancellable', message };
		}
		const r = refundForCancellation({ paid: state.held, deposit: b.deposit, bookingStart: b.startsAt, cancelledAt: now, policy });
		await setBookingStatus(tx, b, 'cancelled', {
			cancelledAt: now,
			cancelledBy: actor.id,
			cancelReason: input.reason?.trim() || null,
			holdExpiresAt: null
		});
		// The notice to the artist is queued in the transaction that cancels, so it exists exactly once with it.
		await queueCancellation(tx, { bookingId: b.id, was: b.status, refund: r.refund, rule: r.rungLabel, retained: r.retained });
		// Its reminders and any balance request not yet sent are cancelled once this has committed.
		after.push(() => syncBookingMessagesQuietly(b.id));
		// The refund comes out of the paid payments, the deposit first.
		const refunds: RefundRow[] = [];
		let left = r.refund;
		const paid = state.payments
			.filter((p) => p.status === 'paid')
			.sort((a, b2) => (a.kind === b2.kind ? 0 : a.kind === 'deposit' ? -1 : 1));
		for (const p of paid) {
			if (left <= 0) break;
			const part = Math.min(left, state.refundable.get(p.id) ?? 0);
			if (part <= 0) continue;
			refunds.push(
				await queueRefund(tx, after, { booking: b, payment: p, amount: part, reason: 'cancellation', requestedBy: actor.id })
			);
			left -= part;
		}
		// A deposit on its way is refunded, when it arrives, by this same ladder at this moment
		// (what the preview said), not in full: the cancellation happened with this notice.
		const coming = onArrivalOf(state, b, now, policy, r.refund);
		if (coming) {
			let share = coming.refund;
			for (const p of coming.payments) {
				const part = Math.min(share, p.amount);
				share -= part;
				await tx.update(payment).set({ refundOnArrival: part }).where(eq(payment.id, p.id));
			}
		}
		// Nobody should be able to pay for a cancelled booking; if a payment still slips in, it is refunded.
		for (const p of state.payments) {
			if (p.status === 'open' && p.checkoutSessionId) {
				const id = p.checkoutSessionId;
				after.push(() => expireSession(id, p.stripeAccountId));
			}
		}
		await auditTx(
			tx,
			'booking.cancelled',
			b.id,
			{ refund: r.refund, rule: r.rungLabel, noticeHours: r.noticeHours, refundOnArrival: coming?.refund ?? null },
			actor.id
		);
		const preview: CancellationPreview = {
			cancellable: false,
			status: 'cancelled',
			refund: r.refund,
			currency: b.currency,
			noticeHours: r.noticeHours,
			rule: r.rungLabel,
			paid: state.held,
			onArrival: coming && { amount: coming.amount, refund: coming.refund }
		};
		return { ok: true, already: false, preview, refunds };
	});
	if (!result.ok || result.refunds.length === 0) return result;
	// After commit the refunds have been sent: report them as they stand now.
	const fresh = await db.select().from(refund).where(eq(refund.bookingId, bookingId));
	const ids = new Set(result.refunds.map((r) => r.id));
	return { ...result, refunds: fresh.filter((r) => ids.has(r.id)) };
}

/**
 * The owner of the booking's studio tries its failed refunds again (each with a new
 * Idempotency-Key); anyone else is refused, with a 404 when the booking is not theirs to know of.
 */
export async function retryFailedRefunds(
	actor: SessionUser,
	bookingId: string
): Promise<{ ok: true; retried: number } | { ok: false; status: 403 | 404; retried: 0 }> {
	const of = await studioOf(bookingId);
	if (!of) return { ok: false, status: 404, retried: 0 };
	const as = await actorAt(actor, of.studioId);
	if (as.role !== 'owner') return { ok: false, status: as.role === 'artist' && of.artistId !== actor.id ? 404 : 403, retried: 0 };
	const retried = await inTransaction(async (tx, after) => {
		const b = await lockBooking(tx, bookingId);
		if (!b) return 0;
		const state = await loadMoneyState(tx, b.id);
		let n = 0;
		for (const failed of unresolvedFailures(state.refunds)) {
			if (!failed.paymentId) continue;
			const amount = Math.min(failed.amount, state.refundable.get(failed.paymentId) ?? 0);
			if (amount <= 0) continue;
			const reason = failed.reason as 'cancellation' | 'slot_unavailable' | 'cancelled_before_payment' | 'duplicate' | 'move';
			await queueRefund(tx, after, { booking: b, payment: { id: failed.paymentId }, amount, reason, requestedBy: actor.id });
			n++;
		}
		if (n) await auditTx(tx, 'refund.retried', b.id, { count: n }, actor.id);
		return n;
	});
	return { ok: true, retried };
}

/**
 * Stripe refused the request itself: no retry with the same Idempotency-Key will change that.
 * StripeIdempotencyError (the key was used with other parameters) is one of them (Stripe docs,
 * "Idempotent requests": a key reused with different parameters is an error, every time).
 */
export function isStripeRequestError(e: unknown): e is { type: string; statusCode?: number; message: string; code?: string } {
	const err = e as { type?: string; statusCode?: number };
	return (
		typeof err?.type === 'string' &&
		['StripeInvalidRequestError', 'StripeCardError', 'StripeIdempotencyError'].includes(err.type) &&
		(err.statusCode ?? 0) >= 400 &&
		(err.statusCode ?? 0) < 500
	);
}

/** Sends one recorded refund to Stripe (idempotent); the payments job retries what could not be sent. */
export async function sendRefund(refundId: string): Promise<void> {
	const [row] = await db
		.select({
			refund,
			paymentIntentId: payment.paymentIntentId,
			sessionId: payment.checkoutSessionId,
			accountId: payment.stripeAccountId
		})
		.from(refund)
		.innerJoin(payment, eq(payment.id, refund.paymentId))
		.where(eq(refund.id, refundId));
	if (!row || row.refund.stripeRefundId || row.refund.status !== 'pending') return;
	const r = row.refund;
	const account = row.accountId;
	let paymentIntent = row.paymentIntentId;
	try {
		if (!paymentIntent && row.sessionId) {
			// payment_intent is null on a session until it is paid; the paid session names it.
			const s = await stripe().checkout.sessions.retrieve(row.sessionId, {}, onAccount(account));
			paymentIntent = typeof s.payment_intent === 'string' ? s.payment_intent : (s.payment_intent?.id ?? null);
		}
		if (!paymentIntent) {
			await markSendFailed(r, 'The payment to refund was not found at Stripe.');
			return;
		}
		const created = await stripe().refunds.create(
			{
				payment_intent: paymentIntent,
				amount: toStripeAmount(r.amount, r.currency),
				reason: r.reason === 'duplicate' ? 'duplicate' : 'requested_by_customer',
				metadata: { bookingId: r.bookingId, refundId: r.id, paymentId: r.paymentId ?? '', reason: r.reason }
			},
			onAccount(account, { idempotencyKey: r.idempotencyKey ?? `slateroom-refund-${r.id}` })
		);
		await inTransaction((tx) => applyRefundObject(tx, created));
	} catch (e) {
		// Stripe refused the request itself (already refunded, too large, a reused key…): no retry will change that.
		if (isStripeRequestError(e)) {
			await markSendFailed(
				r,
				e.type === 'StripeIdempotencyError' ? `Stripe refused the refund request: ${e.message}` : e.message
			);
			return;
		}
		// Anything else (Stripe unreachable): tried again on a later tick, behind the others.
		await db.update(refund).set({ updatedAt: new Date() }).where(eq(refund.id, r.id));
		throw e;
	}
}

async function markSendFailed(r: RefundRow, reason: string) {
	await inTransaction(async (tx) => {
		await lockBooking(tx, r.bookingId);
		const [updated] = await tx
			.update(refund)
			.set({ status: 'failed', failureReason: reason.slice(0, 500) })
			.where(and(eq(refund.id, r.id), eq(refund.status, 'pending'), isNull(refund.stripeRefundId)))
			.returning({ id: refund.id });
		if (updated) await auditTx(tx, 'refund.failed', r.bookingId, { refundId: r.id, reason });
	});
}

/** Refunds recorded but not sent (a crash or an outage after commit), and pending ones Stripe went quiet about. */
export async function sweepRefunds(now = new Date()): Promise<void> {
	const unsent = await db
		.select({ id: refund.id })
		.from(refund)
		.where(
			and(eq(refund.status, 'pending'), isNull(refund.stripeRefundId), lt(refund.createdAt, new Date(now.getTime() - 10_000)))
		)
		.orderBy(asc(refund.updatedAt))
		.limit(20);
	// Each refund on its own: one Stripe will not take never keeps the others from going out.
	await eachIsolated(unsent, 'could not send refund', ({ id }) => sendRefund(id));
	const quiet = await db
		.select({ stripeRefundId: refund.stripeRefundId, accountId: refund.stripeAccountId })
		.from(refund)
		.where(
			and(
				eq(refund.status, 'pending'),
				isNotNull(refund.stripeRefundId),
				lt(refund.updatedAt, new Date(now.getTime() - 5 * 60_000))
			)
		)
		.orderBy(asc(refund.updatedAt))
		.limit(20);
	await eachIsolated(quiet, 'could not look up refund', async ({ stripeRefundId, accountId }) => {
		// Asked about now: asked again in five minutes, not on every tick, whatever Stripe answers.
		await db
			.update(refund)
			.set({ updatedAt: now })
			.where(and(eq(refund.stripeRefundId, stripeRefundId!), eq(refund.status, 'pending')));
		let r: Stripe.Refund;
		try {
			r = await stripe().refunds.retrieve(stripeRefundId!, {}, onAccount(accountId));
		} catch (e) {
			if (!isMissing(e)) throw e;
			await markUnknownRefundFailed(stripeRefundId!);
			return;
		}
		await inTransaction((tx) => applyRefundObject(tx, r));
	});
}

/** A refund Stripe says it has never heard of: no money went back; the owner sees it as failed. */
async function markUnknownRefundFailed(stripeRefundId: string) {
	await inTransaction(async (tx) => {
		const [row] = await tx.select().from(refund).where(eq(refund.stripeRefundId, stripeRefundId));
		if (!row) return;
		await lockBooking(tx, row.bookingId);
		const reason = 'Stripe no longer knows this refund.';
		const [updated] = await tx
			.update(refund)
			.set({ status: 'failed', failureReason: reason })
			.where(and(eq(refund.id, row.id), eq(refund.status, 'pending')))
			.returning({ id: refund.id });
		if (updated) await auditTx(tx, 'refund.failed', row.bookingId, { refundId: row.id, reason });
	});
}

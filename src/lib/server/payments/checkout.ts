// Stripe Checkout for a booking's deposit and balance.
//
// One open session per booking and kind: asking again returns the open one. The session is made
// with an Idempotency-Key from the booking, the kind and the attempt number (Stripe docs,
// "Idempotent requests"), and its parameters are fixed on the payment row before Stripe is
// called, so two clicks at once, or a retry after a lost answer, make one session. A new attempt
// (a new key) is only made when the previous session has expired or failed.
//
// Lifetimes: a deposit session ends when the hold ends, but Stripe's minimum is 30 minutes, so it
// may outlive a 30-minute hold by a few seconds to a minute. The payments job expires the sessions
// of holds that ran out, and a payment that still slips through is handled in state.ts: confirmed
// if the slot is still free, refunded in full if not.
//
// Direct charges (Stripe Connect): every session is made on the booking's studio's own connected
// account (the Stripe-Account header), so the studio is the merchant of record and the money lands
// in its balance; the platform's fee (the studio's platformFeeBp, src/lib/domain/platform-fee.ts)
// is asked as payment_intent_data.application_fee_amount. The account and the fee are fixed on the
// payment row with the other parameters. A studio without an account that can take charges cannot
// start a checkout (PaymentsNotReadyError).
import { and, desc, eq, inArray } from 'drizzle-orm';
import type Stripe from 'stripe';
import { db } from '../db';
import { booking, bookingMove, payment, room, studio, user } from '../db/schema';
import { inTransaction, lockBooking, paymentsOf, type PaymentRow } from './core';
import { owedOn } from './balance';
import { refreshAccountState } from './accounts';
import { onAccount, stripe } from './stripe';
import { isExactStripeAmount, toStripeAmount } from '$lib/domain/money';
import { platformFee } from '$lib/domain/platform-fee';
import { formatDate, formatTimes } from '$lib/domain/time';
import { formatMoney } from '$lib/domain/money';
import { holdLive } from '$lib/domain/lifecycle';

/** 'move': what a move to a dearer time adds to the deposit (its booking_move waits for it). */
export type CheckoutKind = 'deposit' | 'balance' | 'move';

export class CheckoutError extends Error {
	constructor(
		readonly code: 'not_found' | 'not_payable' | 'nothing_due' | 'stripe_unavailable' | 'payments_not_ready',
		message: string
	) {
		super(message);
	}
}

export const PAYMENTS_NOT_READY = 'payments_not_ready';

/**
 * The studio cannot take payments: it has no connected account yet, or Stripe says its account
 * cannot take charges now (set-up unfinished, or Stripe needs more from the owner). Nothing was
 * charged; the routes answer 409 with this code.
 */
export class PaymentsNotReadyError extends CheckoutError {
	constructor(message = 'This studio cannot take payments yet. Please try again later, or contact the studio.') {
		super(PAYMENTS_NOT_READY, message);
	}
}

/** Stripe: a Checkout Session lives from 30 minutes to 24 hours. */
const MIN_SESSION_SECONDS = 30 * 60;
/** Clock slack so a session asked for "30 minutes from now" is never refused as 29:59. */
const SESSION_SLACK_SECONDS = 20;
const BALANCE_SESSION_SECONDS = 23 * 3600;
/** An open session this close to its end is not handed out again. */
const REUSE_MARGIN_MS = 2 * 60_000;

export function depositSessionExpiry(holdExpiresAt: Date | null, now: Date): Date {
	const earliest = now.getTime() + (MIN_SESSION_SECONDS + SESSION_SLACK_SECONDS) * 1000;
	const hold = holdExpiresAt?.getTime() ?? 0;
	return new Date(Math.ceil(Math.max(earliest, hold) / 1000) * 1000);
}

interface Prepared {
	payment: PaymentRow;
	reuse: { url: string; sessionId: string } | null;
	params: Stripe.Checkout.SessionCreateParams;
}

async function prepare(bookingId: string, kind: CheckoutKind, origin: string, now: Date): Promise<Prepared> {
	return inTransaction(async (tx, after) => {
		const b = await lockBooking(tx, bookingId);
		if (!b) throw new CheckoutError('not_found', 'No such booking.');
		const payments = await paymentsOf(tx, b.id);
		const mine = payments.filter((p) => p.kind === kind);
		let amount: number;
		let expiresAt: Date;
		let waitingMove: typeof bookingMove.$inferSelect | undefined;
		if (kind === 'deposit') {
			if (!holdLive(b, now)) {
				throw new CheckoutError('not_payable', 'This booking is not waiting for its deposit.');
			}
			if (mine.some((p) => p.status === 'paid' || p.status === 'processing')) {
				throw new CheckoutError('not_payable', 'The deposit has been paid already.');
			}
			amount = b.deposit;
			expiresAt = depositSessionExpiry(b.holdExpiresAt, now);
		} else if (kind === 'move') {
			// The move waiting for this payment (one per booking, by the unique index): its settlement.
			const [waiting] = await tx
				.select()
				.from(bookingMove)
				.where(and(eq(bookingMove.bookingId, b.id), eq(bookingMove.status, 'awaiting_payment')));
			if (!waiting || b.status !== 'confirmed')
				throw new CheckoutError('not_payable', 'No move of this session is waiting for a payment.');
			waitingMove = waiting;
			amount = waiting.settlement;
			expiresAt = depositSessionExpiry(null, now);
		} else {
			if (b.status !== 'completed')
				throw new CheckoutError('not_payable', 'The balance is due once the session has been closed.');
			// Only what is still owed: the final invoice less card payments of the balance and what
			// the owner recorded by hand (cash, bank transfer).
			const { final, owed } = await owedOn(tx, b);
			amount = final ? owed : 0;
			if (amount <= 0) throw new CheckoutError('nothing_due', 'Nothing is due on this booking.');
			if (mine.some((p) => p.status === 'processing'))
				throw new CheckoutError('not_payable', 'A payment of the balance is on its way.');
			expiresAt = new Date(Math.ceil(now.getTime() / 1000) * 1000 + BALANCE_SESSION_SECONDS * 1000);
		}
		if (amount <= 0) throw new CheckoutError('nothing_due', 'Nothing is due on this booking.');
		if (!isExactStripeAmount(amount, b.currency)) {
			throw new CheckoutError('not_payable', `Stripe cannot take exactly ${formatMoney(amount, b.currency)}.`);
		}
		const [merchant] = await tx
			.select({ accountId: studio.stripeAccountId, chargesEnabled: studio.chargesEnabled, feeBp: studio.platformFeeBp })
			.from(studio)
			.where(eq(studio.id, b.studioId));
		if (!merchant?.accountId || !merchant.chargesEnabled) throw new PaymentsNotReadyError();
		const accountId = merchant.accountId;

		// Sessions that ran out without a webhook telling us are closed here, so they are not handed out.
		// A row whose session was never made is only reused while Stripe would still take its expires_at.
		const stale = mine.filter(
			(p) =>
				p.status === 'open' &&
				p.expiresAt &&
				p.expiresAt.getTime() <=
					now.getTime() + (p.checkoutSessionId ? REUSE_MARGIN_MS : (MIN_SESSION_SECONDS + SESSION_SLACK_SECONDS / 2) * 1000)
		);
		if (stale.length) {
			await tx
				.update(payment)
				.set({ status: 'expired', failureReason: 'The checkout ran out.' })
				.where(
					inArray(
						payment.id,
						stale.map((p) => p.id)
					)
				);
		}
		// A checkout opened on another account (the platform's, before Connect, or an account the
		// studio no longer uses) is not handed out again: it ends here and its session at Stripe.
		const elsewhere = mine.filter((p) => p.status === 'open' && !stale.includes(p) && p.stripeAccountId !== accountId);
		if (elsewhere.length) {
			await tx
				.update(payment)
				.set({ status: 'expired', failureReason: 'Superseded by a checkout on the studio’s payment account.' })
				.where(
					inArray(
						payment.id,
						elsewhere.map((p) => p.id)
					)
				);
			for (const p of elsewhere) {
				const sessionId = p.checkoutSessionId;
				if (sessionId) after.push(() => expireSession(sessionId, p.stripeAccountId));
			}
		}
		let row = mine.find(
			(p) =>
				p.status === 'open' &&
				!stale.includes(p) &&
				!elsewhere.includes(p) &&
				p.amount === amount &&
				// A move's checkout is its own move's, never an earlier move's of the same amount.
				(!waitingMove || p.id === waitingMove.paymentId)
		);
		if (!row) {
			const attempt = mine.reduce((m, p) => Math.max(m, p.attempt), 0) + 1;
			[row] = await tx
				.insert(payment)
				.values({
					studioId: b.studioId,
					bookingId: b.id,
					kind,
					amount,
					currency: b.currency,
					status: 'open',
					attempt,
					expiresAt,
					stripeAccountId: accountId,
					applicationFee: platformFee(amount, merchant.feeBp, b.currency)
				})
				.returning();
			if (waitingMove) await tx.update(bookingMove).set({ paymentId: row!.id }).where(eq(bookingMove.id, waitingMove.id));
		}
		const [details] = await tx
			.select({ roomName: room.name, email: user.email, timeZone: studio.timeZone, studioName: studio.name })
			.from(booking)
			.innerJoin(room, eq(room.id, booking.roomId))
			.innerJoin(user, eq(user.id, booking.artistId))
			.innerJoin(studio, eq(studio.id, booking.studioId))
			.where(eq(booking.id, b.id));
		const tz = details!.timeZone;

		const metadata = {
			bookingId: b.id,
			kind,
			paymentId: row!.id,
			reference: b.reference,
			...(waitingMove ? { moveId: waitingMove.id } : {})
		};
		const label = kind === 'deposit' ? 'Deposit' : kind === 'move' ? 'Moving a session' : 'Balance';
		// A move's line names the new time it pays for.
		const shown = waitingMove ? { startsAt: waitingMove.toStartsAt, endsAt: waitingMove.toEndsAt } : b;
		const when = `${formatDate(shown.startsAt, tz)}, ${formatTimes(shown.startsAt, shown.endsAt, tz)}`;
		const params: Stripe.Checkout.SessionCreateParams = {
			mode: 'payment',
			line_items: [
				{
					quantity: 1,
					price_data: {
						currency: b.currency.toLowerCase(),
						unit_amount: toStripeAmount(row!.amount, b.currency),
						product_data: {
							name: `${label} for ${details!.roomName} ${formatDate(shown.startsAt, tz)}`,
							description: `${details!.studioName}, booking ${b.reference}: ${when}`
						}
					}
				}
			],
			customer_email: details!.email,
			client_reference_id: b.id,
			metadata,
			// Charges and refunds copy the PaymentIntent's metadata, not the session's (fake-services/stripe/README.md).
			payment_intent_data: {
				metadata,
				description: `${label}, booking ${b.reference}`,
				// Stripe refuses a fee of 0 on some accounts and a fee without an account: left out then.
				...(row!.applicationFee > 0 ? { application_fee_amount: toStripeAmount(row!.applicationFee, b.currency) } : {})
			},
			success_url: `${origin}/bookings/${b.id}?${kind === 'move' ? 'moved' : 'paid'}=1`,
			cancel_url: `${origin}/bookings/${b.id}`,
			expires_at: Math.floor((row!.expiresAt ?? expiresAt).getTime() / 1000)
		};
		const reuse =
			row!.checkoutSessionId && row!.checkoutUrl ? { url: row!.checkoutUrl, sessionId: row!.checkoutSessionId } : null;
		return { payment: row!, reuse, params };
	});
}

function idempotencyKey(p: PaymentRow): string {
	return `slateroom-checkout-${p.bookingId}-${p.kind}-${p.attempt}`;
}

/** Creates (or hands back the open) Checkout Session for a booking's deposit or balance. */
export async function startCheckout(
	bookingId: string,
	kind: CheckoutKind,
	origin: string,
	now = new Date()
): Promise<{ url: string; sessionId: string }> {
	for (let round = 0; round < 2; round++) {
		const prepared = await prepare(bookingId, kind, origin, now);
		if (prepared.reuse) return prepared.reuse;
		let session: Stripe.Checkout.Session;
		const p = prepared.payment;
		try {
			session = await stripe().checkout.sessions.create(
				prepared.params,
				onAccount(p.stripeAccountId, { idempotencyKey: idempotencyKey(p) })
			);
		} catch (e) {
			const err = e as { type?: string; code?: string; message?: string };
			if (err.type === 'StripeIdempotencyError' || err.code === 'idempotency_error') {
				// The saved request had other parameters (another origin, a changed e-mail): start a new attempt.
				await supersede(p.id, 'Superseded by a new checkout.');
				continue;
			}
			if (p.stripeAccountId && accountRefused(err)) {
				// Stripe saves this answer under the key: a later try, once the account is ready, needs a new one.
				await supersede(p.id, 'The studio’s payment account could not take charges.');
				await refreshAccountState(p.stripeAccountId);
				throw new PaymentsNotReadyError();
			}
			console.warn('[payments] Stripe did not create the checkout:', err.message);
			throw new CheckoutError(
				'stripe_unavailable',
				'The payment service is not answering right now. Please try again in a minute.'
			);
		}
		if (!session.url) throw new CheckoutError('stripe_unavailable', 'The payment service gave no payment page.');
		await db
			.update(payment)
			.set({ checkoutSessionId: session.id, checkoutUrl: session.url, expiresAt: new Date(session.expires_at * 1000) })
			.where(eq(payment.id, prepared.payment.id));
		return { url: session.url, sessionId: session.id };
	}
	throw new CheckoutError('stripe_unavailable', 'The payment service refused the checkout.');
}

async function supersede(paymentId: string, reason: string): Promise<void> {
	await db
		.update(payment)
		.set({ status: 'expired', failureReason: reason })
		.where(and(eq(payment.id, paymentId), eq(payment.status, 'open')));
}

/**
 * Stripe refuses a charge on the connected account itself: an account it does not know or that
 * was disconnected (403 account_invalid, Stripe docs "Error codes"), or one that cannot take
 * charges yet (400 charges_not_enabled; fake-services/stripe/README.md, "Connect").
 */
export function accountRefused(err: { type?: string; code?: string; statusCode?: number }): boolean {
	return (
		err.code === 'account_invalid' ||
		err.code === 'charges_not_enabled' ||
		(err.statusCode === 403 && err.type === 'StripePermissionError')
	);
}

/** Expires an open session (a hold that ran out, a cancelled booking) on the account it was made on; quiet when it is no longer open. */
export async function expireSession(sessionId: string, accountId: string | null): Promise<void> {
	try {
		await stripe().checkout.sessions.expire(sessionId, {}, onAccount(accountId));
	} catch (e) {
		const err = e as { statusCode?: number; message?: string };
		if (err.statusCode && err.statusCode >= 400 && err.statusCode < 500) return; // already complete or expired
		throw e;
	}
}

/** The newest open checkout of a kind, for the booking page's pay link. */
export async function openCheckout(bookingId: string, kind: CheckoutKind): Promise<PaymentRow | undefined> {
	const [row] = await db
		.select()
		.from(payment)
		.where(and(eq(payment.bookingId, bookingId), eq(payment.kind, kind), eq(payment.status, 'open')))
		.orderBy(desc(payment.attempt))
		.limit(1);
	return row;
}

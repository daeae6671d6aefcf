// The payments' periodic work (src/lib/server/jobs.ts runs it every 15 s):
// - expire the Checkout Sessions of holds that ran out and of bookings no longer waiting for
//   them (fake-services/stripe/README.md: expire the session when the hold frees the slot);
// - reconcile sessions past their end that no webhook told us about (Stripe's answer decides);
// - send refunds recorded but not sent, and ask about refunds Stripe went quiet on.
//
// Checkouts and refunds are two separate jobs, and each item is tried on its own: one session or
// refund Stripe will not answer for is logged and left for a later tick, never blocking the rest.
// Every call runs on the account the payment was made on (payment.stripeAccountId; null is the
// platform's own, for payments made before Connect): another account cannot see the session.
import { and, asc, eq, inArray, isNotNull, isNull, lt, or, sql } from 'drizzle-orm';
import type Stripe from 'stripe';
import { db } from '../db';
import { booking, payment } from '../db/schema';
import { holdLapsedSql } from '../bookings/occupancy';
import { BOOKING_STATUSES, awaitsDeposit } from '$lib/domain/lifecycle';
import { eachIsolated, inTransaction, isMissing } from './core';
import { applySession } from './state';
import { onAccount, stripe } from './stripe';

/** How long the job leaves a checkout it has asked about before asking again. */
export const RECHECK_AFTER_MS = 10 * 60_000;
const BATCH = 20;

/**
 * When the money was paid: the successful charge's time, else now. (A webhook carries its event's
 * `created`; this is for the job, which learns of a payment without an event.)
 */
async function paymentTime(session: Stripe.Checkout.Session, accountId: string | null): Promise<Date | undefined> {
	const pi = session.payment_intent;
	if (!pi || session.payment_status !== 'paid') return undefined;
	try {
		const intent = await stripe().paymentIntents.retrieve(
			typeof pi === 'string' ? pi : pi.id,
			{ expand: ['latest_charge'] },
			onAccount(accountId)
		);
		const charge = intent.latest_charge;
		if (charge && typeof charge !== 'string' && charge.status === 'succeeded') return new Date(charge.created * 1000);
		return new Date(intent.created * 1000);
	} catch {
		return undefined;
	}
}

/** Applies a session's state as Stripe reports it now, on the account it was read from (the same rules as its webhook events). */
export async function reconcileSession(session: Stripe.Checkout.Session, accountId: string | null): Promise<string> {
	if (session.status === 'expired') return inTransaction((tx, after) => applySession(tx, session, 'expired', after));
	if (session.status === 'complete') {
		const paidAt = await paymentTime(session, accountId);
		return inTransaction((tx, after) => applySession(tx, session, 'completed', after, paidAt));
	}
	return 'open';
}

/**
 * A session Stripe no longer knows (the fake restarted, or it belongs to other keys): no money can
 * come through it, so it ends as expired; a booking still waiting for it frees its slot.
 */
export async function forgetSession(sessionId: string): Promise<string> {
	const gone = {
		id: sessionId,
		object: 'checkout.session',
		status: 'expired',
		metadata: {}
	} as unknown as Stripe.Checkout.Session;
	const outcome = await inTransaction((tx, after) => applySession(tx, gone, 'expired', after));
	console.warn(`[payments] Stripe does not know checkout ${sessionId}; treated as expired (${outcome})`);
	return outcome;
}

/** Retrieves a session on its account; null when Stripe answers that it does not exist there. */
async function retrieveSession(sessionId: string, accountId: string | null): Promise<Stripe.Checkout.Session | null> {
	try {
		return await stripe().checkout.sessions.retrieve(sessionId, {}, onAccount(accountId));
	} catch (e) {
		if (isMissing(e)) return null;
		throw e;
	}
}

/** Expires a session and applies the answer at once; a session that is no longer open is looked up instead. */
export async function expireAndReconcile(sessionId: string, accountId: string | null): Promise<void> {
	let session: Stripe.Checkout.Session | null;
	try {
		session = await stripe().checkout.sessions.expire(sessionId, {}, onAccount(accountId));
	} catch (e) {
		const status = (e as { statusCode?: number }).statusCode ?? 0;
		if (status < 400 || status >= 500) throw e;
		session = await retrieveSession(sessionId, accountId);
	}
	if (session) await reconcileSession(session, accountId);
	else await forgetSession(sessionId);
}

export async function sweepCheckouts(now = new Date()): Promise<void> {
	const orphans = await db
		.select({ id: payment.id, sessionId: payment.checkoutSessionId, accountId: payment.stripeAccountId })
		.from(payment)
		.innerJoin(booking, eq(booking.id, payment.bookingId))
		.where(
			and(
				eq(payment.status, 'open'),
				eq(payment.kind, 'deposit'),
				isNotNull(payment.checkoutSessionId),
				// No longer waiting for this deposit: moved on, or a hold that ran out.
				or(
					inArray(
						booking.status,
						BOOKING_STATUSES.filter((s) => !awaitsDeposit(s))
					),
					holdLapsedSql(now)
				)
			)
		)
		.orderBy(sql`${payment.lastCheckedAt} asc nulls first`, asc(payment.expiresAt))
		.limit(BATCH);
	await eachIsolated(orphans, 'could not close checkout', async (o) => {
		// Marked first: one Stripe keeps refusing goes behind the others on the next tick.
		await db.update(payment).set({ lastCheckedAt: now }).where(eq(payment.id, o.id));
		await expireAndReconcile(o.sessionId!, o.accountId);
	});

	// Past their end and still not final here: the oldest-checked first, each asked again only
	// after RECHECK_AFTER_MS (a delayed payment can stay processing for days), so a few slow ones
	// never starve the rest.
	const overdue = await db
		.select({ id: payment.id, sessionId: payment.checkoutSessionId, accountId: payment.stripeAccountId })
		.from(payment)
		.where(
			and(
				inArray(payment.status, ['open', 'processing']),
				isNotNull(payment.checkoutSessionId),
				lt(payment.expiresAt, new Date(now.getTime() - 2 * 60_000)),
				or(isNull(payment.lastCheckedAt), lt(payment.lastCheckedAt, new Date(now.getTime() - RECHECK_AFTER_MS)))
			)
		)
		.orderBy(sql`${payment.lastCheckedAt} asc nulls first`, asc(payment.expiresAt))
		.limit(BATCH);
	await eachIsolated(overdue, 'could not reconcile checkout', async (o) => {
		// Marked first: a session that keeps failing waits its turn like the others.
		await db.update(payment).set({ lastCheckedAt: now }).where(eq(payment.id, o.id));
		const session = await retrieveSession(o.sessionId!, o.accountId);
		if (!session) await forgetSession(o.sessionId!);
		// Only a final answer changes anything.
		else if (session.status !== 'open') await reconcileSession(session, o.accountId);
	});
}

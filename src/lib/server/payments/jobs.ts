// The payments' periodic work (src/lib/server/jobs.ts runs it every 15 s):
// - expire the Checkout Sessions of holds that ran out and of bookings no longer waiting for
//   them (fake-services/stripe/README.md: expire the session when the hold frees the slot);
// - reconcile sessions past their end that no webhook told us about (Stripe's answer decides);
// - send refunds recorded but not sent, and ask about refunds Stripe went quiet on.
import { and, eq, inArray, isNotNull, lt, or } from 'drizzle-orm';
import type Stripe from 'stripe';
import { db } from '../db';
import { booking, payment } from '../db/schema';
import { addPeriodicJob } from '../jobs';
import { inTransaction } from './core';
import { applySession, setSenders } from './state';
import { sendRefund, sweepRefunds } from './refunds';
import { stripe } from './stripe';

/** Applies a session's state as Stripe reports it now (the same rules as its webhook events). */
export async function reconcileSession(session: Stripe.Checkout.Session): Promise<string> {
	if (session.status === 'expired') return inTransaction((tx, after) => applySession(tx, session, 'expired', after));
	if (session.status === 'complete') return inTransaction((tx, after) => applySession(tx, session, 'completed', after));
	return 'open';
}

/** Expires a session and applies the answer at once; a session that is no longer open is looked up instead. */
export async function expireAndReconcile(sessionId: string): Promise<void> {
	let session: Stripe.Checkout.Session;
	try {
		session = await stripe().checkout.sessions.expire(sessionId);
	} catch (e) {
		const status = (e as { statusCode?: number }).statusCode ?? 0;
		if (status < 400 || status >= 500) throw e;
		session = await stripe().checkout.sessions.retrieve(sessionId);
	}
	await reconcileSession(session);
}

export async function sweepCheckouts(now = new Date()): Promise<void> {
	const orphans = await db
		.select({ sessionId: payment.checkoutSessionId })
		.from(payment)
		.innerJoin(booking, eq(booking.id, payment.bookingId))
		.where(
			and(
				eq(payment.status, 'open'),
				eq(payment.kind, 'deposit'),
				isNotNull(payment.checkoutSessionId),
				or(
					inArray(booking.status, ['expired', 'cancelled', 'confirmed', 'completed']),
					and(eq(booking.status, 'held'), lt(booking.holdExpiresAt, now))
				)
			)
		)
		.limit(20);
	for (const o of orphans) await expireAndReconcile(o.sessionId!);

	const overdue = await db
		.select({ sessionId: payment.checkoutSessionId })
		.from(payment)
		.where(
			and(
				inArray(payment.status, ['open', 'processing']),
				isNotNull(payment.checkoutSessionId),
				lt(payment.expiresAt, new Date(now.getTime() - 2 * 60_000))
			)
		)
		.limit(20);
	for (const o of overdue) {
		const session = await stripe().checkout.sessions.retrieve(o.sessionId!);
		// A delayed payment can stay processing for days; only a final answer changes anything.
		if (session.status !== 'open') await reconcileSession(session);
	}
}

let registered = false;

/** Idempotent; the payments module calls it on load. hooks.server.ts may call it at start-up too. */
export function registerPaymentJobs() {
	if (registered) return;
	registered = true;
	setSenders({ refund: sendRefund, expireSession: expireAndReconcile });
	addPeriodicJob(async () => {
		await sweepCheckouts();
		await sweepRefunds();
	});
}

// Stripe webhook events, each handled once (Stripe docs, "Webhooks" and "Fulfill orders"):
//
// - the event id is recorded (stripe_event, ON CONFLICT DO NOTHING) in the same transaction as
//   the change it causes, so a duplicate does nothing and a crash before commit leaves the event
//   unrecorded for Stripe's retry to process;
// - the business fact is deduplicated too (state.ts: payment status, one document per fact), so
//   two different events carrying one payment change things once;
// - a row lock that is not free within a few seconds fails the delivery (Stripe retries it)
//   rather than holding Stripe past its timeout.
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { lineText } from '$lib/schemas/input';
import type Stripe from 'stripe';
import { stripeEvent } from '../db/schema';
import { inTransaction } from './core';
import { applyRefundObject, applySession, type SessionFact } from './state';

const SESSION_FACTS: Record<string, SessionFact> = {
	'checkout.session.completed': 'completed',
	'checkout.session.async_payment_succeeded': 'async_succeeded',
	'checkout.session.async_payment_failed': 'async_failed',
	'checkout.session.expired': 'expired'
};

const REFUND_EVENTS = new Set(['refund.created', 'refund.updated', 'refund.failed']);

export const WEBHOOK_LOCK_TIMEOUT_MS = 3000;

/**
 * What an event must have before it is recorded (Stripe API reference, "The Event object"): an
 * id and a type that are plain text, and `data.object`. A signed body without them is refused,
 * not retried: no retry of the same bytes could ever succeed.
 */
const eventShape = z.object({
	id: lineText().min(1).max(255),
	type: lineText().min(1).max(255),
	data: z.object({ object: z.record(z.string(), z.unknown()) })
});

/** The sessions and refunds acted on are found by their Stripe id. */
const actedOnObject = z.object({ id: lineText().min(1).max(255) });

/** Why a signed body is not an event this endpoint can process, or null. */
export function eventShapeProblem(event: unknown): string | null {
	const parsed = eventShape.safeParse(event);
	if (!parsed.success) {
		const where = parsed.error.issues[0]?.path.join('.') || 'event';
		return `The event has no usable ${where}.`;
	}
	const { type, data } = parsed.data;
	if ((SESSION_FACTS[type] || REFUND_EVENTS.has(type)) && !actedOnObject.safeParse(data.object).success) {
		return 'The event has no usable data.object.id.';
	}
	return null;
}

export async function processStripeEvent(event: Stripe.Event): Promise<{ duplicate: boolean; outcome: string }> {
	return inTransaction(
		async (tx, after) => {
			const inserted = await tx
				.insert(stripeEvent)
				.values({ id: event.id, type: event.type })
				.onConflictDoNothing()
				.returning({ id: stripeEvent.id });
			if (inserted.length === 0) return { duplicate: true, outcome: 'duplicate_event' };
			let outcome = 'ignored';
			const fact = SESSION_FACTS[event.type];
			if (fact) {
				// The event's time is when the payment happened, however late it is delivered.
				const happened =
					typeof event.created === 'number' && Number.isFinite(event.created)
						? new Date(Math.min(event.created * 1000, Date.now()))
						: undefined;
				outcome = await applySession(tx, event.data.object as Stripe.Checkout.Session, fact, after, happened);
			} else if (REFUND_EVENTS.has(event.type)) {
				outcome = await applyRefundObject(tx, event.data.object as Stripe.Refund);
			}
			// payment_intent.* and charge.* repeat what the session and refund events say: recorded, not acted on.
			await tx.update(stripeEvent).set({ processedAt: new Date() }).where(eq(stripeEvent.id, event.id));
			return { duplicate: false, outcome };
		},
		{ lockTimeoutMs: WEBHOOK_LOCK_TIMEOUT_MS }
	);
}

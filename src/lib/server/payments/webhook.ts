// Stripe webhook events, each handled once (Stripe docs, "Webhooks" and "Fulfill orders"):
//
// - the event id is recorded (stripe_event, ON CONFLICT DO NOTHING) in the same transaction as
//   the change it causes, so a duplicate does nothing and a crash before commit leaves the event
//   unrecorded for Stripe's retry to process;
// - the business fact is deduplicated too (state.ts: payment status, one document per fact), so
//   two different events carrying one payment change things once;
// - a row lock that is not free within a few seconds fails the delivery (Stripe retries it)
//   rather than holding Stripe past its timeout.
//
// Two endpoints share this (Stripe docs, "Connect webhooks"): the platform's own, and the Connect
// endpoint, which receives the events of the studios' connected accounts, each with a top-level
// `account`. An event changes only what belongs to its account: a payment or refund made on that
// account (the platform's own events, with no account, match payments made before Connect), and
// the studio that owns it. An event of an account no studio owns is recorded and changes nothing.
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { lineText } from '$lib/schemas/input';
import type Stripe from 'stripe';
import { studio, stripeEvent } from '../db/schema';
import { inTransaction, type Tx } from './core';
import { accountFacts, applyAccountState } from './accounts';
import { applyRefundObject, applySession, OTHER_ACCOUNT, type SessionFact } from './state';
import type { WebhookEndpoint } from './stripe';

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
	/** A connected account's event names it (Stripe API reference, "The Event object": account). */
	account: z
		.string()
		.regex(/^acct_[A-Za-z0-9_]{1,200}$/)
		.nullish(),
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

export interface EventResult {
	duplicate: boolean;
	/** A word for the log and the answer: what the event did. */
	outcome: string;
	/** Said when the event was recorded but changed nothing because of its account. */
	message?: string;
}

const ACCOUNT_MESSAGES: Record<string, string> = {
	unknown_account: 'No studio uses this account: the event was recorded and nothing was changed.',
	no_account: 'An event on the Connect endpoint names no account: recorded, nothing was changed.',
	[OTHER_ACCOUNT]: 'The payment or refund belongs to another account: nothing was changed.'
};

async function accountOwned(tx: Tx, account: string): Promise<boolean> {
	const [owner] = await tx.select({ id: studio.id }).from(studio).where(eq(studio.stripeAccountId, account));
	return !!owner;
}

/** When Stripe says the event happened, never later than now; undefined when it gives no usable time. */
function createdAt(event: Pick<Stripe.Event, 'created'>): Date | undefined {
	return typeof event.created === 'number' && Number.isFinite(event.created)
		? new Date(Math.min(event.created * 1000, Date.now()))
		: undefined;
}

/**
 * Handles one verified event from one endpoint: records it once (with its account), then applies
 * it where its account matches.
 */
export async function processStripeEvent(event: Stripe.Event, endpoint: WebhookEndpoint = 'platform'): Promise<EventResult> {
	const account = typeof event.account === 'string' && event.account ? event.account : null;
	const result = await inTransaction(
		async (tx, after): Promise<EventResult> => {
			const inserted = await tx
				.insert(stripeEvent)
				.values({ id: event.id, type: event.type, account })
				.onConflictDoNothing()
				.returning({ id: stripeEvent.id });
			if (inserted.length === 0) return { duplicate: true, outcome: 'duplicate_event' };
			let outcome = 'ignored';
			const fact = SESSION_FACTS[event.type];
			if (account && !(await accountOwned(tx, account))) {
				outcome = 'unknown_account';
			} else if (endpoint === 'connect' && !account) {
				outcome = 'no_account';
			} else if (event.type === 'account.updated') {
				outcome = await accountUpdated(tx, event, account);
			} else if (fact) {
				// The event's time is when the payment happened, however late it is delivered.
				const session = event.data.object as Stripe.Checkout.Session;
				outcome = await applySession(tx, session, fact, after, createdAt(event), account);
			} else if (REFUND_EVENTS.has(event.type)) {
				outcome = await applyRefundObject(tx, event.data.object as Stripe.Refund, account);
			}
			// payment_intent.* and charge.* repeat what the session and refund events say: recorded, not acted on.
			await tx.update(stripeEvent).set({ processedAt: new Date() }).where(eq(stripeEvent.id, event.id));
			return { duplicate: false, outcome, ...(ACCOUNT_MESSAGES[outcome] ? { message: ACCOUNT_MESSAGES[outcome] } : {}) };
		},
		{ lockTimeoutMs: WEBHOOK_LOCK_TIMEOUT_MS }
	);
	if (result.message)
		console.warn(`[stripe webhook] ${event.type} ${event.id} (account ${account ?? 'none'}): ${result.outcome}`);
	return result;
}

/**
 * `account.updated` of a connected account: its state onto the studio that owns it, dated by the
 * event's `created`, so an older event delivered late never overwrites a newer state
 * (applyAccountState). The platform's own account (no `account`) is not a studio's: ignored.
 */
async function accountUpdated(tx: Tx, event: Stripe.Event, account: string | null): Promise<string> {
	if (!account) return 'ignored';
	const object = event.data.object as Partial<Stripe.Account>;
	if (typeof object.id === 'string' && object.id !== account) return OTHER_ACCOUNT;
	const seenAt = createdAt(event) ?? new Date();
	const owner = await applyAccountState(account, accountFacts(object), seenAt, tx);
	return owner ? 'account_updated' : 'unknown_account';
}

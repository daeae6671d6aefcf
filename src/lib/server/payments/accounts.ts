// A studio's own Stripe account (Connect, direct charges: the studio is the merchant of record).
// What Stripe says of the account (Stripe API reference, "The Account object": charges_enabled,
// payouts_enabled, details_submitted, requirements.currently_due) is copied onto the studio that
// owns it, whether it arrives by an `account.updated` event or by looking the account up when the
// owner comes back from onboarding.
import { and, eq, isNull, lte, or } from 'drizzle-orm';
import type Stripe from 'stripe';
import { db } from '../db';
import { studio } from '../db/schema';
import { stripe } from './stripe';
import type { Tx } from '../invoices/issue';

export interface AccountFacts {
	chargesEnabled: boolean;
	payoutsEnabled: boolean;
	detailsSubmitted: boolean;
	requirements: string[];
}

/** A requirement's name as Stripe writes them ("individual.verification.document"): printable, short. */
const REQUIREMENT_NAME = /^[\x21-\x7e]{1,200}$/;

/** `requirements.currently_due` as a list of names; anything else in its place is no list. */
function dueList(requirements: unknown): string[] {
	const due = (requirements as { currently_due?: unknown } | null | undefined)?.currently_due;
	return Array.isArray(due) ? due.filter((d): d is string => typeof d === 'string' && REQUIREMENT_NAME.test(d)) : [];
}

export function accountFacts(
	account: Partial<Pick<Stripe.Account, 'charges_enabled' | 'payouts_enabled' | 'details_submitted' | 'requirements'>>
): AccountFacts {
	return {
		chargesEnabled: account.charges_enabled === true,
		payoutsEnabled: account.payouts_enabled === true,
		detailsSubmitted: account.details_submitted === true,
		requirements: dueList(account.requirements)
	};
}

/**
 * Copies an account's state onto the studio that owns it, unless a later state was already
 * applied (events arrive in any order). `seenAt` is when Stripe stated it: the event's `created`,
 * or the time of a look-up. Returns the owning studio's id, or null when no studio owns the
 * account (then nothing changes).
 */
export async function applyAccountState(
	accountId: string,
	facts: AccountFacts,
	seenAt: Date,
	q: Pick<Tx, 'update' | 'select'> = db
): Promise<string | null> {
	const updated = await q
		.update(studio)
		.set({
			chargesEnabled: facts.chargesEnabled,
			payoutsEnabled: facts.payoutsEnabled,
			detailsSubmitted: facts.detailsSubmitted,
			accountRequirements: facts.requirements,
			accountEventAt: seenAt
		})
		.where(and(eq(studio.stripeAccountId, accountId), or(isNull(studio.accountEventAt), lte(studio.accountEventAt, seenAt))))
		.returning({ id: studio.id });
	if (updated[0]) return updated[0].id;
	const [owner] = await q.select({ id: studio.id }).from(studio).where(eq(studio.stripeAccountId, accountId));
	return owner?.id ?? null;
}

/**
 * Asks Stripe how an account stands now and copies that onto its studio (dated now, so an older
 * event arriving later changes nothing). Used when Stripe refuses a charge on the account: the
 * studio's copy was out of date. A look-up that fails leaves the studio as it was.
 */
export async function refreshAccountState(accountId: string): Promise<string | null> {
	try {
		const account = await stripe().accounts.retrieve(accountId);
		return await applyAccountState(accountId, accountFacts(account), new Date());
	} catch (e) {
		console.warn(`[payments] could not look up account ${accountId}:`, (e as Error).message);
		return null;
	}
}

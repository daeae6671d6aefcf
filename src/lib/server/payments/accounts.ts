// A studio's own Stripe account (Connect, direct charges: the studio is the merchant of record).
// What Stripe says of the account (Stripe API reference, "The Account object": charges_enabled,
// payouts_enabled, details_submitted, requirements.currently_due) is copied onto the studio that
// owns it, whether it arrives by an `account.updated` event or by looking the account up when the
// owner comes back from onboarding.
import { and, eq, isNull, lte, or } from 'drizzle-orm';
import type Stripe from 'stripe';
import { db } from '../db';
import { studio } from '../db/schema';

export interface AccountFacts {
	chargesEnabled: boolean;
	payoutsEnabled: boolean;
	detailsSubmitted: boolean;
	requirements: string[];
}

export function accountFacts(
	account: Pick<Stripe.Account, 'charges_enabled' | 'payouts_enabled' | 'details_submitted' | 'requirements'>
): AccountFacts {
	return {
		chargesEnabled: account.charges_enabled === true,
		payoutsEnabled: account.payouts_enabled === true,
		detailsSubmitted: account.details_submitted === true,
		requirements: [...(account.requirements?.currently_due ?? [])]
	};
}

/**
 * Copies an account's state onto the studio that owns it, unless a later state was already
 * applied (events arrive in any order). `seenAt` is when Stripe stated it: the event's `created`,
 * or the time of a look-up. Returns the owning studio's id, or null when no studio owns the
 * account (then nothing changes).
 */
export async function applyAccountState(accountId: string, facts: AccountFacts, seenAt: Date): Promise<string | null> {
	const updated = await db
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
	const [owner] = await db.select({ id: studio.id }).from(studio).where(eq(studio.stripeAccountId, accountId));
	return owner?.id ?? null;
}

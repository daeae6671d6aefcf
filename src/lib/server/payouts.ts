// "Get paid": the owner connects the studio to its own Stripe account (Connect, Standard
// accounts, direct charges: the studio is the merchant of record) through Stripe's hosted
// onboarding, and the studio takes bookings once that account can take charges. Stripe Connect
// guide "Standard accounts": create the account once, then an Account Link of type
// account_onboarding whenever the owner goes (again) to finish it; a link is single-use and
// short-lived, so its refresh_url asks us for a new one.
import { eq } from 'drizzle-orm';
import { db } from './db';
import { studio } from './db/schema';
import { stripe } from './payments/stripe';
import { accountFacts, applyAccountState } from './payments/accounts';
import { payoutStatus, type PayoutStatus } from '$lib/domain/payouts';

export { type PayoutStatus } from '$lib/domain/payouts';

/** Our pages an onboarding link comes back to. */
export const RETURN_PATH = '/studio/get-paid/return';
export const REFRESH_PATH = '/studio/get-paid/refresh';

/**
 * The studio's connected account, made the first time only. The studio's row is locked while the
 * account is made, so two clicks at once make one account (the second waits and finds it); the
 * Idempotency-Key, derived from the studio's id, makes a retry after a lost answer return the same
 * account (Stripe API reference, "Idempotent requests"), and the unique stripe_account_id is the
 * last word.
 */
async function ensureAccount(studioId: string): Promise<string> {
	return db.transaction(async (tx) => {
		const [row] = await tx.select().from(studio).where(eq(studio.id, studioId)).for('update');
		if (!row) throw new Error(`no studio ${studioId}`);
		if (row.stripeAccountId) return row.stripeAccountId;
		const account = await stripe().accounts.create(
			{
				type: 'standard',
				country: row.country,
				email: row.email,
				default_currency: row.currency.toLowerCase(),
				business_profile: { name: row.name },
				metadata: { studio_id: studioId }
			},
			{ idempotencyKey: `studio-account-${studioId}` }
		);
		await tx.update(studio).set({ stripeAccountId: account.id }).where(eq(studio.id, studioId));
		return account.id;
	});
}

/**
 * Starts (or resumes) the owner's onboarding: the account once, then a fresh Account Link whose
 * return and refresh addresses are our own pages on `origin`. Returns the link's address.
 */
export async function startGetPaid(studioId: string, origin: string): Promise<string> {
	return onboardingLink(await ensureAccount(studioId), origin);
}

/**
 * A fresh onboarding link for the studio's existing account (an expired or used link's
 * refresh_url lands here); null when the studio has no account yet, which only the owner's
 * button makes.
 */
export async function renewLink(studioId: string, origin: string): Promise<string | null> {
	const [row] = await db.select({ account: studio.stripeAccountId }).from(studio).where(eq(studio.id, studioId));
	return row?.account ? onboardingLink(row.account, origin) : null;
}

async function onboardingLink(account: string, origin: string): Promise<string> {
	const link = await stripe().accountLinks.create({
		account,
		type: 'account_onboarding',
		return_url: new URL(RETURN_PATH, origin).href,
		refresh_url: new URL(REFRESH_PATH, origin).href
	});
	return link.url;
}

/**
 * Looks the studio's account up and copies its state onto the studio (the return from onboarding
 * says nothing about the outcome: Stripe's guide asks to check the account itself). A state the
 * studio already holds is not written again, so opening the return page twice changes nothing.
 * Returns whether the studio has an account at all.
 */
export async function refreshAccount(studioId: string): Promise<boolean> {
	const [row] = await db
		.select({
			account: studio.stripeAccountId,
			chargesEnabled: studio.chargesEnabled,
			payoutsEnabled: studio.payoutsEnabled,
			detailsSubmitted: studio.detailsSubmitted,
			requirements: studio.accountRequirements
		})
		.from(studio)
		.where(eq(studio.id, studioId));
	if (!row?.account) return false;
	const facts = accountFacts(await stripe().accounts.retrieve(row.account));
	const same =
		facts.chargesEnabled === row.chargesEnabled &&
		facts.payoutsEnabled === row.payoutsEnabled &&
		facts.detailsSubmitted === row.detailsSubmitted &&
		facts.requirements.join('\n') === row.requirements.join('\n');
	if (!same) await applyAccountState(row.account, facts, new Date());
	return true;
}

/** The studio's payout state as its owner's pages show it, with the platform's fee. */
export async function payoutState(studioId: string): Promise<{ status: PayoutStatus; platformFeeBp: number }> {
	const [row] = await db
		.select({
			stripeAccountId: studio.stripeAccountId,
			chargesEnabled: studio.chargesEnabled,
			payoutsEnabled: studio.payoutsEnabled,
			accountRequirements: studio.accountRequirements,
			platformFeeBp: studio.platformFeeBp
		})
		.from(studio)
		.where(eq(studio.id, studioId));
	if (!row) throw new Error(`no studio ${studioId}`);
	return { status: payoutStatus(row), platformFeeBp: row.platformFeeBp };
}

export const BOOKINGS_NOT_OPEN =
	'This studio is not taking bookings yet: it is still setting up how it is paid. Rooms and rates are there to look at.';

// The billing details a person keeps in their account: one set per user, read and written by that
// user alone (the id comes from the session, never from the request). The rules are in
// $lib/domain/billing; what arrives here has passed them.
import { eq } from 'drizzle-orm';
import { db } from './db';
import { billingDetails } from './db/schema';
import { normaliseBilling, type BillingDetails } from '$lib/domain/billing';
import type { SessionUser } from './auth';

const columns = {
	kind: billingDetails.kind,
	name: billingDetails.name,
	street: billingDetails.street,
	postalCode: billingDetails.postalCode,
	city: billingDetails.city,
	country: billingDetails.country,
	vatId: billingDetails.vatId
};

/** The user's saved details, or null when they have none. */
export async function get(user: Pick<SessionUser, 'id'>): Promise<BillingDetails | null> {
	const [row] = await db.select(columns).from(billingDetails).where(eq(billingDetails.userId, user.id));
	return row ?? null;
}

/** Saves the user's details (replacing any saved before) and gives them as kept. */
export async function save(user: Pick<SessionUser, 'id'>, details: BillingDetails): Promise<BillingDetails> {
	const kept = normaliseBilling(details);
	const [row] = await db
		.insert(billingDetails)
		.values({ userId: user.id, ...kept })
		.onConflictDoUpdate({ target: billingDetails.userId, set: { ...kept, updatedAt: new Date() } })
		.returning(columns);
	return row!;
}

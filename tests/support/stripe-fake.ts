// The Stripe fake's test controls (fake-services/stripe/README.md), over its real socket, and
// the connected account a studio's payments are made on.
import { eq } from 'drizzle-orm';
import type { Database } from '../../src/lib/server/db/client';
import * as t from '../../src/lib/server/db/schema';
import { STRIPE_API_BASE } from './env';

/** The connected account of a studio (the demo seeds and makeStudio give each one). */
export async function accountOf(db: Database, studioId: string): Promise<string> {
	const [row] = await db.select({ account: t.studio.stripeAccountId }).from(t.studio).where(eq(t.studio.id, studioId));
	if (!row?.account) throw new Error(`studio ${studioId} has no connected account`);
	return row.account;
}

/** Pays a Checkout Session on the fake as a customer would on its page; gives the HTTP status. */
export async function payOnFake(sessionId: string): Promise<number> {
	const res = await fetch(`${STRIPE_API_BASE}/_control/sessions/${sessionId}/pay`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: '{}'
	});
	await res.body?.cancel();
	return res.status;
}

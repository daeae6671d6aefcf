// Makes sure every studio's connected payment account exists on the local Stripe fake. The fake
// keeps its state in memory, so after each start it knows none of the accounts the database
// names (the demo studios' fixed ones, test studios', and any an owner connected in an earlier
// run). npm start and npm test run this once the fake answers; against real Stripe
// (STRIPE_API_BASE elsewhere) it does nothing. Each account is made with the fake's
// `PUT /_control/accounts/:id` (fake-services/stripe/README.md), set up or not as the studio
// last heard from Stripe (charges enabled or not).
import { isNotNull } from 'drizzle-orm';
import { createDb } from '../src/lib/server/db/client';
import * as t from '../src/lib/server/db/schema';

const url = process.env.DATABASE_URL;
if (!url) throw new Error('DATABASE_URL is not set');
const base = process.env.STRIPE_API_BASE ?? '';
const local = /^http:\/\/(127\.0\.0\.1|localhost)(:\d+)?\/?$/.test(base);

if (!local) {
	console.log(`stripe accounts: ${base || 'STRIPE_API_BASE unset'} is not the local fake; nothing to do`);
} else {
	const { db, client } = createDb(url, { max: 1 });
	try {
		const studios = await db
			.select({
				accountId: t.studio.stripeAccountId,
				name: t.studio.name,
				country: t.studio.country,
				email: t.studio.email,
				currency: t.studio.currency,
				chargesEnabled: t.studio.chargesEnabled
			})
			.from(t.studio)
			.where(isNotNull(t.studio.stripeAccountId));
		for (const s of studios) {
			const res = await fetch(`${base.replace(/\/$/, '')}/_control/accounts/${encodeURIComponent(s.accountId!)}`, {
				method: 'PUT',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify({
					country: s.country,
					...(s.email ? { email: s.email } : {}),
					business_name: s.name,
					default_currency: s.currency.toLowerCase(),
					completed: s.chargesEnabled
				})
			});
			if (!res.ok) throw new Error(`the Stripe fake did not make account ${s.accountId}: ${res.status} ${await res.text()}`);
			await res.body?.cancel();
		}
		console.log(`stripe accounts: ${studios.length} on the local fake`);
	} finally {
		await client.end();
	}
}

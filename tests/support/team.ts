// A studio's team for specs that need one of their own: a studio beside the demo one (its
// settings copied, under another name, unpublished, with one open room and its own connected
// payment account on the Stripe fake), people put in its team, and the invitation e-mails the
// mail catcher received.
import { eq } from 'drizzle-orm';
import type { Database } from '../../src/lib/server/db/client';
import * as t from '../../src/lib/server/db/schema';
import { studioIdOf } from './db';
import { MAIL_API, STRIPE_API_BASE } from './env';

export interface TestStudio {
	id: string;
	name: string;
	slug: string;
	room: string;
	/** The room's short name, as bookings name it. */
	roomSlug: string;
}

export async function makeStudio(db: Database, name: string): Promise<TestStudio> {
	const id = crypto.randomUUID();
	const slug = `team-${id.slice(0, 8)}`;
	await db.insert(t.organization).values({ id, name, slug });
	const [demo] = await db
		.select()
		.from(t.studio)
		.where(eq(t.studio.id, await studioIdOf(db)));
	await db.insert(t.studio).values({ ...settingsOf(demo!), id, name, published: false });
	await connectStudio(db, id);
	const [room] = await db
		.insert(t.room)
		.values({
			studioId: id,
			slug: `team-room-${id.slice(0, 6)}`,
			name: `${name} room`,
			hourly: 1000,
			halfDay: 3000,
			fullDay: 5000
		})
		.returning();
	return { id, name, slug, room: room!.id, roomSlug: room!.slug };
}

type StudioRow = typeof t.studio.$inferSelect;

/**
 * Another studio's settings to copy, without what belongs to that studio's payment account alone
 * (its account id is unique; the copy gets an account of its own from `connectStudio`).
 */
export function settingsOf(row: StudioRow) {
	const {
		id: _id,
		updatedAt: _u,
		stripeAccountId: _a,
		chargesEnabled: _c,
		payoutsEnabled: _p,
		detailsSubmitted: _d,
		accountRequirements: _r,
		accountEventAt: _e,
		...settings
	} = row;
	return settings;
}

/** The connected account id a test studio gets: fixed by the studio's id, shaped like Stripe's. */
export const accountIdFor = (studioId: string) => `acct_${studioId.replace(/-/g, '').slice(0, 16)}`;

/** The platform key the app uses in tests (scripts/test.sh); the fake takes any sk_test_ key. */
const PLATFORM_KEY = process.env.STRIPE_SECRET_KEY ?? 'sk_test_slateroom_test';

/**
 * Gives a studio its own connected account on the Stripe fake, set up to take charges and pay out
 * (the fake's `PUT /_control/accounts/:id`, fake-services/stripe/README.md), and records on the
 * studio row what Stripe reports of it (`GET /v1/accounts/:id`: charges_enabled, payouts_enabled,
 * details_submitted, requirements.currently_due), as the app does when an account changes.
 */
export async function connectStudio(db: Database, studioId: string, completed = true): Promise<string> {
	const [row] = await db
		.select({ name: t.studio.name, country: t.studio.country, email: t.studio.email, currency: t.studio.currency })
		.from(t.studio)
		.where(eq(t.studio.id, studioId));
	if (!row) throw new Error(`no studio ${studioId}`);
	const accountId = accountIdFor(studioId);
	const made = await fetch(`${STRIPE_API_BASE}/_control/accounts/${accountId}`, {
		method: 'PUT',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify({
			country: row.country,
			...(row.email ? { email: row.email } : {}),
			business_name: row.name,
			default_currency: row.currency.toLowerCase(),
			completed
		})
	});
	if (!made.ok) throw new Error(`the Stripe fake did not make account ${accountId}: ${made.status} ${await made.text()}`);
	const res = await fetch(`${STRIPE_API_BASE}/v1/accounts/${accountId}`, {
		headers: { authorization: `Bearer ${PLATFORM_KEY}` }
	});
	if (!res.ok) throw new Error(`the Stripe fake does not show account ${accountId}: ${res.status} ${await res.text()}`);
	const account = (await res.json()) as {
		charges_enabled?: boolean;
		payouts_enabled?: boolean;
		details_submitted?: boolean;
		requirements?: { currently_due?: string[] } | null;
	};
	await db
		.update(t.studio)
		.set({
			stripeAccountId: accountId,
			chargesEnabled: account.charges_enabled === true,
			payoutsEnabled: account.payouts_enabled === true,
			detailsSubmitted: account.details_submitted === true,
			accountRequirements: [...(account.requirements?.currently_due ?? [])]
		})
		.where(eq(t.studio.id, studioId));
	return accountId;
}

export async function joinTeam(db: Database, studioId: string, userId: string, role: t.StaffRole): Promise<void> {
	await db.insert(t.member).values({ id: crypto.randomUUID(), organizationId: studioId, userId, role });
}

export async function userIdOf(db: Database, email: string): Promise<string> {
	const [row] = await db.select({ id: t.user.id }).from(t.user).where(eq(t.user.email, email));
	if (!row) throw new Error(`no user ${email}`);
	return row.id;
}

export interface CaughtMail {
	subject: string;
	text: string;
	to: { address: string }[];
	from: { name: string }[];
}

/** Every message the mail catcher holds for an address, oldest first. */
export async function mailTo(address: string): Promise<CaughtMail[]> {
	const all = (await (await fetch(`${MAIL_API}/api/email`)).json()) as CaughtMail[];
	return all.filter((m) => m.to.some((x) => x.address === address));
}

/** The invitation id in an invitation e-mail's link. */
export const invitationIdIn = (text: string) => text.match(/\/invitations\/([0-9a-f-]{36})/)?.[1];

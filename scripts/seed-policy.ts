// What every demo studio's seed writes the same way: a policy's columns of the studio row and its
// surcharge rules. Each studio's own seed adds its name, address and words.
import { and, eq, isNull, sql } from 'drizzle-orm';
import type { Database } from '../src/lib/server/db/client';
import * as t from '../src/lib/server/db/schema';
import type { StudioPolicy } from '../src/lib/domain/types';

/** A policy as the studio row's columns. */
export function policyColumns(P: StudioPolicy) {
	return {
		country: P.country,
		timeZone: P.timeZone,
		currency: P.currency,
		vatRateBp: P.vatRateBp,
		pricesIncludeVat: P.pricesIncludeVat,
		halfDayMinutes: P.blocks.halfDayMinutes,
		fullDayMinutes: P.blocks.fullDayMinutes,
		minBookingMinutes: P.minBookingMinutes,
		incrementMinutes: P.incrementMinutes,
		turnaroundMinutes: P.turnaroundMinutes,
		minNoticeMinutes: P.minNoticeMinutes,
		horizonDays: P.horizonDays,
		holdMinutes: P.holdMinutes,
		depositBp: P.depositBp,
		depositMinimum: P.depositMinimum,
		overtimeIncrementMinutes: P.overtimeIncrementMinutes,
		engineerHourly: P.engineerRates.hourly,
		engineerHalfDay: P.engineerRates.halfDay,
		engineerFullDay: P.engineerRates.fullDay,
		openingHours: P.openingHours.map((h) => ({ ...h })),
		cancellation: P.cancellation.map((c) => ({ ...c }))
	};
}

/** The policy's surcharges, once: a studio that has any keeps them as they are. */
export async function seedSurcharges(db: Database, studioId: string, P: StudioPolicy): Promise<void> {
	const [{ n } = { n: 0 }] = await db
		.select({ n: sql<number>`count(*)::int` })
		.from(t.surchargeRule)
		.where(eq(t.surchargeRule.studioId, studioId));
	if (n > 0) return;
	await db.insert(t.surchargeRule).values(
		P.surcharges.map((r, i) => ({
			studioId,
			label: r.label,
			kind: r.kind,
			percentBp: r.percentBp,
			weekdays: [...r.weekdays],
			fromMinute: r.fromMinute,
			toMinute: r.toMinute,
			sortOrder: i + 1
		}))
	);
}

/**
 * The studio's own connected payment account (Stripe Connect, direct charges), under a fixed id,
 * set up as Stripe reports a finished onboarding: it takes charges and pays out, nothing is due.
 * A studio that has an account already keeps it. The local Stripe fake keeps its accounts in
 * memory, so npm start and npm test make them there once it runs (scripts/stripe-accounts.ts).
 */
export async function seedAccount(db: Database, studioId: string, accountId: string): Promise<void> {
	await db
		.update(t.studio)
		.set({
			stripeAccountId: accountId,
			chargesEnabled: true,
			payoutsEnabled: true,
			detailsSubmitted: true,
			accountRequirements: []
		})
		.where(and(eq(t.studio.id, studioId), isNull(t.studio.stripeAccountId)));
}

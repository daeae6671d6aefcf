// The demo studios' money history. The seed (scripts/seed-bookings.ts) places the demo sessions
// relative to today but cannot reach the invoicing code (it runs outside the app), so the app
// gives them, once, the history real sessions have: each demo deposit paid ten days before its
// session with its deposit invoice, each finished session closed on time with its final invoice,
// and the first one's balance paid, the second's still owed. Every document goes through the same
// issuing code as a real one, in date order, so numbers stay gapless and in sequence.
//
// It touches only the demo's own bookings (the ids the seeds give them: DEMO_BOOKING_IDS, and
// SECOND_BOOKING_IDS for the second demo studio) that have no payment yet, so it does nothing on
// a real studio's database (SEED_DEMO=0 seeds no demo sessions).
import { and, asc, eq, inArray, notExists, sql } from 'drizzle-orm';
import { db } from './db';
import { booking, payment } from './db/schema';
import { issueDepositInvoice, issueFinalInvoice } from './invoices/documents';
import type { Tx } from './payments/core';
import { DEMO_BOOKING_IDS } from '$lib/domain/demo';
import { SECOND_BOOKING_IDS } from '$lib/domain/demo-second';

const DAY = 86_400_000;

type Step = { at: Date; run: (tx: Tx) => Promise<unknown> };

/** Each demo studio's history on its own (each has its own document series). */
export async function ensureDemoLedger(now = new Date()): Promise<number> {
	let n = 0;
	for (const ids of [DEMO_BOOKING_IDS, SECOND_BOOKING_IDS]) n += await ledgerOf(ids, now);
	return n;
}

async function ledgerOf(ids: readonly string[], now: Date): Promise<number> {
	return db.transaction(async (tx) => {
		// One server at a time; a second start finds the payments and does nothing.
		await tx.execute(sql`select pg_advisory_xact_lock(hashtext('slateroom-demo-ledger'))`);
		const rows = await tx
			.select()
			.from(booking)
			.where(
				and(
					inArray(booking.id, [...ids]),
					inArray(booking.status, ['confirmed', 'completed']),
					notExists(
						tx
							.select({ one: sql`1` })
							.from(payment)
							.where(eq(payment.bookingId, booking.id))
					)
				)
			)
			.orderBy(asc(booking.startsAt));
		const steps: Step[] = [];
		rows.forEach((b, i) => {
			const paidAt = new Date(Math.min(b.startsAt.getTime() - 10 * DAY, now.getTime() - 60_000));
			steps.push({
				at: paidAt,
				run: async (t) => {
					const [p] = await t
						.insert(payment)
						.values({
							studioId: b.studioId,
							bookingId: b.id,
							kind: 'deposit',
							amount: b.deposit,
							currency: b.currency,
							status: 'paid',
							paidAt
						})
						.returning({ id: payment.id });
					await issueDepositInvoice(t, { paymentId: p!.id, issuedAt: paidAt });
				}
			});
			if (b.status !== 'completed') return;
			const closedAt = new Date(Math.min(b.endsAt.getTime() + 30 * 60_000, now.getTime() - 30_000));
			steps.push({
				at: closedAt,
				run: async (t) => {
					await t.update(booking).set({ actualEndsAt: b.endsAt }).where(eq(booking.id, b.id));
					const final = await issueFinalInvoice(t, { bookingId: b.id, issuedAt: closedAt });
					// The earliest finished session has its balance paid; the later one is still owed.
					if (i === 0 && final.amountDue > 0) {
						await t.insert(payment).values({
							studioId: b.studioId,
							bookingId: b.id,
							kind: 'balance',
							amount: final.amountDue,
							currency: b.currency,
							status: 'paid',
							paidAt: new Date(closedAt.getTime() + 60 * 60_000)
						});
					}
				}
			});
		});
		steps.sort((a, b) => a.at.getTime() - b.at.getTime());
		for (const step of steps) await step.run(tx);
		return rows.length;
	});
}

// Holding a slot: the slot is the artist's for the studio's hold time, until the deposit is
// paid. The price comes from the pricing engine and the slot from the database's exclusion
// constraints; nothing about price, status, artist or hold expiry is taken from the request.
import { sql } from 'drizzle-orm';
import { db } from '../db';
import { booking, bookingGear } from '../db/schema';
import type { SessionUser } from '../auth';
import { audit } from '../audit';
import { pgCode } from '../payments/core';
import { startCheckout } from '../payments/checkout';
import { holdExpiry } from '$lib/domain/lifecycle';
import type { Quote } from '$lib/domain/pricing';
import { nearestStarts } from './availability';
import type { PricingContext } from './context';
import { expireLapsedHolds } from './occupancy';
import { priceRequest } from './quote';
import { newReference } from './reference';
import { busyUntil as busyUntilOf, isoInZone, minutesBetween, type BookingRequest, type InvalidRequest } from './request';
import { resourceCalendar, type Taken } from './resources';

import type { BookingRow } from './read';

export type HoldRefusal = InvalidRequest | { ok: false; status: 409; taken: Taken; message: string; nearestStarts: string[] };

export type HoldOutcome = { ok: true; booking: BookingRow; quote: Quote } | HoldRefusal;

const CONFLICT_MESSAGES = {
	room: 'That time in this room has just been taken.',
	engineer: 'No engineer is free for that time.',
	gear: 'A piece of the chosen gear is already booked for that time.'
} as const;

/** Makes a hold from a parsed request, with the studio as read once for this request. */
export async function createHold(
	artist: SessionUser,
	req: BookingRequest,
	ctx: PricingContext,
	now = new Date()
): Promise<HoldOutcome> {
	const priced = await priceRequest(req, ctx, now);
	if (!priced.ok) return priced;
	const { quote, room: roomRow, start, end, gear } = priced;
	const busyUntil = busyUntilOf(end, ctx.policy.turnaroundMinutes);
	const holdExpiresAt = holdExpiry(now, ctx.policy.holdMinutes);

	// Holds whose time ran out must not keep anyone else from this slot.
	await expireLapsedHolds(now, ctx.studio.id);

	const minutes = minutesBetween(start, end);
	const needs = { engineer: req.engineer, gearIds: gear.map((g) => g.id) };
	const conflict = async (taken: Taken): Promise<HoldOutcome> => ({
		ok: false,
		status: 409,
		taken,
		message: CONFLICT_MESSAGES[taken],
		nearestStarts: await nearestStarts(roomRow, ctx, start, minutes, now, needs)
	});
	// What stood in the way last, should the retries run out.
	let lastTaken: Taken = 'room';

	for (let attempt = 0; attempt < 6; attempt++) {
		let engineerId: string | null = null;
		if (req.engineer) {
			const engineers = await resourceCalendar(ctx.studio.id, { engineer: true }, start, busyUntil, now);
			engineerId = engineers.freeEngineer(start.getTime(), busyUntil.getTime());
			if (!engineerId) return conflict('engineer');
		}
		try {
			const created = await db.transaction(async (tx) => {
				// Queue writers of the same room, engineer and gear (always in this order, gear by id, so
				// the queue itself cannot deadlock). Without it, concurrent inserts that conflict in an
				// exclusion constraint wait on each other and end in deadlocks (SQLSTATE 40P01) that
				// PostgreSQL only breaks after deadlock_timeout. The constraint stays the final word.
				const keys = [
					`room:${roomRow.id}`,
					...(engineerId ? [`engineer:${engineerId}`] : []),
					...gear.map((g) => `gear:${g.id}`).sort()
				];
				for (const key of keys) await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${key}, 0))`);
				const [row] = await tx
					.insert(booking)
					.values({
						studioId: ctx.studio.id,
						reference: newReference(ctx.studio.referencePrefix),
						roomId: roomRow.id,
						engineerId,
						artistId: artist.id,
						startsAt: start,
						endsAt: end,
						busyUntil,
						status: 'held',
						holdExpiresAt,
						project: req.project,
						notes: req.notes,
						quote,
						currency: quote.currency,
						total: quote.total,
						deposit: quote.deposit,
						// Whom to bill, as chosen at booking (the request's rules were checked when it was read).
						billing: req.billing ?? null
					})
					.returning();
				if (gear.length) {
					await tx.insert(bookingGear).values(
						gear.map((g) => ({
							studioId: ctx.studio.id,
							bookingId: row!.id,
							gearItemId: g.id,
							hireFee: g.hireFee,
							startsAt: start,
							busyUntil
						}))
					);
				}
				return row!;
			});
			return { ok: true, booking: created, quote };
		} catch (e) {
			const { code, constraint } = pgCode(e);
			// Deadlocks and serialization failures are retried, never shown (PostgreSQL manual, Appendix A).
			if (code === '40P01' || code === '40001') {
				await new Promise((r) => setTimeout(r, 5 + Math.random() * 20 * (attempt + 1)));
				continue;
			}
			if (code === '23505' && constraint?.includes('reference')) continue;
			if (code === '23P01') {
				if (constraint === 'booking_engineer_no_overlap') {
					lastTaken = 'engineer';
					continue; // another engineer may still be free
				}
				return conflict(constraint === 'booking_gear_no_overlap' ? 'gear' : 'room');
			}
			throw e;
		}
	}
	return conflict(lastTaken);
}

export type HeldWithCheckout = {
	ok: true;
	booking: BookingRow;
	quote: Quote;
	/** The hold's end in the studio's zone, ISO 8601 with its offset. */
	holdExpiresAt: string;
	/** Stripe Checkout for the deposit; null when it could not be started (the booking page offers it again). */
	checkoutUrl: string | null;
	timeZone: string;
};

/**
 * Holds the slot, records who held it, and starts the deposit's Checkout: the one way to book,
 * for the studio's /book form and for POST /api/studios/STUDIO/bookings alike. `at.ctx` is the
 * studio of the address: the room and gear are looked up in it alone.
 */
export async function holdAndCheckout(
	actor: SessionUser,
	req: BookingRequest,
	at: { origin: string; ip: string; ctx: PricingContext },
	now = new Date()
): Promise<HeldWithCheckout | HoldRefusal> {
	const { ctx } = at;
	const outcome = await createHold(actor, req, ctx, now);
	if (!outcome.ok) return outcome;
	const b = outcome.booking;
	await audit({ actorId: actor.id, action: 'booking.held', entity: 'booking', entityId: b.id, ip: at.ip });
	const checkout = await startCheckout(b.id, 'deposit', at.origin).catch((e: unknown) => {
		// The hold stands; the booking page offers the deposit payment again.
		console.warn('[bookings] could not start the deposit checkout', (e as Error).message);
		return null;
	});
	const tz = ctx.policy.timeZone;
	return {
		ok: true,
		booking: b,
		quote: outcome.quote,
		holdExpiresAt: isoInZone(b.holdExpiresAt!, tz),
		checkoutUrl: checkout?.url ?? null,
		timeZone: tz
	};
}

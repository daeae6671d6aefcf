// Booking and paying as an artist does, over the app's API and the Stripe fake: the set-up of the
// integration specs that need a held, or a paid and confirmed, session of their own.
import { eq } from 'drizzle-orm';
import * as t from '../../src/lib/server/db/schema';
import type { Database } from '../../src/lib/server/db/client';
import type { Client } from './http';
import { firstFree, type Slot, type SlotTimes } from './slots';
import { payOnFake } from './stripe-fake';
import { waitFor } from './wait';

/** A quote as the API gives it (POST /api/studios/hollow-pine/quote, and with a new hold): integer minor units. */
export interface ApiQuote {
	lines: { key: string; label: string; amount: number; net: number }[];
	net: number;
	vat: { ratePercent: string; base: number; amount: number }[];
	vatTotal: number;
	gross: number;
	rounding: number;
	total: number;
	deposit: number;
	balance: number;
	vatTreatment: 'standard' | 'reverse-charge';
}

/** A hold made through POST /api/bookings, with the slot it was made for. */
export interface Held extends Slot {
	id: string;
	reference: string;
	status: string;
	checkoutUrl: string;
	/** The Checkout Session on the Stripe fake (the end of `checkoutUrl`). */
	sessionId: string;
	quote: ApiQuote;
}

/** What a spec asks for: the room, the file's own days and the slots on each, and any more fields. */
export interface HoldWish {
	room: string;
	days: readonly string[];
	slots: SlotTimes;
	/** More fields of the request, e.g. `{ engineer: true, project: '…' }`. */
	extra?: Record<string, unknown>;
	/** The studio's short name; the demo studio's (hollow-pine) when left out. */
	studio?: string;
}

/** The Checkout Session id at the end of a booking's checkout address ('…/pay/cs_test_…'). */
export function sessionOf(checkoutUrl: string): string {
	const id = checkoutUrl.split('/pay/')[1];
	if (!id) throw new Error(`no Checkout Session in ${checkoutUrl}`);
	return id;
}

function held(body: Omit<Held, 'sessionId'>): Held {
	return { ...body, sessionId: sessionOf(body.checkoutUrl) };
}

/** Holds the first free slot of the wish as `who`; taken slots are passed over, anything else fails. */
export async function holdFirstFree(who: Client, wish: HoldWish): Promise<Held> {
	const body = await firstFree<Omit<Held, 'sessionId' | keyof Slot>>(wish.days, wish.slots, async ({ start, end }) => {
		const res = await who.json(`/api/studios/${wish.studio ?? 'hollow-pine'}/bookings`, {
			room: wish.room,
			start,
			end,
			...wish.extra
		});
		return { status: res.status, body: () => res.json() };
	});
	return held(body);
}

/** Holds exactly this slot as `who`; fails unless the app answers 201. */
export async function holdAt(who: Client, room: string, day: string, from: string, to: string): Promise<Held> {
	return holdFirstFree(who, { room, days: [day], slots: [[from, to]] });
}

/** Pays the hold's deposit on the Stripe fake, as the artist would, and waits until the webhook has confirmed it. */
export async function payAndConfirm(db: Database, booking: { id: string; checkoutUrl: string }): Promise<void> {
	const status = await payOnFake(sessionOf(booking.checkoutUrl));
	if (status !== 200) throw new Error(`paying ${booking.id} on the fake answered ${status}`);
	await waitFor(async () => {
		const [row] = await db.select({ status: t.booking.status }).from(t.booking).where(eq(t.booking.id, booking.id));
		return row?.status === 'confirmed';
	}, `booking ${booking.id} confirmed`);
}

/** Holds the first free slot of the wish and pays its deposit: a confirmed session of the spec's own. */
export async function bookAndPay(db: Database, who: Client, wish: HoldWish): Promise<Held> {
	const booking = await holdFirstFree(who, wish);
	await payAndConfirm(db, booking);
	return booking;
}

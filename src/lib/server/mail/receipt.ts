// A receipt for every payment a booking receives: each Checkout payment that becomes paid (deposit,
// balance, or any other kind; payments/state.ts), each payment the owner records by hand, and a
// short note when a recorded payment is reversed (payments/recorded.ts). Queued in the outbox in
// the transaction that records the payment, keyed `receipt:<payment id>`, so a webhook delivered
// twice still sends one; a `scheduled_message` row of kind 'receipt' with the same key, due and
// sent at once, lists it among the booking's messages.
import { eq, sql } from 'drizzle-orm';
import { booking, room, scheduledMessage, studio, user } from '../db/schema';
import type { Tx } from '../payments/core';
import { owedOn } from '../payments/balance';
import { enqueueMail, flushSoon } from './outbox';
import { publicOrigin } from './transport';
import { formatMoney } from '$lib/domain/money';
import { methodLabel, type PaymentMethod } from '$lib/domain/recorded-payments';
import { formatCalendarDate, formatDate, formatTimes } from '$lib/domain/time';

export interface ReceiptFacts {
	studioName: string;
	studioEmail: string;
	timeZone: string;
	locale: string;
	artistName: string;
	reference: string;
	roomName: string;
	startsAt: Date;
	endsAt: Date;
	currency: string;
	/** Minor units; on a reversal, the amount taken back (positive). */
	amount: number;
	method: PaymentMethod;
	/** The day the money changed hands, 'YYYY-MM-DD' in the studio's calendar. */
	paidOn: string;
	/** Still owed once this payment counts. */
	owedAfter: number;
	/** A reversal of an earlier recorded payment: why. */
	reversal: { reason: string } | null;
	bookingUrl: string;
}

/** The receipt's subject and text. */
export function composeReceipt(f: ReceiptFacts): { subject: string; text: string } {
	const money = (minor: number) => formatMoney(minor, f.currency, f.locale);
	const when = `${formatDate(f.startsAt, f.timeZone, f.locale)}, ${formatTimes(f.startsAt, f.endsAt, f.timeZone, f.locale)}`;
	const day = formatCalendarDate(f.paidOn, { day: 'numeric', month: 'long', year: 'numeric' }, f.locale);
	const how = methodLabel(f.method).toLowerCase();
	const head = f.reversal
		? [
				`a payment of ${money(f.amount)} (${how}) recorded for your session at ${f.studioName} has been taken off your booking.`,
				`Reason: ${f.reversal.reason}`
			]
		: [`${f.studioName} has received your payment. Thank you.`];
	const text = [
		`Hello ${f.artistName},`,
		'',
		...head,
		'',
		`  Studio:     ${f.studioName}`,
		`  Booking:    ${f.reference}`,
		`  Session:    ${when} (${f.timeZone} time), ${f.roomName}`,
		f.reversal ? `  Taken off:  ${money(f.amount)}` : `  Amount:     ${money(f.amount)}`,
		`  Method:     ${methodLabel(f.method)}`,
		f.reversal ? `  Date:       ${day}` : `  Paid on:    ${day}`,
		`  Still owed: ${money(f.owedAfter)}`,
		'',
		`Your booking, its payments and invoices: ${f.bookingUrl}`,
		'',
		f.studioName,
		f.studioEmail
	].join('\n');
	const subject = f.reversal
		? `Payment taken off booking ${f.reference}: ${money(f.amount)}`
		: `Receipt: ${money(f.amount)} for booking ${f.reference}`;
	return { subject, text };
}

export interface ReceiptInput {
	bookingId: string;
	/** The payment's own id (a Checkout payment's or a recorded entry's): the receipt's key. */
	paymentId: string;
	amount: number;
	method: PaymentMethod;
	paidOn: string;
	reversal?: { reason: string } | null;
}

/**
 * Queues the receipt of one payment inside the transaction that records it (which holds the
 * booking's row lock, so the balance it states is the one after this payment). Once per payment id.
 */
export async function queueReceipt(tx: Tx, input: ReceiptInput): Promise<void> {
	const [row] = await tx
		.select({ b: booking, s: studio, roomName: room.name, artistName: user.name, artistEmail: user.email })
		.from(booking)
		.innerJoin(studio, eq(studio.id, booking.studioId))
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(eq(booking.id, input.bookingId));
	if (!row) return;
	const { b, s } = row;
	const { owed } = await owedOn(tx, b);
	const mail = composeReceipt({
		studioName: s.name,
		studioEmail: s.email,
		timeZone: s.timeZone,
		locale: s.locale,
		artistName: row.artistName,
		reference: b.reference,
		roomName: row.roomName,
		startsAt: b.startsAt,
		endsAt: b.endsAt,
		currency: b.currency,
		amount: Math.abs(input.amount),
		method: input.method,
		paidOn: input.paidOn,
		owedAfter: owed,
		reversal: input.reversal ?? null,
		bookingUrl: `${publicOrigin()}/bookings/${b.id}`
	});
	const key = `receipt:${input.paymentId}`;
	await enqueueMail(tx, { studioId: s.id, dedupeKey: key, to: row.artistEmail, subject: mail.subject, text: mail.text });
	// The booking's list of messages shows it: due and sent at once (the outbox does the sending).
	await tx
		.insert(scheduledMessage)
		.values({ studioId: s.id, bookingId: b.id, kind: 'receipt', key, dueAt: sql`now()`, sentAt: sql`now()` })
		.onConflictDoNothing({ target: [scheduledMessage.bookingId, scheduledMessage.key] });
	flushSoon();
}

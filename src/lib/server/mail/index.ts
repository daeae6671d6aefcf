// E-mail: the messages the studio sends about a booking, queued in the outbox inside the
// transaction that confirms or cancels it (payments/state.ts and payments/refunds.ts call these),
// and its invitations into the team; the periodic jobs (src/lib/server/jobs.ts) send what is queued.
import { and, eq } from 'drizzle-orm';
import { booking, bookingGear, gearItem, organization, room, studio, user } from '../db/schema';
import type { CancellationFact } from '../payments/refunds';
import type { Tx } from '../payments/core';
import { composeCancellation, composeConfirmation, type ConfirmationFacts } from './confirmation';
import { enqueueMail, flushSoon } from './outbox';
import { publicOrigin } from './transport';
import { composeInvitation } from './invitation';
import { composeMoved, composeMoveFailed } from './move';
import { composeNoShow } from './no-show';
import { studioPath } from '$lib/studio-paths';
import { db } from '../db';
import { getStudio } from '../studio';
import type { Role } from '$lib/roles';

export { flushOutbox } from './outbox';

/** What a message about a booking says, read inside the transaction that changes the booking. */
async function bookingFacts(tx: Tx, bookingId: string): Promise<(ConfirmationFacts & { studioId: string }) | null> {
	// The booking with its own studio (its name, zone, address and currency speak in the message).
	const [row] = await tx
		.select({ b: booking, s: studio, roomName: room.name, artistName: user.name, artistEmail: user.email })
		.from(booking)
		.innerJoin(studio, eq(studio.id, booking.studioId))
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(eq(booking.id, bookingId));
	if (!row) return null;
	const { b, s } = row;
	const [engineer] = b.engineerId ? await tx.select({ name: user.name }).from(user).where(eq(user.id, b.engineerId)) : [];
	const gear = await tx
		.select({ name: gearItem.name })
		.from(bookingGear)
		.innerJoin(gearItem, eq(gearItem.id, bookingGear.gearItemId))
		.where(and(eq(bookingGear.bookingId, b.id), eq(bookingGear.active, true)));
	const quote = b.quote as { lines?: { label: string; amount: number }[] };
	return {
		bookingId: b.id,
		reference: b.reference,
		sequence: b.sequence,
		startsAt: b.startsAt,
		endsAt: b.endsAt,
		roomName: row.roomName,
		engineerName: b.engineerId ? (engineer?.name ?? 'an engineer') : null,
		gear: gear.map((g) => g.name),
		artistName: row.artistName,
		artistEmail: row.artistEmail,
		project: b.project,
		currency: b.currency,
		total: b.total,
		deposit: b.deposit,
		lines: (quote.lines ?? []).map((l) => ({ label: l.label, amount: l.amount })),
		studio: s,
		studioId: s.id,
		bookingUrl: `${publicOrigin()}/bookings/${b.id}`
	};
}

const calendarAttachment = (reference: string, ics: string, method: 'PUBLISH' | 'CANCEL') => ({
	filename: `${reference}.ics`,
	contentType: `text/calendar; charset=utf-8; method=${method}`,
	content: ics
});

/** Queues the confirmation of a booking inside the transaction that confirms it. */
export async function queueConfirmation(tx: Tx, bookingId: string): Promise<void> {
	const facts = await bookingFacts(tx, bookingId);
	if (!facts) return;
	const mail = composeConfirmation(facts);
	await enqueueMail(tx, {
		studioId: facts.studioId,
		dedupeKey: `booking-confirmed:${bookingId}`,
		to: facts.artistEmail,
		subject: mail.subject,
		text: mail.text,
		attachments: [calendarAttachment(facts.reference, mail.ics, 'PUBLISH')]
	});
	flushSoon();
}

/**
 * Queues the notice of a cancellation inside the transaction that cancels: what comes back by the
 * policy, and a calendar file that removes the session. A hold nobody paid for gets no message.
 */
export async function queueCancellation(tx: Tx, fact: CancellationFact): Promise<void> {
	if (fact.was === 'held') return;
	const facts = await bookingFacts(tx, fact.bookingId);
	if (!facts) return;
	const mail = composeCancellation({ ...facts, refund: fact.refund, retained: fact.retained, rule: fact.rule });
	await enqueueMail(tx, {
		studioId: facts.studioId,
		dedupeKey: `booking-cancelled:${fact.bookingId}`,
		to: facts.artistEmail,
		subject: mail.subject,
		text: mail.text,
		attachments: [calendarAttachment(facts.reference, mail.ics, 'CANCEL')]
	});
	flushSoon();
}

/**
 * Queues the e-mails of a move inside the transaction that applies it: to the artist and to the
 * booking's engineer, each with the calendar file at the booking's new SEQUENCE. Keyed by the
 * booking and that sequence, so each move's message exists once.
 */
export async function queueMoveNotice(tx: Tx, bookingId: string, sequence: number): Promise<void> {
	const facts = await bookingFacts(tx, bookingId);
	if (!facts) return;
	const artist = composeMoved(facts, 'artist');
	await enqueueMail(tx, {
		studioId: facts.studioId,
		dedupeKey: `booking-moved:${bookingId}:${sequence}`,
		to: facts.artistEmail,
		subject: artist.subject,
		text: artist.text,
		attachments: [calendarAttachment(facts.reference, artist.ics, 'PUBLISH')]
	});
	const [row] = await tx
		.select({ email: user.email })
		.from(booking)
		.innerJoin(user, eq(user.id, booking.engineerId))
		.where(eq(booking.id, bookingId));
	if (row) {
		const mail = composeMoved(facts, 'engineer');
		await enqueueMail(tx, {
			studioId: facts.studioId,
			dedupeKey: `booking-moved:${bookingId}:${sequence}:engineer`,
			to: row.email,
			subject: mail.subject,
			text: mail.text,
			attachments: [calendarAttachment(facts.reference, mail.ics, 'PUBLISH')]
		});
	}
	flushSoon();
}

/** Queues the note that a paid move could not be made and its payment goes back. */
export async function queueMoveFailed(tx: Tx, bookingId: string, moveId: string, refund: number): Promise<void> {
	const facts = await bookingFacts(tx, bookingId);
	if (!facts) return;
	const mail = composeMoveFailed(facts, refund);
	await enqueueMail(tx, {
		studioId: facts.studioId,
		dedupeKey: `booking-move-failed:${moveId}`,
		to: facts.artistEmail,
		subject: mail.subject,
		text: mail.text
	});
	flushSoon();
}

/**
 * Queues the note that nobody came, inside the transaction that records it: what the cancellation
 * terms at zero notice do with the deposit, and where to book again. Once per booking.
 */
export async function queueNoShow(
	tx: Tx,
	fact: { bookingId: string; refund: number; retained: number; rule: string }
): Promise<void> {
	const facts = await bookingFacts(tx, fact.bookingId);
	if (!facts) return;
	const [org] = await tx.select({ slug: organization.slug }).from(organization).where(eq(organization.id, facts.studioId));
	const mail = composeNoShow({
		...facts,
		refund: fact.refund,
		retained: fact.retained,
		rule: fact.rule,
		bookAgainUrl: `${publicOrigin()}${studioPath(org?.slug ?? '', 'book')}`
	});
	await enqueueMail(tx, {
		studioId: facts.studioId,
		dedupeKey: `booking-no-show:${fact.bookingId}`,
		to: facts.artistEmail,
		subject: mail.subject,
		text: mail.text
	});
	flushSoon();
}

/**
 * Queues the e-mail of an invitation into a studio's team, from the studio's name and address;
 * better-auth's organization plugin calls it once it has written the invitation, and again for a
 * resend, whose new expiry makes it a message of its own.
 */
export async function queueInvitation(input: {
	id: string;
	email: string;
	role: Role;
	studioId: string;
	studioName: string;
	inviterName: string;
	expiresAt: Date;
}): Promise<void> {
	const studio = await getStudio(input.studioId);
	const mail = composeInvitation({
		...input,
		timeZone: studio.timeZone,
		locale: studio.locale,
		url: `${publicOrigin()}/invitations/${input.id}`
	});
	await db.transaction((tx) =>
		enqueueMail(tx, {
			studioId: input.studioId,
			dedupeKey: `invitation:${input.id}:${input.expiresAt.getTime()}`,
			to: input.email,
			subject: mail.subject,
			text: mail.text
		})
	);
	flushSoon();
}

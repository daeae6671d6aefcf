// A booking's scheduled e-mails (reminders, the balance request, receipts): one row per message
// in `scheduled_message`, one pg-boss job per message and due time, and one send, through the
// outbox, in the same transaction that marks the row sent.
//
// - syncBookingMessages(bookingId) is called after a booking changes (confirmed, cancelled,
//   closed, moved, no-show): it writes the messages the rules ($lib/domain/messages) want, moves
//   their due time when the session moved, cancels the unsent ones no longer wanted, and puts a
//   job on the queue for each new or moved one. It is idempotent: calling it twice changes nothing.
// - deliverMessage (the job) reads the row and the booking again at send time and sends only
//   what is still wanted at that very due time.
// - sweepMessages (a periodic job) puts a job on the queue for anything due within a minute
//   (a job lost with a failed step is made again; the queue drops a second one for the same
//   message and time) and re-plans bookings whose wanted messages are missing, found by index.
import { and, asc, eq, inArray, isNull, lte, sql } from 'drizzle-orm';
import { db } from '../db';
import { booking, room, scheduledMessage, studio, user } from '../db/schema';
import { enqueueMail, flushSoon } from '../mail/outbox';
import { publicOrigin } from '../mail/transport';
import { summariesFor } from '../uploads';
import { MESSAGE_QUEUE, queue } from '../queue';
import type { BookingRow, Tx } from '../payments/core';
import { owedOn } from '../payments/balance';
import {
	BALANCE_REQUEST_KEY,
	MAX_REMINDER_HOURS,
	PLANNED_KINDS,
	planMessages,
	stillWanted,
	wantedMessages,
	type MessageKind
} from '$lib/domain/messages';
import { composeBalanceRequest, composeReminder, type ComposedMessage, type MessageFacts } from './compose';

export type ScheduledMessageRow = typeof scheduledMessage.$inferSelect;

/** A message job's data: which message, and the due time it was scheduled for. */
export interface MessageJob {
	messageId: string;
	dueAt: string;
}

/**
 * What is still to pay on a booking after its final invoice, as the money panel reads it
 * (payments/balance.ts `owedOn`); null before that invoice. The one place the scheduled messages
 * read a balance from.
 */
async function balanceOwed(tx: Tx, b: BookingRow): Promise<number | null> {
	const owed = await owedOn(tx, b);
	return owed.final ? owed.owed : null;
}

/**
 * A cheap first sift for the sweep, in SQL: a final invoice whose amount due is not yet met by the
 * balance paid by card and the payments recorded after it (those recorded before are already
 * deducted on it). The sync then decides with `owedOn`.
 */
function mayOweSql(bookingId: unknown) {
	return sql<boolean>`exists (
		select 1 from invoice i where i.source_key = 'final:' || ${bookingId}::text
			and i.amount_due
				- coalesce((select sum(p.amount) from payment p where p.booking_id = i.booking_id and p.kind = 'balance' and p.status = 'paid'), 0)
				- coalesce((select sum(r.amount) from recorded_payment r where r.booking_id = i.booking_id and r.created_at > i.issued_at), 0) > 0
	)`;
}

const singletonKey = (id: string, dueAt: Date) => `${id}:${dueAt.toISOString()}`;

/**
 * Puts the job of one message on the queue, to run at its due time. A second call for the same
 * message and time is dropped by the queue (stately policy, one waiting job per key). Without a
 * running queue (the database was down at start-up) it does nothing: the sweep makes the job
 * once the message is due.
 */
export async function scheduleMessageJob(messageId: string, dueAt: Date): Promise<void> {
	const q = queue();
	if (!q) return;
	try {
		await q.send(MESSAGE_QUEUE, { messageId, dueAt: dueAt.toISOString() } satisfies MessageJob, {
			singletonKey: singletonKey(messageId, dueAt),
			startAfter: dueAt
		});
	} catch (e) {
		console.warn('[messages] could not schedule', messageId, (e as Error).message);
	}
}

/**
 * Brings a booking's planned messages (reminders, balance request) in line with the booking as it
 * is now; see the top of this file. Receipts are left alone. Call it after the transaction that
 * changed the booking has committed.
 */
export async function syncBookingMessages(bookingId: string, now = new Date()): Promise<void> {
	const scheduled = await db.transaction(async (tx) => {
		// The booking's row lock: two syncs of one booking run one after the other.
		const [row] = await tx
			.select({ b: booking, hours: studio.reminderHours })
			.from(booking)
			.innerJoin(studio, eq(studio.id, booking.studioId))
			.where(eq(booking.id, bookingId))
			.for('update', { of: booking });
		if (!row) return [];
		const { b } = row;
		const rows = await tx.select().from(scheduledMessage).where(eq(scheduledMessage.bookingId, b.id));
		const planned = rows.filter((r) => !r.sentAt && !r.cancelledAt).map((r) => ({ key: r.key, dueAt: r.dueAt }));
		const wanted = wantedMessages(
			{
				status: b.status,
				startsAt: b.startsAt,
				endsAt: b.endsAt,
				actualEndsAt: b.actualEndsAt,
				balanceOwed: b.status === 'completed' ? await balanceOwed(tx, b) : null
			},
			row.hours,
			now,
			planned
		);
		const plan = planMessages(
			wanted,
			rows.map((r) => ({ ...r, kind: r.kind as MessageKind }))
		);
		if (plan.cancel.length) {
			await tx
				.update(scheduledMessage)
				.set({ cancelledAt: now })
				.where(
					and(
						eq(scheduledMessage.bookingId, b.id),
						inArray(scheduledMessage.key, plan.cancel),
						isNull(scheduledMessage.sentAt),
						isNull(scheduledMessage.cancelledAt)
					)
				);
		}
		const written: ScheduledMessageRow[] = [];
		for (const w of plan.upsert) {
			const [r] = await tx
				.insert(scheduledMessage)
				.values({ studioId: b.studioId, bookingId: b.id, kind: w.kind, key: w.key, dueAt: w.dueAt })
				.onConflictDoUpdate({
					target: [scheduledMessage.bookingId, scheduledMessage.key],
					set: { dueAt: w.dueAt, cancelledAt: null },
					// A message sent is history: never moved or brought back.
					setWhere: isNull(scheduledMessage.sentAt)
				})
				.returning();
			if (r) written.push(r);
		}
		return written;
	});
	for (const r of scheduled) await scheduleMessageJob(r.id, r.dueAt);
}

/** Calls syncBookingMessages and logs a failure instead of throwing: the sweep plans it later. */
export async function syncBookingMessagesQuietly(bookingId: string): Promise<void> {
	try {
		await syncBookingMessages(bookingId);
	} catch (e) {
		console.warn('[messages] could not plan the messages of', bookingId, (e as Error).message);
	}
}

async function messageFacts(
	tx: Tx,
	bookingId: string
): Promise<(MessageFacts & { artistEmail: string; studioId: string }) | null> {
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
	const files = await summariesFor([b.id]);
	return {
		bookingId: b.id,
		reference: b.reference,
		startsAt: b.startsAt,
		endsAt: b.endsAt,
		roomName: row.roomName,
		engineerName: b.engineerId ? (engineer?.name ?? 'an engineer') : null,
		artistName: row.artistName,
		artistEmail: row.artistEmail,
		project: b.project,
		currency: b.currency,
		studio: s,
		studioId: s.id,
		uploads: files.map((u) => ({ name: u.name, typeLabel: u.typeLabel })),
		bookingUrl: `${publicOrigin()}/bookings/${b.id}`
	};
}

/**
 * How a message of another kind is written (receipts: the module that records a payment adds
 * its composer here). It gets the row and the transaction; null sends nothing and leaves the row.
 */
export type MessageComposer = (tx: Tx, message: ScheduledMessageRow) => Promise<(ComposedMessage & { to: string }) | null>;
const composers = new Map<MessageKind, MessageComposer>();
export function registerComposer(kind: MessageKind, composer: MessageComposer) {
	composers.set(kind, composer);
}

export type DeliveryOutcome = 'sent' | 'cancelled' | 'skipped';

/**
 * The job of one message: under the row's lock, sends it once if it is still unsent, still at the
 * due time the job was made for, due, and still wanted by the booking as it is now; a message no
 * longer wanted is marked cancelled. The e-mail goes into the outbox (dedupe key
 * `<kind>:<booking id>:<key>`) in the same transaction that sets sent_at.
 */
export async function deliverMessage(job: MessageJob, now = new Date()): Promise<DeliveryOutcome> {
	const outcome = await db.transaction(async (tx): Promise<DeliveryOutcome> => {
		const [m] = await tx.select().from(scheduledMessage).where(eq(scheduledMessage.id, job.messageId)).for('update');
		if (!m || m.sentAt || m.cancelledAt) return 'skipped';
		// Moved since this job was made: the job of its new time sends it.
		if (m.dueAt.toISOString() !== job.dueAt || m.dueAt.getTime() > now.getTime()) return 'skipped';
		const kind = m.kind as MessageKind;
		const [row] = await tx
			.select({ b: booking, hours: studio.reminderHours })
			.from(booking)
			.innerJoin(studio, eq(studio.id, booking.studioId))
			.where(eq(booking.id, m.bookingId))
			.for('update', { of: booking });
		if (!row) return 'skipped';
		const { b } = row;
		const owed = b.status === 'completed' ? await balanceOwed(tx, b) : null;
		const state = { status: b.status, startsAt: b.startsAt, endsAt: b.endsAt, actualEndsAt: b.actualEndsAt, balanceOwed: owed };
		if (PLANNED_KINDS.includes(kind) && !stillWanted({ kind, key: m.key, dueAt: m.dueAt }, state, row.hours, now)) {
			await tx.update(scheduledMessage).set({ cancelledAt: now }).where(eq(scheduledMessage.id, m.id));
			return 'cancelled';
		}
		let mail: (ComposedMessage & { to: string }) | null = null;
		if (kind === 'reminder' || kind === 'balance_request') {
			const facts = await messageFacts(tx, b.id);
			if (!facts) return 'skipped';
			const composed =
				kind === 'reminder' ? composeReminder(facts, Number(m.key.split(':')[1])) : composeBalanceRequest(facts, owed ?? 0);
			mail = { ...composed, to: facts.artistEmail };
		} else {
			const composer = composers.get(kind);
			if (!composer) return 'skipped';
			mail = await composer(tx, m);
		}
		if (!mail) return 'skipped';
		await enqueueMail(tx, {
			studioId: b.studioId,
			dedupeKey: `${kind}:${b.id}:${m.key}`,
			to: mail.to,
			subject: mail.subject,
			text: mail.text,
			html: mail.html
		});
		await tx.update(scheduledMessage).set({ sentAt: now }).where(eq(scheduledMessage.id, m.id));
		return 'sent';
	});
	if (outcome === 'sent') flushSoon();
	return outcome;
}

/** How far ahead the sweep puts jobs on the queue (they still wait for their due time). */
const LOOKAHEAD_MS = 60_000;
/** At most this many messages and bookings per sweep; the next sweep takes the rest. */
const SWEEP_LIMIT = 100;

/**
 * The safety sweep (jobs.ts, every 15 s): jobs for messages due within a minute (the partial index
 * on unsent due times), and a new plan for bookings whose wanted messages are missing: confirmed
 * sessions ahead (by the status index) with a reminder still ahead that has no live or sent row at
 * its due time, and completed ones of the last 30 days with a balance owed and no request.
 */
export async function sweepMessages(now = new Date()): Promise<void> {
	const due = await db
		.select({ id: scheduledMessage.id, dueAt: scheduledMessage.dueAt })
		.from(scheduledMessage)
		.where(
			and(
				isNull(scheduledMessage.sentAt),
				isNull(scheduledMessage.cancelledAt),
				lte(scheduledMessage.dueAt, new Date(now.getTime() + LOOKAHEAD_MS))
			)
		)
		.orderBy(asc(scheduledMessage.dueAt))
		.limit(SWEEP_LIMIT);
	for (const m of due) await scheduleMessageJob(m.id, m.dueAt);

	const nowTs = now.toISOString();
	const missing = await db.execute<{ id: string }>(sql`
		select b.id from booking b join studio s on s.id = b.studio_id
		where b.status = 'confirmed'
			and b.starts_at > ${nowTs}::timestamptz
			and b.starts_at <= ${nowTs}::timestamptz + make_interval(hours => ${MAX_REMINDER_HOURS})
			and exists (
				select 1 from unnest(s.reminder_hours) h
				where h between 1 and ${MAX_REMINDER_HOURS}
					and b.starts_at - make_interval(hours => h) > ${nowTs}::timestamptz
					and not exists (
						select 1 from scheduled_message m
						where m.booking_id = b.id and m.key = 'reminder:' || h
							and (m.sent_at is not null or (m.cancelled_at is null and m.due_at = b.starts_at - make_interval(hours => h)))
					)
			)
		union all
		select b.id from booking b
		where b.status = 'completed'
			and coalesce(b.actual_ends_at, b.ends_at) > ${nowTs}::timestamptz - interval '30 days'
			and ${mayOweSql(sql`b.id`)}
			and not exists (
				select 1 from scheduled_message m
				where m.booking_id = b.id and m.key = ${BALANCE_REQUEST_KEY} and (m.sent_at is not null or m.cancelled_at is null)
			)
		limit ${SWEEP_LIMIT}
	`);
	for (const { id } of missing) await syncBookingMessagesQuietly(id);
}

/** A booking's scheduled messages as the booking's JSON and page show them, by due time. */
export async function messagesOf(bookingId: string) {
	const rows = await db
		.select()
		.from(scheduledMessage)
		.where(eq(scheduledMessage.bookingId, bookingId))
		.orderBy(asc(scheduledMessage.dueAt), asc(scheduledMessage.key));
	return rows.map((r) => ({
		kind: r.kind as MessageKind,
		key: r.key,
		dueAt: r.dueAt,
		sentAt: r.sentAt,
		cancelledAt: r.cancelledAt
	}));
}

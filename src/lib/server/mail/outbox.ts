// The e-mail outbox: a message is written in the same transaction as the fact it reports (a
// confirmed booking, for one), keyed so that it exists once however often the fact is applied,
// and sent afterwards by the periodic job. SMTP being down delays mail; it never loses it and
// never rolls back the booking.
import { and, asc, eq, lt, sql } from 'drizzle-orm';
import { db } from '../db';
import { emailOutbox } from '../db/schema';
import type { Tx } from '../payments/core';
import { getStudio } from '../studio';
import { mailFrom, mailTransport } from './transport';

export interface OutgoingMail {
	/** The studio it is from (its name and address send it); none for the platform's own messages. */
	studioId?: string | null;
	/** Makes each message once, e.g. "booking-confirmed:<booking id>". */
	dedupeKey: string;
	to: string;
	subject: string;
	text: string;
	html?: string;
	attachments?: { filename: string; contentType: string; content: string }[];
}

/** Who sends the platform's own messages (invitations, account mail) when MAIL_FROM is not set. */
const PLATFORM_SENDER = { name: 'Slateroom', email: 'no-reply@slateroom.test' };

async function studioSender(studioId: string): Promise<string> {
	const studio = await getStudio(studioId);
	return mailFrom(studio.name, studio.email);
}

/** After this many failed tries a message is marked failed and left for a person to look at. */
export const MAX_ATTEMPTS = 8;
/** The wait before try n+1 grows as 15 s × 2^n (common practice: exponential back-off). */
const BACKOFF_BASE_SECONDS = 15;

/** Queues a message inside the caller's transaction; a second call with the same key does nothing. */
export async function enqueueMail(tx: Tx, mail: OutgoingMail): Promise<void> {
	await tx
		.insert(emailOutbox)
		.values({
			studioId: mail.studioId ?? null,
			dedupeKey: mail.dedupeKey,
			to: mail.to,
			subject: mail.subject,
			text: mail.text,
			html: mail.html ?? null,
			attachments: mail.attachments ?? null
		})
		.onConflictDoNothing({ target: emailOutbox.dedupeKey });
}

/**
 * Sends what is due, one message at a time, each under its own row lock (SKIP LOCKED), so two
 * servers or two ticks never send a message twice. Returns how many were sent.
 */
export async function flushOutbox(limit = 20): Promise<number> {
	let sent = 0;
	// A studio's sender is read once a message of it is due, not on every tick of an empty outbox.
	const senders = new Map<string, string>();
	for (let i = 0; i < limit; i++) {
		const outcome = await db.transaction(async (tx) => {
			const [row] = await tx
				.select()
				.from(emailOutbox)
				.where(
					and(
						eq(emailOutbox.status, 'queued'),
						lt(emailOutbox.attempts, MAX_ATTEMPTS),
						sql`${emailOutbox.createdAt} + make_interval(secs => ${BACKOFF_BASE_SECONDS} * (power(2, ${emailOutbox.attempts}) - 1)) <= now()`
					)
				)
				.orderBy(asc(emailOutbox.createdAt))
				.limit(1)
				.for('update', { skipLocked: true });
			if (!row) return 'none' as const;
			const key = row.studioId ?? '';
			let from = senders.get(key);
			if (from === undefined) {
				from = row.studioId ? await studioSender(row.studioId) : mailFrom(PLATFORM_SENDER.name, PLATFORM_SENDER.email);
				senders.set(key, from);
			}
			const attachments = row.attachments ?? [];
			try {
				await mailTransport().sendMail({
					from,
					to: row.to,
					subject: row.subject,
					text: row.text,
					html: row.html ?? undefined,
					attachments: attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, content: a.content }))
				});
				await tx
					.update(emailOutbox)
					.set({ status: 'sent', sentAt: new Date(), attempts: row.attempts + 1, lastError: null })
					.where(eq(emailOutbox.id, row.id));
				return 'sent' as const;
			} catch (e) {
				const attempts = row.attempts + 1;
				await tx
					.update(emailOutbox)
					.set({
						attempts,
						lastError: String((e as Error).message ?? e).slice(0, 500),
						status: attempts >= MAX_ATTEMPTS ? 'failed' : 'queued'
					})
					.where(eq(emailOutbox.id, row.id));
				console.warn('[mail] could not send', row.dedupeKey, (e as Error).message);
				return 'failed' as const;
			}
		});
		if (outcome === 'none') break;
		if (outcome === 'sent') sent++;
		// A failure stops this round: the server is probably down, and the back-off decides when to try again.
		if (outcome === 'failed') break;
	}
	return sent;
}

let flushTimer: ReturnType<typeof setTimeout> | null = null;

/** Asks for a send soon (after the current transaction has had time to commit). */
export function flushSoon(delayMs = 750) {
	if (flushTimer) return;
	flushTimer = setTimeout(() => {
		flushTimer = null;
		flushOutbox().catch((e) => console.warn('[mail]', (e as Error).message));
	}, delayMs);
	flushTimer.unref();
}

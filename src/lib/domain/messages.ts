/**
 * The e-mails a booking wants on a schedule: a reminder before the session at each of the
 * studio's offsets, and a balance request once the session is over with money still owed. Pure
 * rules; the server (src/lib/server/messages/) keeps a row per message and sends each once.
 *
 * Due times are instants, not wall-clock times: "48 hours before" is 48 real hours before the
 * start, so across a daylight-saving change in the studio's zone the reminder reads one hour
 * earlier or later on the wall clock than the session does (a reminder 48 hours before a 10:00
 * Monday session after clocks go forward falls at 09:00 on Saturday). That is what an offset in
 * hours means; a "same time two days before" rule would be a different rule.
 *
 * A reminder whose time has already passed when the booking is planned (a session booked 24 hours
 * ahead gets no 7-day reminder) is not made: it would arrive late and all at once. One already
 * planned for that same instant is kept when its time comes, so a re-check at the moment it is
 * being sent does not take it back.
 */
import type { BookingStatus } from './lifecycle';

export const MESSAGE_KINDS = ['reminder', 'balance_request', 'receipt'] as const;
export type MessageKind = (typeof MESSAGE_KINDS)[number];

/** The kinds these rules plan; receipts are written where a payment is recorded. */
export const PLANNED_KINDS: readonly MessageKind[] = ['reminder', 'balance_request'];

/** The offsets an owner may choose from on the settings page, in hours before the session. */
export const REMINDER_CHOICES: readonly { hours: number; label: string }[] = [
	{ hours: 168, label: '7 days before' },
	{ hours: 48, label: '48 hours before' },
	{ hours: 24, label: '24 hours before' },
	{ hours: 2, label: '2 hours before' }
];

/** A scheduled message as people read it: 'Reminder, 7 days before', 'Balance request', 'Receipt'. */
export function messageLabel(kind: MessageKind, key: string): string {
	if (kind === 'reminder') {
		const hours = Number(key.split(':')[1]);
		const choice = REMINDER_CHOICES.find((c) => c.hours === hours);
		return `Reminder, ${choice ? choice.label : `${hours} hours before`}`;
	}
	return kind === 'balance_request' ? 'Balance request' : 'Receipt';
}

/** The longest offset the rules accept (30 days); a longer one is a mistake in the settings. */
export const MAX_REMINDER_HOURS = 720;

export const HOUR_MS = 3_600_000;

export interface MessageBooking {
	status: BookingStatus;
	startsAt: Date;
	endsAt: Date;
	/** The recorded end once the session is closed. */
	actualEndsAt: Date | null;
	/** What is still to pay after the final invoice, in minor units; null before that invoice. */
	balanceOwed: number | null;
}

export interface WantedMessage {
	kind: MessageKind;
	/** Tells apart messages of one booking: 'reminder:168', 'balance_request'. */
	key: string;
	dueAt: Date;
}

/** An unsent message already planned for the booking: its key and due time. */
export interface PlannedMessage {
	key: string;
	dueAt: Date;
}

export const reminderKey = (hours: number) => `reminder:${hours}`;
export const BALANCE_REQUEST_KEY = 'balance_request';

/** The studio's offsets as a clean list: whole hours from 1 to MAX_REMINDER_HOURS, once each, longest first. */
export function normaliseReminderHours(hours: readonly number[]): number[] {
	const ok = hours.filter((h) => Number.isInteger(h) && h >= 1 && h <= MAX_REMINDER_HOURS);
	return [...new Set(ok)].sort((a, b) => b - a);
}

/** When a reminder so many hours before the start is due: that many real hours before (see above). */
export function reminderDue(startsAt: Date, hours: number): Date {
	return new Date(startsAt.getTime() - hours * HOUR_MS);
}

/** When the balance request is due: at the session's recorded end, else its booked end. */
export function balanceRequestDue(b: Pick<MessageBooking, 'endsAt' | 'actualEndsAt'>): Date {
	return b.actualEndsAt ?? b.endsAt;
}

/**
 * The planned messages the booking wants now (reminders and the balance request; receipts are not
 * planned here). A confirmed session wants its reminders still ahead (or already planned for the
 * same instant and due now); a completed one with a balance owed wants the balance request;
 * anything else (held, pending, cancelled, expired, no_show, or paid in full) wants none.
 */
export function wantedMessages(
	b: MessageBooking,
	reminderHours: readonly number[],
	now: Date,
	planned: readonly PlannedMessage[] = []
): WantedMessage[] {
	const out: WantedMessage[] = [];
	if (b.status === 'confirmed' && b.startsAt.getTime() > now.getTime()) {
		for (const hours of normaliseReminderHours(reminderHours)) {
			const key = reminderKey(hours);
			const dueAt = reminderDue(b.startsAt, hours);
			const ahead = dueAt.getTime() > now.getTime();
			const alreadyPlanned = planned.some((p) => p.key === key && p.dueAt.getTime() === dueAt.getTime());
			if (ahead || alreadyPlanned) out.push({ kind: 'reminder', key, dueAt });
		}
	}
	if (b.status === 'completed' && b.balanceOwed !== null && b.balanceOwed > 0) {
		out.push({ kind: 'balance_request', key: BALANCE_REQUEST_KEY, dueAt: balanceRequestDue(b) });
	}
	return out.sort((x, y) => x.dueAt.getTime() - y.dueAt.getTime() || x.key.localeCompare(y.key));
}

/**
 * Whether one planned message is still to be sent at `now` (checked again at send time): it is
 * among the wanted ones at the same due time.
 */
export function stillWanted(
	message: { kind: MessageKind; key: string; dueAt: Date },
	b: MessageBooking,
	reminderHours: readonly number[],
	now: Date
): boolean {
	if (!PLANNED_KINDS.includes(message.kind)) return true;
	return wantedMessages(b, reminderHours, now, [message]).some(
		(w) => w.key === message.key && w.dueAt.getTime() === message.dueAt.getTime()
	);
}

/** What the sync does to the rows of one booking: add or move these, cancel those. */
export interface MessagePlan {
	upsert: WantedMessage[];
	cancel: string[];
}

/**
 * Compares the wanted messages with the unsent, uncancelled planned rows (of the planned kinds):
 * rows to write (new, or at a new due time) and keys to cancel. Sent and cancelled rows are
 * history and are never touched; a wanted message whose key was already sent is not made again.
 */
export function planMessages(
	wanted: readonly WantedMessage[],
	rows: readonly { kind: MessageKind; key: string; dueAt: Date; sentAt: Date | null; cancelledAt: Date | null }[]
): MessagePlan {
	const sentKeys = new Set(rows.filter((r) => r.sentAt).map((r) => r.key));
	const open = rows.filter((r) => !r.sentAt && !r.cancelledAt && PLANNED_KINDS.includes(r.kind));
	const upsert = wanted.filter((w) => {
		if (sentKeys.has(w.key)) return false;
		const row = open.find((r) => r.key === w.key);
		return !row || row.dueAt.getTime() !== w.dueAt.getTime();
	});
	const wantedKeys = new Set(wanted.filter((w) => !sentKeys.has(w.key)).map((w) => w.key));
	const cancel = open.filter((r) => !wantedKeys.has(r.key)).map((r) => r.key);
	return { upsert, cancel };
}

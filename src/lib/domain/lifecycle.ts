/**
 * A booking's life: held → pending → confirmed → completed, or cancelled or expired on the way,
 * or no_show when the session's time came and nobody did.
 * The statuses, the moves allowed between them and when a hold has lapsed, in one place: the
 * database schema, the server and the browser all read them from here. Pure rules, no framework
 * or database.
 *
 * Recording the end of a session ("closing" it) completes the booking and issues its final
 * invoice, whose date of supply is the session's (Directive 2006/112/EC, Article 226(7)). A
 * session that has not begun has supplied nothing, so it cannot be closed before its start.
 */

/** Every status a booking can have (the database's check constraint lists the same words). */
export const BOOKING_STATUSES = ['held', 'pending', 'confirmed', 'completed', 'no_show', 'cancelled', 'expired'] as const;
export type BookingStatus = (typeof BOOKING_STATUSES)[number];

export function isBookingStatus(s: unknown): s is BookingStatus {
	return typeof s === 'string' && (BOOKING_STATUSES as readonly string[]).includes(s);
}

/**
 * The moves a booking may make. A hold becomes pending when a delayed payment is on its way,
 * confirmed when the deposit is paid, expired when its time or its payment runs out, cancelled
 * when the artist or the owner says so. An expired hold comes back (pending or confirmed) only
 * when a deposit still arrives and the slot is still free. A confirmed session ends completed or,
 * when nobody came, no_show. Completed, no_show, cancelled: nothing follows. The database refuses
 * any other move (the trigger of drizzle/0011_session_lifecycle.sql lists the same pairs).
 */
export const BOOKING_MOVES: Readonly<Record<BookingStatus, readonly BookingStatus[]>> = {
	held: ['pending', 'confirmed', 'cancelled', 'expired'],
	pending: ['confirmed', 'cancelled', 'expired'],
	confirmed: ['completed', 'no_show', 'cancelled'],
	expired: ['pending', 'confirmed'],
	completed: [],
	no_show: [],
	cancelled: []
};

export function canMove(from: BookingStatus, to: BookingStatus): boolean {
	return BOOKING_MOVES[from].includes(to);
}

/** The statuses a booking may have reached `to` from. */
export function statusesBefore(to: BookingStatus): BookingStatus[] {
	return BOOKING_STATUSES.filter((from) => canMove(from, to));
}

/**
 * Statuses that occupy the room, the engineer and the gear (the exclusion constraints of
 * drizzle/0011_session_lifecycle.sql count the same ones). A held booking whose hold has lapsed
 * occupies nothing, though it may not be marked expired yet. A no-show keeps its time: it is not
 * sold again after the fact.
 */
export const OCCUPYING_STATUSES: readonly BookingStatus[] = ['held', 'pending', 'confirmed', 'completed', 'no_show'];

/** Waiting for its deposit: held, or pending while a delayed payment is on its way. */
export const AWAITING_DEPOSIT_STATUSES: readonly BookingStatus[] = ['held', 'pending'];

/** Still ahead of its session and still wanted: these can be cancelled and take files. */
export const OPEN_STATUSES: readonly BookingStatus[] = ['held', 'pending', 'confirmed'];

/** Over without a session: the slot went back to the calendar. */
export const ENDED_STATUSES: readonly BookingStatus[] = ['cancelled', 'expired'];

export function isCancellable(status: string): boolean {
	return (OPEN_STATUSES as readonly string[]).includes(status);
}

export function hasEnded(status: string): boolean {
	return (ENDED_STATUSES as readonly string[]).includes(status);
}

export function awaitsDeposit(status: string): boolean {
	return (AWAITING_DEPOSIT_STATUSES as readonly string[]).includes(status);
}

type Instant = Date | string | number;
const ms = (t: Instant) => (t instanceof Date ? t.getTime() : typeof t === 'number' ? t : Date.parse(t));

export interface Holdable {
	status: string;
	holdExpiresAt: Instant | null;
}

/**
 * Whether a hold has run out: a held booking whose expiry is now or past. From that moment it no
 * longer keeps anyone out, takes no deposit and no files, whether or not the periodic sweep has
 * marked it expired yet. A held booking with no expiry has not lapsed.
 */
export function holdLapsed(b: Holdable, now: Instant): boolean {
	return b.status === 'held' && b.holdExpiresAt !== null && ms(b.holdExpiresAt) <= ms(now);
}

/** A held booking whose hold still runs. */
export function holdLive(b: Holdable, now: Instant): boolean {
	return b.status === 'held' && !holdLapsed(b, now);
}

/** Held and lapsed, or already marked expired: the same time may be offered again. */
export function holdGone(b: Holdable, now: Instant): boolean {
	return b.status === 'expired' || holdLapsed(b, now);
}

/** When a hold made now ends: the studio's hold time from now. */
export function holdExpiry(now: Date, holdMinutes: number): Date {
	return new Date(now.getTime() + holdMinutes * 60_000);
}

export type CloseRefusal = { code: 'not_confirmed'; message: string } | { code: 'not_started'; message: string; opensAt: Date };

export interface Closable {
	status: string;
	startsAt: Date;
}

/** Whether the end of this session may be recorded now; null when it may. */
export function closeRefusal(b: Closable, now: Date): CloseRefusal | null {
	if (b.status !== 'confirmed') {
		return { code: 'not_confirmed', message: 'Only a confirmed booking (deposit paid) can be closed.' };
	}
	if (now.getTime() < b.startsAt.getTime()) {
		return {
			code: 'not_started',
			message: 'The session has not started yet: its end can be recorded once it has begun.',
			opensAt: b.startsAt
		};
	}
	return null;
}

export type NoShowRefusal = { code: 'not_confirmed'; message: string } | { code: 'not_started'; message: string; opensAt: Date };

/**
 * Whether "nobody came" may be recorded now; null when it may. Like the end of a session, only on
 * a confirmed booking and only once its start has passed (the database's trigger refuses a
 * no-show before the start too): before that, the artist may still turn up.
 */
export function noShowRefusal(b: Closable, now: Date): NoShowRefusal | null {
	if (b.status !== 'confirmed') {
		return { code: 'not_confirmed', message: 'Only a confirmed booking (deposit paid) can be marked as “nobody came”.' };
	}
	if (now.getTime() < b.startsAt.getTime()) {
		return {
			code: 'not_started',
			message: 'The session has not started yet: that nobody came can be recorded once its start has passed.',
			opensAt: b.startsAt
		};
	}
	return null;
}

/**
 * When a no-show is recorded, the deposit is treated as a cancellation with no notice at all: the
 * cancellation ladder is read at the session's start (0 hours' notice), so its last rung (the one
 * for the least notice) decides what, if anything, goes back. The moment it was recorded does not
 * count: recording it late does not take away what the ladder gives.
 */
export function noShowPolicyMoment(b: Pick<Closable, 'startsAt'>): Date {
	return b.startsAt;
}

// Recording that nobody came: the owner or an engineer of the booking's studio (the same people who
// record the end of a session) ends a confirmed session whose start has passed as a no-show.
//
// The deposit is dealt with as a cancellation with no notice at all: the studio's cancellation
// ladder read at the session's start (lifecycle.noShowPolicyMoment), so its last rung decides what,
// if anything, goes back; a refund it gives goes through the same refund path as a cancellation
// (a credit note follows once the money is back). No final invoice is issued: the deposit invoice
// stays the booking's only document. Any open Checkout page of the booking is expired. The slot
// keeps its time (the exclusion constraints count no_show), so it is never sold again after the
// fact. The artist gets a note of it through the outbox, queued in the same transaction.
//
// Everything is decided on the locked booking row, so a double click records one no-show, one
// refund and one e-mail; the second answers with what the first did.
import { eq } from 'drizzle-orm';
import { db } from '../db';
import { booking } from '../db/schema';
import { getPolicy } from '../studio';
import type { SessionUser } from '../auth';
import { roleAt } from '../bookings/read';
import { inTransaction, loadMoneyState, lockBooking, setBookingStatus, type BookingRow, type RefundRow } from './core';
import { auditTx, queueRefund } from './state';
import { expireSession } from './checkout';
import { queueNoShow } from '../mail';
import { syncBookingMessagesQuietly } from '../messages';
import { refundForCancellation } from '$lib/domain/pricing';
import { noShowPolicyMoment, noShowRefusal } from '$lib/domain/lifecycle';

export type NoShowOutcome =
	| {
			ok: true;
			already: boolean;
			booking: BookingRow;
			/** What goes back by the ladder's last rung, the rung in words, and what the studio keeps. */
			refund: number;
			rule: string;
			retained: number;
			refunds: RefundRow[];
	  }
	| { ok: false; status: 403 | 404 | 409; code: string; message: string };

const notFound = { ok: false, status: 404, code: 'not_found', message: 'No such booking.' } as const;

/**
 * Who may record a no-show: the owner or an engineer of the booking's own studio, as for the end of
 * a session; its artist is refused (403), anyone else gets a 404 (another artist's booking, or
 * another studio's, is not theirs to know of).
 */
async function noShowAccess(
	actor: SessionUser,
	head: { studioId: string; artistId: string }
): Promise<'ok' | 'not_found' | 'forbidden'> {
	const role = await roleAt(actor.id, head.studioId);
	if (role === 'owner' || role === 'engineer') return 'ok';
	return role === 'artist' && head.artistId !== actor.id ? 'not_found' : 'forbidden';
}

/** Whether this person may record a no-show on this booking at all (the booking page asks, to offer the button). */
export async function mayRecordNoShow(actor: SessionUser, b: Pick<BookingRow, 'studioId' | 'artistId'>): Promise<boolean> {
	return (await noShowAccess(actor, b)) === 'ok';
}

export async function recordNoShow(actor: SessionUser, bookingId: string, now = new Date()): Promise<NoShowOutcome> {
	const [head] = await db
		.select({ studioId: booking.studioId, artistId: booking.artistId })
		.from(booking)
		.where(eq(booking.id, bookingId));
	if (!head) return notFound;
	const access = await noShowAccess(actor, head);
	if (access === 'not_found') return notFound;
	if (access === 'forbidden') {
		return {
			ok: false,
			status: 403,
			code: 'forbidden',
			message: 'Only the owner or an engineer records that nobody came.'
		};
	}
	const { policy } = await getPolicy(head.studioId);

	return inTransaction<NoShowOutcome>(async (tx, after) => {
		const b = await lockBooking(tx, bookingId);
		if (!b) return notFound;
		const state = await loadMoneyState(tx, b.id);
		// The ladder at zero notice, whenever it is recorded.
		const at = noShowPolicyMoment(b);
		if (b.status === 'no_show') {
			// A second click: the first one decided everything.
			const refunds = state.refunds.filter((r) => r.reason === 'cancellation');
			const refund = refunds.filter((r) => r.status !== 'failed').reduce((s, r) => s + r.amount, 0);
			const rule = refundForCancellation({
				paid: state.held,
				deposit: b.deposit,
				bookingStart: b.startsAt,
				cancelledAt: at,
				policy
			});
			return { ok: true, already: true, booking: b, refund, rule: rule.rungLabel, retained: state.held, refunds };
		}
		const refusal = noShowRefusal(b, now);
		if (refusal) return { ok: false, status: 409, code: refusal.code, message: refusal.message };

		const r = refundForCancellation({ paid: state.held, deposit: b.deposit, bookingStart: b.startsAt, cancelledAt: at, policy });
		await setBookingStatus(tx, b, 'no_show', { noShowAt: now, noShowBy: actor.id });
		const refunds: RefundRow[] = [];
		let left = r.refund;
		for (const p of state.payments.filter((p) => p.status === 'paid')) {
			if (left <= 0) break;
			const part = Math.min(left, state.refundable.get(p.id) ?? 0);
			if (part <= 0) continue;
			refunds.push(
				await queueRefund(tx, after, { booking: b, payment: p, amount: part, reason: 'cancellation', requestedBy: actor.id })
			);
			left -= part;
		}
		// Nothing more is paid for a session that did not take place.
		for (const p of state.payments) {
			if (p.status === 'open' && p.checkoutSessionId) {
				const id = p.checkoutSessionId;
				after.push(() => expireSession(id, p.stripeAccountId));
			}
		}
		await queueNoShow(tx, { bookingId: b.id, refund: r.refund, retained: r.retained, rule: r.rungLabel });
		// No reminder or balance request is wanted any more (those not sent are cancelled).
		after.push(() => syncBookingMessagesQuietly(b.id));
		await auditTx(tx, 'booking.no_show', b.id, { refund: r.refund, retained: r.retained, rule: r.rungLabel }, actor.id);
		const [updated] = await tx.select().from(booking).where(eq(booking.id, b.id));
		return {
			ok: true,
			already: false,
			booking: updated!,
			refund: r.refund,
			rule: r.rungLabel,
			retained: r.retained,
			refunds
		};
	});
}

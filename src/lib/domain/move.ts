/**
 * Moving a booked session to another time, room, engineer or gear: who may, what it costs, and
 * how the money is settled. Pure rules; the server applies them (src/lib/server/bookings/move.ts).
 *
 * SETTLEMENT (our rule). The deposit is what the artist has paid ahead. A move settles the
 * deposit against the new price:
 *
 *   settlement = newDeposit − depositPaid + fee
 *
 * - newDeposit is the studio's deposit rule (pricing/deposit.ts) applied to the new total, as at
 *   booking; depositPaid is what the studio holds for the booking now (paid − refunded); fee is
 *   the moving policy's fee for this move (0 when free or moved by the owner).
 * - settlement > 0: the artist pays it through Checkout before the move takes effect; until then
 *   the old slot stays the booking's.
 * - settlement < 0: the excess deposit goes back by the studio's cancellation ladder applied to
 *   the difference, at the notice of the move (from now to the CURRENT start; pricing/
 *   cancellation.ts). The part the ladder keeps stays paid toward the booking. A move the owner
 *   makes refunds the whole difference: the ladder protects the studio from an artist's late
 *   change, and a studio's own move is not one (our rule).
 * - settlement = 0: nothing changes hands.
 * Whatever happened, the balance due after the session is newTotal − everything paid (the final
 * invoice deducts every payment on account), so a fee paid here counts toward that balance too.
 *
 * Worked examples (EUR, deposit 30 % rounded up to whole euros, minimum 50.00):
 *   1. 320.00 → 320.00, 96.00 paid, free move: newDeposit 96.00, settlement 0.
 *   2. 320.00 → 400.00, 96.00 paid, fee 25.00: newDeposit 120.00, settlement +49.00 to pay.
 *   3. 400.00 → 200.00, 120.00 paid, free, 10 days' notice (ladder: ≥ 7 days whole deposit):
 *      newDeposit 60.00, settlement −60.00, 60.00 refunded, nothing kept.
 *   4. as 3 but 3 days' notice (48 h–7 days: half): 30.00 refunded, 30.00 kept toward the balance.
 *
 * THE MOVING POLICY (the studio's settings move_free_hours, move_min_hours, move_fee). An artist
 * moves their own booking free with at least freeHours' notice, for the fee with at least
 * minHours' notice, not at all closer; notice runs from now to the booking's CURRENT start (a
 * session about to happen cannot be shifted away late for free by naming a far-off new time).
 * The owner moves any booking without fee or notice limit (the new time must still be bookable).
 * Charging a fee for late changes and refusing the last days is common practice in studios.
 *
 * WHAT CAN BE MOVED. Only a confirmed booking whose session has not started. Not a hold (held):
 * nothing is paid, and its Checkout is for a fixed deposit; the artist lets it lapse and books
 * the time they want. Not a pending one: its deposit is on its way by a delayed method, so what
 * has been paid is not known yet and no settlement can be worked out; it can be moved once
 * confirmed. Nothing that ended, was cancelled, expired or has begun.
 *
 * THE NEW PRICE. The stored quote keeps the lines the booking bought, not the whole rate card
 * (which units a studio sells and at what price may have changed since). The closest honest rule:
 * every unit the booking bought keeps the price it was bought at (the room's full day, half day
 * or hourly rate from its lines, the engineer's likewise, each piece of gear's hire fee), the
 * units it did not buy, and a room or gear new to it, come from today's rate card, and the
 * surcharges are those of the new time, worked out by the pricing engine as for a new booking.
 * The VAT rate and treatment are the booking's own (its quote's).
 */
import { depositFor, refundForCancellation } from './pricing';
import type { PriceLine, Quote } from './pricing';
import type { BlockRates, CancellationRung, GearHire, Minor, StudioPolicy } from './types';
import type { VatTreatment } from './vat-treatment';

export interface MovePolicy {
	freeHours: number;
	minHours: number;
	/** Minor units. */
	fee: Minor;
}

export type Mover = 'owner' | 'artist';

export type MoveRefusal = 'not_movable' | 'started' | 'too_late' | 'not_yours';

export type MoveTerms =
	| { allowed: true; fee: Minor; noticeHours: number; rule: string }
	| { allowed: false; refusal: MoveRefusal; message: string; noticeHours: number; rule: string };

const HOUR = 3_600_000;

function hoursWords(h: number): string {
	if (h >= 72 && h % 24 === 0) return `${h / 24} days`;
	return `${h} ${h === 1 ? 'hour' : 'hours'}`;
}

/** The policy in words, as the artist reads it before moving. */
export function movePolicyWords(p: MovePolicy, money: (m: Minor) => string): string {
	const free = `Free with ${hoursWords(p.freeHours)}' notice or more`;
	if (p.freeHours === p.minHours) return `${free}; not possible with less notice.`;
	const paid =
		p.fee > 0
			? `${money(p.fee)} with ${hoursWords(p.minHours)}' notice or more`
			: `also free down to ${hoursWords(p.minHours)}' notice`;
	const never = p.minHours > 0 ? `; not possible under ${hoursWords(p.minHours)}` : '';
	return `${free}; ${paid}${never}.`;
}

/**
 * Whether `mover` may move a booking with this status and current start now, and for what fee.
 * `own`: the artist's own booking (an artist moves nothing else).
 */
export function moveTerms(input: {
	mover: Mover;
	own: boolean;
	status: string;
	startsAt: Date;
	now: Date;
	policy: MovePolicy;
}): MoveTerms {
	const { mover, own, status, startsAt, now, policy } = input;
	const noticeMs = startsAt.getTime() - now.getTime();
	const noticeHours = Math.floor(noticeMs / 36_000) / 100;
	const rule = mover === 'owner' ? 'The studio moves any session, without a fee.' : '';
	const refuse = (refusal: MoveRefusal, message: string): MoveTerms => ({
		allowed: false,
		refusal,
		message,
		noticeHours,
		rule
	});
	if (mover === 'artist' && !own) return refuse('not_yours', 'Only your own sessions can be moved.');
	if (status !== 'confirmed') {
		return refuse(
			'not_movable',
			status === 'held' || status === 'pending'
				? 'A session can be moved once its deposit has arrived.'
				: 'Only a booked session that has not taken place can be moved.'
		);
	}
	if (noticeMs <= 0) return refuse('started', 'This session has started; it can no longer be moved.');
	if (mover === 'owner') return { allowed: true, fee: 0, noticeHours, rule };
	if (noticeMs >= policy.freeHours * HOUR) {
		return { allowed: true, fee: 0, noticeHours, rule: `Free with ${hoursWords(policy.freeHours)}' notice or more.` };
	}
	if (noticeMs >= policy.minHours * HOUR) {
		return {
			allowed: true,
			fee: policy.fee,
			noticeHours,
			rule: `Between ${hoursWords(policy.minHours)} and ${hoursWords(policy.freeHours)}' notice a move carries the studio's moving fee.`
		};
	}
	return {
		allowed: false,
		refusal: 'too_late',
		message: `Sessions can be moved up to ${hoursWords(policy.minHours)} before they start; please contact the studio.`,
		noticeHours,
		rule: `Not possible under ${hoursWords(policy.minHours)}' notice.`
	};
}

const unitOf = (lines: readonly PriceLine[], key: string): Minor | undefined => lines.find((l) => l.key === key)?.unitAmount;

/**
 * A resource's block rates for a move: the unit prices the booking bought (its stored quote's
 * `room:*` or `engineer:*` lines), and today's for the units it did not buy.
 */
export function bookedRates(stored: Pick<Quote, 'lines'>, resource: 'room' | 'engineer', today: BlockRates): BlockRates {
	return {
		fullDay: unitOf(stored.lines, `${resource}:full-day`) ?? today.fullDay,
		halfDay: unitOf(stored.lines, `${resource}:half-day`) ?? today.halfDay,
		hourly: unitOf(stored.lines, `${resource}:hourly`) ?? today.hourly
	};
}

/** Gear hire at the fee each piece was booked at; pieces new to the booking at today's fee. */
export function bookedGear(stored: Pick<Quote, 'lines'>, today: readonly GearHire[]): GearHire[] {
	return today.map((g) => ({ ...g, fee: unitOf(stored.lines, `gear:${g.id}`) ?? g.fee }));
}

/**
 * The policy a move is priced with: today's (blocks, surcharges, deposit rule), with the VAT rate
 * the booking was quoted at (its lines carry it; under reverse charge they carry 0, and today's
 * rate stands, the treatment itself keeping VAT off).
 */
export function bookedPolicy(stored: Pick<Quote, 'lines' | 'vatTreatment'>, today: StudioPolicy): StudioPolicy {
	const treatment: VatTreatment = stored.vatTreatment ?? 'standard';
	const rate = stored.lines[0]?.vatRateBp;
	return treatment === 'standard' && rate !== undefined ? { ...today, vatRateBp: rate } : today;
}

export interface SettlementInput {
	newTotal: Minor;
	depositPolicy: Pick<StudioPolicy, 'currency' | 'depositBp' | 'depositMinimum'>;
	/** What the studio holds for the booking now: paid − refunded. */
	depositPaid: Minor;
	fee: Minor;
	mover: Mover;
	/** The booking's current start and the moment of the move: the notice the ladder reads. */
	startsAt: Date;
	now: Date;
	cancellation: readonly CancellationRung[];
}

export interface Settlement {
	newDeposit: Minor;
	/** newDeposit − depositPaid + fee: > 0 to pay, < 0 excess deposit. */
	settlement: Minor;
	/** What the artist pays now (settlement when > 0, else 0). */
	toPay: Minor;
	/** What goes back now (part of −settlement, by the ladder for an artist's move). */
	refund: Minor;
	/** What of the excess stays paid toward the booking. */
	kept: Minor;
	/** The ladder's rung in words, when a refund was worked out. */
	rule: string | null;
}

export function settleMove(input: SettlementInput): Settlement {
	const newDeposit = depositFor(input.newTotal, input.depositPolicy);
	const settlement = newDeposit - input.depositPaid + input.fee;
	if (settlement >= 0) return { newDeposit, settlement, toPay: settlement, refund: 0, kept: 0, rule: null };
	const excess = -settlement;
	if (input.mover === 'owner') {
		return {
			newDeposit,
			settlement,
			toPay: 0,
			refund: excess,
			kept: 0,
			rule: 'Moved by the studio: the difference is refunded in full.'
		};
	}
	const r = refundForCancellation({
		paid: excess,
		deposit: excess,
		bookingStart: input.startsAt,
		cancelledAt: input.now,
		policy: { cancellation: [...input.cancellation] }
	});
	return { newDeposit, settlement, toPay: 0, refund: r.refund, kept: excess - r.refund, rule: r.rungLabel };
}

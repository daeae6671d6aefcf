// Moving a booked session: its time, room, engineer or gear. The rules (who may, the fee, the new
// price at the booked rates, the settlement of the deposit) are $lib/domain/move.ts; this module
// reads the booking as the acting person may, prices the move, and applies it in one transaction
// under the booking's row lock:
//
// - the booking row is updated in one statement (times, room, engineer), so at no moment are both
//   the old and the new slot free or both taken; the exclusion constraints (room and engineer on
//   booking, gear on booking_gear, whose times the trigger booking_sync_gear copies from the
//   booking) are the final word, with the writers queued on advisory locks as a new hold queues
//   them (hold.ts);
// - a move that costs the same or less is applied at once, its excess deposit refunded through the
//   refund path (payments/state.ts queueRefund, reason 'move'; the credit note follows the refund);
// - a dearer one waits for its payment (booking_move 'awaiting_payment', payment kind 'move'):
//   the webhook applies it if the new slot is still free (moveArrived), else refunds in full.
// Documents already issued are never edited: the extra deposit has its own prepayment invoice, a
// refund its credit note.
import { and, eq, gt, inArray, lt, ne, sql } from 'drizzle-orm';
import { z } from 'zod';
import { db } from '../db';
import { booking, bookingGear, bookingMove, member, payment, room } from '../db/schema';
import type { SessionUser } from '../auth';
import { roomRates, type RoomRow } from '../studio';
import {
	bookedGear,
	bookedPolicy,
	bookedRates,
	moveTerms,
	settleMove,
	type MovePolicy,
	type MoveTerms,
	type Mover,
	type Settlement
} from '$lib/domain/move';
import { quoteBooking, type Quote } from '$lib/domain/pricing';
import { treatmentOf } from '$lib/domain/vat-treatment';
import { lineText } from '$lib/schemas/input';
import {
	inTransaction,
	loadMoneyState,
	lockBooking,
	pgCode,
	type AfterCommit,
	type BookingRow,
	type PaymentRow,
	type Tx
} from '../payments/core';
import { auditTx, queueRefund } from '../payments/state';
import { expireSession, startCheckout } from '../payments/checkout';
import { issueDepositInvoice } from '../invoices/documents';
import { queueMoveFailed, queueMoveNotice } from '../mail';
import { syncBookingMessagesQuietly } from '../messages';
import { nearestStarts } from './availability';
import { pricingContext, type PricingContext } from './context';
import { occupying } from './occupancy';
import { priceRequest, publicQuote } from './quote';
import { getRow } from './read';
import { invalidRequest, isoInZone, minutesBetween, zodFieldErrors, type FieldErrors } from './request';
import { resourceCalendar, type Taken } from './resources';

type MoveRow = typeof bookingMove.$inferSelect;

/** The move as asked: start and end as for a new booking; what is left out stays the booking's. */
export const moveRequestSchema = z.object({
	start: lineText({ error: 'Choose a start time.' }).trim().min(1, { error: 'Choose a start time.' }).max(40),
	end: lineText({ error: 'Choose an end time.' }).trim().min(1, { error: 'Choose an end time.' }).max(40),
	room: lineText().trim().min(1, { error: 'Choose a room.' }).max(80).optional(),
	/** true: an engineer (the booked one when free); false or null: none; an id: that engineer (the owner only). */
	engineer: z
		.union([z.boolean(), z.null(), z.string().trim().min(1).max(100)], { error: 'engineer is true, false or an engineer’s id.' })
		.optional(),
	gear: z
		.array(z.uuid({ error: 'Unknown gear.' }), { error: 'gear is a list of gear ids.' })
		.max(20, { error: 'Choose at most 20 pieces of gear.' })
		.optional()
});
export type MoveRequest = z.infer<typeof moveRequestSchema>;

/** The query of the preview as a request: gear as repeated parameters or a comma list. */
export function moveRequestFromQuery(q: URLSearchParams): unknown {
	const gear = q
		.getAll('gear')
		.flatMap((g) => g.split(','))
		.map((g) => g.trim())
		.filter(Boolean);
	const engineer = q.get('engineer');
	return {
		start: q.get('start') ?? undefined,
		end: q.get('end') ?? undefined,
		room: q.get('room') || undefined,
		engineer:
			engineer === null || engineer === ''
				? undefined
				: engineer === 'true'
					? true
					: engineer === 'false' || engineer === 'none'
						? false
						: engineer,
		gear: q.has('gear') ? gear : undefined
	};
}

export type MoveFailure =
	| { ok: false; status: 404 | 403; code: string; message: string }
	| { ok: false; status: 422; code: 'invalid'; message: string; fields: FieldErrors }
	| { ok: false; status: 409; code: string; message: string; taken?: Taken; nearestStarts?: string[] };

/** Everything a move would do, worked out before anything is written. */
export interface MovePlan {
	booking: BookingRow;
	ctx: PricingContext;
	mover: Mover;
	terms: MoveTerms;
	policy: MovePolicy;
	start: Date;
	end: Date;
	busyUntil: Date;
	room: RoomRow;
	engineerId: string | null;
	gear: { id: string; fee: number }[];
	quote: Quote;
	depositPaid: number;
	settlement: Settlement;
	/** null when the new slot is free now; else what stands in the way. */
	taken: Taken | null;
}

const notFound = (): MoveFailure => ({ ok: false, status: 404, code: 'not_found', message: 'No such booking.' });

const CONFLICT_MESSAGES: Record<Taken, string> = {
	room: 'That time in this room is taken.',
	engineer: 'No engineer is free for that time.',
	gear: 'A piece of the chosen gear is already booked for that time.'
};

/** What stands in the way of a booking taking this room, engineer and gear over [start, busyUntil), itself left out. */
async function takenBy(
	q: Pick<Tx, 'select'>,
	b: Pick<BookingRow, 'id' | 'studioId'>,
	target: { roomId: string; engineerId: string | null; gearIds: string[]; start: Date; busyUntil: Date },
	now: Date
): Promise<Taken | null> {
	const overlap = and(
		eq(booking.studioId, b.studioId),
		ne(booking.id, b.id),
		occupying(now),
		lt(booking.startsAt, target.busyUntil),
		gt(booking.busyUntil, target.start)
	);
	const [roomHit] = await q
		.select({ id: booking.id })
		.from(booking)
		.where(and(overlap, eq(booking.roomId, target.roomId)))
		.limit(1);
	if (roomHit) return 'room';
	if (target.engineerId) {
		const [hit] = await q
			.select({ id: booking.id })
			.from(booking)
			.where(and(overlap, eq(booking.engineerId, target.engineerId)))
			.limit(1);
		if (hit) return 'engineer';
	}
	if (target.gearIds.length) {
		const [hit] = await q
			.select({ id: booking.id })
			.from(bookingGear)
			.innerJoin(booking, eq(booking.id, bookingGear.bookingId))
			.where(and(overlap, inArray(bookingGear.gearItemId, target.gearIds), eq(bookingGear.active, true)))
			.limit(1);
		if (hit) return 'gear';
	}
	return null;
}

/**
 * Reads the booking as `actor` may (404 otherwise), decides who moves it, checks and prices the
 * new time at the booking's own rate card, and works out the settlement. Writes nothing.
 */
export async function planMove(
	actor: SessionUser,
	bookingId: string,
	input: unknown,
	now = new Date()
): Promise<MovePlan | MoveFailure> {
	const found = await getRow(actor, bookingId);
	if (!found) return notFound();
	const b = found.booking;
	const role = found.as.role;
	if (role !== 'owner' && role !== 'artist')
		return { ok: false, status: 403, code: 'forbidden', message: 'Only the artist or the studio’s owner may move a session.' };
	const mover: Mover = role === 'owner' ? 'owner' : 'artist';

	const parsed = moveRequestSchema.safeParse(input);
	if (!parsed.success) return { ...invalidRequest(zodFieldErrors(parsed.error)), code: 'invalid' };
	const req = parsed.data;
	if (mover === 'artist' && typeof req.engineer === 'string')
		return { ...invalidRequest({ engineer: ['Only the studio chooses which engineer works a session.'] }), code: 'invalid' };

	const ctx = await pricingContext(b.studioId);
	const s = ctx.studio;
	const policy: MovePolicy = { freeHours: s.moveFreeHours, minHours: s.moveMinHours, fee: s.moveFee };
	const terms = moveTerms({ mover, own: b.artistId === actor.id, status: b.status, startsAt: b.startsAt, now, policy });

	const [currentRoom] = await db.select({ slug: room.slug }).from(room).where(eq(room.id, b.roomId));
	const currentGear = await db.select({ id: bookingGear.gearItemId }).from(bookingGear).where(eq(bookingGear.bookingId, b.id));
	const wantsEngineer = req.engineer === undefined ? b.engineerId !== null : req.engineer !== null && req.engineer !== false;
	// The same checks as a new booking: the room, the times, closed days, hireable gear.
	const priced = await priceRequest(
		{
			room: req.room ?? currentRoom?.slug ?? '',
			start: req.start,
			end: req.end,
			engineer: wantsEngineer,
			gear: req.gear ?? currentGear.map((g) => g.id),
			project: b.project,
			notes: b.notes,
			billing: b.billing ?? null
		},
		ctx,
		now
	);
	if (!priced.ok) return { ...priced, code: 'invalid' };
	const { start, end, room: roomRow, gear } = priced;
	const turnaround = b.busyUntil.getTime() - b.endsAt.getTime();
	const busyUntil = new Date(end.getTime() + turnaround);

	// The engineer: the one asked for (owner), else the booked one when free, else any free one.
	let engineerId: string | null = null;
	let taken: Taken | null = null;
	if (typeof req.engineer === 'string') {
		const [m] = await db
			.select({ id: member.userId })
			.from(member)
			.where(
				and(eq(member.organizationId, b.studioId), eq(member.userId, req.engineer), inArray(member.role, ['engineer', 'owner']))
			);
		if (!m) return { ...invalidRequest({ engineer: ['There is no engineer by that id in this studio.'] }), code: 'invalid' };
		engineerId = m.id;
	} else if (wantsEngineer) {
		const calendar = await resourceCalendar(b.studioId, { engineer: true, exceptBookingId: b.id }, start, busyUntil, now);
		const keep =
			b.engineerId &&
			!(await takenBy(db, b, { roomId: roomRow.id, engineerId: b.engineerId, gearIds: [], start, busyUntil }, now).then(
				(t) => t === 'engineer'
			));
		engineerId = keep ? b.engineerId : calendar.freeEngineer(start.getTime(), busyUntil.getTime());
		if (!engineerId) {
			engineerId = b.engineerId; // shown as taken; the booked engineer stays named
			taken = 'engineer';
		}
	}

	const stored = b.quote as Quote;
	const sameRoom = roomRow.id === b.roomId;
	const today = roomRates(roomRow);
	const quote = quoteBooking({
		start,
		end,
		room: sameRoom ? { ...today, rates: bookedRates(stored, 'room', today.rates) } : today,
		engineer: engineerId !== null,
		gear: bookedGear(
			stored,
			gear.map((g) => ({ id: g.id, label: g.name, fee: g.hireFee }))
		),
		policy: { ...bookedPolicy(stored, ctx.policy), engineerRates: bookedRates(stored, 'engineer', ctx.policy.engineerRates) },
		holidays: ctx.holidays,
		vatTreatment: treatmentOf(stored)
	});
	const money = await loadMoneyState(db, b.id);
	const settlement = settleMove({
		newTotal: quote.total,
		depositPolicy: ctx.policy,
		depositPaid: money.held,
		fee: terms.allowed ? terms.fee : 0,
		mover,
		startsAt: b.startsAt,
		now,
		cancellation: ctx.policy.cancellation
	});
	const gearFees = quote.lines.filter((l) => l.kind === 'gear');
	taken ??= await takenBy(db, b, { roomId: roomRow.id, engineerId, gearIds: gear.map((g) => g.id), start, busyUntil }, now);
	return {
		booking: b,
		ctx,
		mover,
		terms,
		policy,
		start,
		end,
		busyUntil,
		room: roomRow,
		engineerId,
		gear: gear.map((g) => ({ id: g.id, fee: gearFees.find((l) => l.key === `gear:${g.id}`)?.amount ?? g.hireFee })),
		quote,
		depositPaid: money.held,
		settlement,
		taken
	};
}

async function nearestFor(plan: MovePlan, now: Date): Promise<string[]> {
	return nearestStarts(plan.room, plan.ctx, plan.start, minutesBetween(plan.start, plan.end), now, {
		engineer: plan.engineerId !== null,
		gearIds: plan.gear.map((g) => g.id),
		exceptBookingId: plan.booking.id
	});
}

/** GET /api/bookings/{id}/move: what the move would cost and whether it can be made. */
export async function previewMove(actor: SessionUser, bookingId: string, input: unknown, now = new Date()) {
	const plan = await planMove(actor, bookingId, input, now);
	if ('ok' in plan) return plan;
	return { ok: true as const, body: await previewBody(plan, now) };
}

async function previewBody(plan: MovePlan, now: Date) {
	const b = plan.booking;
	const tz = plan.ctx.policy.timeZone;
	const t = plan.terms;
	return {
		allowed: t.allowed,
		...(t.allowed ? {} : { refusal: t.refusal, message: t.message }),
		rule: t.rule,
		noticeHours: t.noticeHours,
		policy: { freeHours: plan.policy.freeHours, minHours: plan.policy.minHours, fee: plan.policy.fee },
		currency: b.currency,
		start: isoInZone(plan.start, tz),
		end: isoInZone(plan.end, tz),
		room: { slug: plan.room.slug, name: plan.room.name },
		fee: t.allowed ? t.fee : 0,
		oldTotal: b.total,
		newTotal: plan.quote.total,
		oldDeposit: b.deposit,
		newDeposit: plan.settlement.newDeposit,
		depositPaid: plan.depositPaid,
		settlement: plan.settlement.settlement,
		toPay: plan.settlement.toPay,
		refund: plan.settlement.refund,
		kept: plan.settlement.kept,
		refundRule: plan.settlement.rule,
		quote: publicQuote(plan.quote),
		available: plan.taken === null,
		...(plan.taken ? { taken: plan.taken, nearestStarts: await nearestFor(plan, now) } : {})
	};
}

/** What a move changes on the booking, as a booking_move row keeps it. */
interface Target {
	start: Date;
	end: Date;
	busyUntil: Date;
	roomId: string;
	engineerId: string | null;
	gear: { id: string; fee: number }[];
	quote: Quote;
	total: number;
	deposit: number;
}

function targetOfMove(m: MoveRow): Target {
	const quote = m.quote as Quote;
	return {
		start: m.toStartsAt,
		end: m.toEndsAt,
		busyUntil: m.toBusyUntil,
		roomId: m.toRoomId,
		engineerId: m.toEngineerId,
		gear: m.toGearIds.map((id) => ({ id, fee: quote.lines.find((l) => l.key === `gear:${id}`)?.amount ?? 0 })),
		quote,
		total: m.newTotal,
		deposit: m.newDeposit
	};
}

/**
 * Puts the booking (locked by the caller) on its new slot: gear rows that go are deleted, the
 * booking row changes in one statement (the trigger carries the new times to the gear that stays),
 * new gear rows are added, SEQUENCE rises. In a savepoint: a taken slot (SQLSTATE 23P01) leaves
 * everything as it was and says what was taken.
 */
async function putOnSlot(
	tx: Tx,
	b: BookingRow,
	t: Target
): Promise<{ ok: true; sequence: number } | { ok: false; taken: Taken }> {
	// Writers of the same room, engineer and gear queue here, in one order (hold.ts says why).
	const keys = [
		`room:${t.roomId}`,
		...(t.engineerId ? [`engineer:${t.engineerId}`] : []),
		...t.gear.map((g) => `gear:${g.id}`).sort()
	];
	for (const key of keys) await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${key}, 0))`);
	try {
		return await tx.transaction(async (sp) => {
			const keepIds = t.gear.map((g) => g.id);
			const had = await sp.select({ id: bookingGear.gearItemId }).from(bookingGear).where(eq(bookingGear.bookingId, b.id));
			const gone = had.filter((g) => !keepIds.includes(g.id)).map((g) => g.id);
			if (gone.length)
				await sp.delete(bookingGear).where(and(eq(bookingGear.bookingId, b.id), inArray(bookingGear.gearItemId, gone)));
			const [row] = await sp
				.update(booking)
				.set({
					startsAt: t.start,
					endsAt: t.end,
					busyUntil: t.busyUntil,
					roomId: t.roomId,
					engineerId: t.engineerId,
					quote: t.quote,
					total: t.total,
					deposit: t.deposit,
					sequence: sql`${booking.sequence} + 1`
				})
				.where(eq(booking.id, b.id))
				.returning({ sequence: booking.sequence });
			const added = t.gear.filter((g) => !had.some((h) => h.id === g.id));
			if (added.length) {
				await sp.insert(bookingGear).values(
					added.map((g) => ({
						studioId: b.studioId,
						bookingId: b.id,
						gearItemId: g.id,
						hireFee: g.fee,
						startsAt: t.start,
						busyUntil: t.busyUntil
					}))
				);
			}
			return { ok: true as const, sequence: row!.sequence };
		});
	} catch (e) {
		const { code, constraint } = pgCode(e);
		if (code !== '23P01') throw e;
		return {
			ok: false,
			taken:
				constraint === 'booking_gear_no_overlap' ? 'gear' : constraint === 'booking_engineer_no_overlap' ? 'engineer' : 'room'
		};
	}
}

/** Gives up a move that waits for its payment (a newer move replaces it); its checkout is closed after commit. */
async function dropWaiting(tx: Tx, bookingId: string, after: AfterCommit): Promise<void> {
	const waiting = await tx
		.update(bookingMove)
		.set({ status: 'cancelled' })
		.where(and(eq(bookingMove.bookingId, bookingId), eq(bookingMove.status, 'awaiting_payment')))
		.returning();
	for (const m of waiting) {
		if (!m.paymentId) continue;
		const [p] = await tx.select().from(payment).where(eq(payment.id, m.paymentId));
		if (p?.status === 'open' && p.checkoutSessionId) {
			const id = p.checkoutSessionId;
			after.push(() => expireSession(id, p.stripeAccountId));
		}
	}
}

/** Refunds `amount` out of the booking's paid payments (deposit first, then moves), reason 'move'. */
async function refundExcess(tx: Tx, after: AfterCommit, b: BookingRow, amount: number, actorId: string) {
	const state = await loadMoneyState(tx, b.id);
	const order = (p: PaymentRow) => (p.kind === 'deposit' ? 0 : p.kind === 'move' ? 1 : 2);
	let left = amount;
	const ids: string[] = [];
	for (const p of state.payments.filter((x) => x.status === 'paid').sort((x, y) => order(x) - order(y))) {
		if (left <= 0) break;
		const part = Math.min(left, state.refundable.get(p.id) ?? 0);
		if (part <= 0) continue;
		const r = await queueRefund(tx, after, { booking: b, payment: p, amount: part, reason: 'move', requestedBy: actorId });
		ids.push(r.id);
		left -= part;
	}
	return ids;
}

export type MoveOutcome =
	| { ok: true; status: 200; state: 'applied'; body: Record<string, unknown> }
	| { ok: true; status: 202; state: 'awaiting_payment'; body: Record<string, unknown> }
	| MoveFailure;

/** POST /api/bookings/{id}/move and the booking page's move. */
export async function moveBooking(
	actor: SessionUser,
	bookingId: string,
	input: unknown,
	at: { origin: string },
	now = new Date()
): Promise<MoveOutcome> {
	const plan = await planMove(actor, bookingId, input, now);
	if ('ok' in plan) return plan;
	if (!plan.terms.allowed) return { ok: false, status: 409, code: plan.terms.refusal, message: plan.terms.message };
	const conflict = async (taken: Taken): Promise<MoveFailure> => ({
		ok: false,
		status: 409,
		code: 'slot_taken',
		message: CONFLICT_MESSAGES[taken],
		taken,
		nearestStarts: await nearestFor(plan, now)
	});
	if (plan.taken) return conflict(plan.taken);

	const target: Target = {
		start: plan.start,
		end: plan.end,
		busyUntil: plan.busyUntil,
		roomId: plan.room.id,
		engineerId: plan.engineerId,
		gear: plan.gear,
		quote: plan.quote,
		total: plan.quote.total,
		deposit: plan.settlement.newDeposit
	};
	const pays = plan.settlement.toPay > 0;
	const result = await inTransaction<{ ok: true; moveId: string } | { ok: false; taken?: Taken; changed?: true }>(
		async (tx, after) => {
			const b = await lockBooking(tx, bookingId);
			// Changed since it was priced (another move, a cancellation, a payment): price it again.
			if (
				!b ||
				b.sequence !== plan.booking.sequence ||
				b.status !== plan.booking.status ||
				b.startsAt.getTime() !== plan.booking.startsAt.getTime()
			)
				return { ok: false, changed: true };
			const held = (await loadMoneyState(tx, b.id)).held;
			if (held !== plan.depositPaid) return { ok: false, changed: true };
			await dropWaiting(tx, b.id, after);
			const gearNow = await tx.select({ id: bookingGear.gearItemId }).from(bookingGear).where(eq(bookingGear.bookingId, b.id));
			const row = {
				studioId: b.studioId,
				bookingId: b.id,
				fromStartsAt: b.startsAt,
				fromEndsAt: b.endsAt,
				fromRoomId: b.roomId,
				fromEngineerId: b.engineerId,
				fromGearIds: gearNow.map((g) => g.id),
				toStartsAt: target.start,
				toEndsAt: target.end,
				toBusyUntil: target.busyUntil,
				toRoomId: target.roomId,
				toEngineerId: target.engineerId,
				toGearIds: target.gear.map((g) => g.id),
				quote: target.quote,
				oldTotal: b.total,
				newTotal: target.total,
				oldDeposit: b.deposit,
				newDeposit: target.deposit,
				fee: plan.terms.allowed ? plan.terms.fee : 0,
				settlement: plan.settlement.settlement,
				requestedBy: actor.id
			};
			if (pays) {
				// The old slot stays the booking's until the payment comes (moveArrived applies it then).
				const [m] = await tx
					.insert(bookingMove)
					.values({ ...row, status: 'awaiting_payment' })
					.returning({ id: bookingMove.id });
				await auditTx(tx, 'booking.move_requested', b.id, { moveId: m!.id, settlement: row.settlement, fee: row.fee }, actor.id);
				return { ok: true, moveId: m!.id };
			}
			const placed = await putOnSlot(tx, b, target);
			if (!placed.ok) return { ok: false, taken: placed.taken };
			const refundIds = plan.settlement.refund > 0 ? await refundExcess(tx, after, b, plan.settlement.refund, actor.id) : [];
			const [m] = await tx
				.insert(bookingMove)
				.values({ ...row, status: 'applied', appliedAt: now, refundId: refundIds[0] ?? null })
				.returning({ id: bookingMove.id });
			await auditTx(
				tx,
				'booking.moved',
				b.id,
				{
					moveId: m!.id,
					from: row.fromStartsAt,
					to: row.toStartsAt,
					settlement: row.settlement,
					refund: plan.settlement.refund,
					by: plan.mover
				},
				actor.id
			);
			await queueMoveNotice(tx, b.id, placed.sequence);
			// The reminders follow the new start (and the balance request the new end).
			after.push(() => syncBookingMessagesQuietly(b.id));
			return { ok: true, moveId: m!.id };
		}
	);
	if (!result.ok) {
		if (result.taken) return conflict(result.taken);
		return { ok: false, status: 409, code: 'changed', message: 'This booking changed meanwhile; please look at the move again.' };
	}
	const body = { moveId: result.moveId, ...(await previewBody({ ...plan, taken: null }, now)) };
	if (!pays) return { ok: true, status: 200, state: 'applied', body: { ...body, status: 'applied' } };
	const checkout = await startCheckout(bookingId, 'move', at.origin, now);
	return {
		ok: true,
		status: 202,
		state: 'awaiting_payment',
		body: { ...body, status: 'awaiting_payment', checkoutUrl: checkout.url }
	};
}

/**
 * The payment of a dearer move has arrived (payments/state.ts, in the webhook's transaction with
 * the booking locked): the move is applied if the new slot is still free, with a prepayment
 * invoice for the amount; if not (or the move was given up, or the booking is no longer
 * confirmed or has started), the payment is refunded in full and the artist told.
 */
export async function moveArrived(tx: Tx, b: BookingRow, p: PaymentRow, after: AfterCommit): Promise<string> {
	const [m] = await tx.select().from(bookingMove).where(eq(bookingMove.paymentId, p.id)).for('update');
	const refundAll = async (why: string) => {
		await queueRefund(tx, after, { booking: b, payment: p, amount: p.amount, reason: 'slot_unavailable' });
		await auditTx(tx, 'booking.move_refunded', b.id, { moveId: m?.id ?? null, paymentId: p.id, why });
	};
	if (!m || m.status !== 'awaiting_payment') {
		await refundAll(m ? `move ${m.status}` : 'no move');
		return 'move_payment_refunded';
	}
	const now = new Date();
	const placed =
		b.status === 'confirmed' && b.startsAt > now && m.toStartsAt > now ? await putOnSlot(tx, b, targetOfMove(m)) : null;
	if (!placed?.ok) {
		await tx.update(bookingMove).set({ status: 'cancelled' }).where(eq(bookingMove.id, m.id));
		await refundAll(placed ? `${placed.taken} taken` : 'booking not movable');
		await queueMoveFailed(tx, b.id, m.id, p.amount);
		return 'move_slot_unavailable';
	}
	await tx.update(bookingMove).set({ status: 'applied', appliedAt: now }).where(eq(bookingMove.id, m.id));
	await issueDepositInvoice(tx, { paymentId: p.id });
	await auditTx(
		tx,
		'booking.moved',
		b.id,
		{ moveId: m.id, from: m.fromStartsAt, to: m.toStartsAt, settlement: m.settlement, paymentId: p.id },
		m.requestedBy
	);
	await queueMoveNotice(tx, b.id, placed.sequence);
	after.push(() => syncBookingMessagesQuietly(b.id));
	return 'move_applied';
}

/** A move's checkout ran out or failed: the move is given up, the booking keeps its slot. */
export async function moveUnpaid(tx: Tx, b: Pick<BookingRow, 'id'>, p: Pick<PaymentRow, 'id'>): Promise<void> {
	const gone = await tx
		.update(bookingMove)
		.set({ status: 'cancelled' })
		.where(and(eq(bookingMove.paymentId, p.id), eq(bookingMove.status, 'awaiting_payment')))
		.returning({ id: bookingMove.id });
	if (gone.length) await auditTx(tx, 'booking.move_unpaid', b.id, { moveId: gone[0]!.id, paymentId: p.id });
}

/** The move waiting for its payment, for the booking page: its new time and what is to pay. */
export async function waitingMove(bookingId: string) {
	const [m] = await db
		.select({ m: bookingMove, roomName: room.name, checkoutUrl: payment.checkoutUrl, paymentStatus: payment.status })
		.from(bookingMove)
		.innerJoin(room, eq(room.id, bookingMove.toRoomId))
		.leftJoin(payment, eq(payment.id, bookingMove.paymentId))
		.where(and(eq(bookingMove.bookingId, bookingId), eq(bookingMove.status, 'awaiting_payment')));
	return m ?? null;
}

/** The moves of a booking, newest first (the booking page's history). */
export async function movesOf(bookingId: string) {
	return db
		.select()
		.from(bookingMove)
		.where(eq(bookingMove.bookingId, bookingId))
		.orderBy(sql`${bookingMove.createdAt} desc`);
}

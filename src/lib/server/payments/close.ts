// Closing a session: the owner or engineer records when it really ended and any gear added on the
// day; the pricing engine prices overtime and that gear; the final invoice (380) is issued with
// every line of the quote, the deposit deducted as paid on account; the booking is completed.
import { and, eq, inArray } from 'drizzle-orm';
import { z } from 'zod';
import { db } from '../db';
import { booking, bookingGear, gearItem, room } from '../db/schema';
import { getPolicy, roomRates } from '../studio';
import type { SessionUser } from '../auth';
import { roleAt } from '../bookings/read';
import { inTransaction, lockBooking, pgCode, setBookingStatus } from './core';
import { auditTx } from './state';
import { issueFinalInvoice } from '../invoices/documents';
import { overtimeCharge, quoteBooking, type OvertimeCharge, type Quote } from '$lib/domain/pricing';
import { parseBookingInstant, TimeInputError } from '$lib/domain/time';
import { publicHolidayChecker } from '$lib/domain/holidays';
import { closeRefusal } from '$lib/domain/lifecycle';
// A reverse-charged booking's overtime and gear added on the day carry no VAT either.
import { treatmentOf } from '$lib/domain/vat-treatment';
import { syncBookingMessagesQuietly } from '../messages';

export const closeSchema = z.object({
	actualEnd: z
		.string({ error: 'Give the time the session ended.' })
		.trim()
		.min(1, { error: 'Give the time the session ended.' })
		.max(40),
	gearUsed: z
		.array(z.uuid({ error: 'Unknown gear.' }), { error: 'gearUsed is a list of gear ids.' })
		.max(40)
		.optional()
		.default([])
});

/** A session is recorded up to this long after its booked end. */
const MAX_OVERRUN_MS = 12 * 3600_000;

export type CloseOutcome =
	| {
			ok: true;
			already: boolean;
			invoice: { id: string; number: string; gross: number; amountDue: number; currency: string };
			overtime: { minutes: number; billedMinutes: number; total: number } | null;
	  }
	| { ok: false; status: 404 | 403 | 409 | 422; code: string; message: string; fields?: Record<string, string[]> };

function invalid(field: string, message: string): CloseOutcome {
	return { ok: false, status: 422, code: 'invalid', message, fields: { [field]: [message] } };
}

/**
 * The owner or an engineer of the booking's own studio closes it; its artist is refused (403), and
 * anyone else gets a 404: another studio's booking is not theirs to know of.
 */
export async function closeBooking(actor: SessionUser, bookingId: string, input: unknown): Promise<CloseOutcome> {
	const [head] = await db
		.select({ studioId: booking.studioId, artistId: booking.artistId })
		.from(booking)
		.where(eq(booking.id, bookingId));
	if (!head) return { ok: false, status: 404, code: 'not_found', message: 'No such booking.' };
	const role = await roleAt(actor.id, head.studioId);
	if (role !== 'owner' && role !== 'engineer') {
		return role === 'artist' && head.artistId !== actor.id
			? { ok: false, status: 404, code: 'not_found', message: 'No such booking.' }
			: { ok: false, status: 403, code: 'forbidden', message: 'Only the owner or an engineer records the end of a session.' };
	}
	const parsed = closeSchema.safeParse(input);
	if (!parsed.success) {
		const fields: Record<string, string[]> = {};
		for (const issue of parsed.error.issues) (fields[String(issue.path[0] ?? '_')] ??= []).push(issue.message);
		return { ok: false, status: 422, code: 'invalid', message: 'Some details need another look.', fields };
	}
	const { policy } = await getPolicy(head.studioId);
	let recordedEnd: Date;
	try {
		recordedEnd = parseBookingInstant(parsed.data.actualEnd, policy.timeZone);
	} catch (e) {
		if (e instanceof TimeInputError) return invalid('actualEnd', e.message);
		throw e;
	}
	const actualEnd = new Date(Math.ceil(recordedEnd.getTime() / 60_000) * 60_000);

	try {
		return await inTransaction<CloseOutcome>(async (tx, after) => {
			const b = await lockBooking(tx, bookingId);
			if (!b) return { ok: false, status: 404, code: 'not_found', message: 'No such booking.' };
			if (b.status === 'completed') {
				const final = await issueFinalInvoice(tx, { bookingId: b.id });
				return { ok: true, already: true, invoice: invoiceSummary(final), overtime: null };
			}
			// The lifecycle decides, on the locked row: not before the session has begun, and only
			// once the deposit has confirmed it.
			const refusal = closeRefusal(b, new Date());
			if (refusal) return { ok: false, status: 409, code: refusal.code, message: refusal.message };
			if (actualEnd <= b.startsAt || actualEnd.getTime() > b.endsAt.getTime() + MAX_OVERRUN_MS) {
				return invalid('actualEnd', 'The end must be after the start and at most 12 hours after the booked end.');
			}
			const [roomRow] = await tx.select().from(room).where(eq(room.id, b.roomId));
			const holidays = publicHolidayChecker(policy.country);

			let overtime: OvertimeCharge | null = null;
			if (actualEnd > b.endsAt) {
				overtime = overtimeCharge({
					bookedEnd: b.endsAt,
					actualEnd,
					room: roomRates(roomRow!),
					engineer: !!b.engineerId,
					policy,
					holidays,
					vatTreatment: treatmentOf(b.quote as Quote)
				});
			}

			// Gear used but not booked is hired for the session now, priced by the engine as at booking.
			const booked = new Set(
				(await tx.select({ id: bookingGear.gearItemId }).from(bookingGear).where(eq(bookingGear.bookingId, b.id))).map(
					(g) => g.id
				)
			);
			const extraIds = [...new Set(parsed.data.gearUsed)].filter((id) => !booked.has(id));
			let extraLines: Quote['lines'] = [];
			if (extraIds.length) {
				const items = await tx
					.select()
					.from(gearItem)
					.where(and(eq(gearItem.studioId, b.studioId), inArray(gearItem.id, extraIds), eq(gearItem.active, true)));
				if (items.length !== extraIds.length) {
					return invalid('gearUsed', 'Some of that gear is unknown.');
				}
				await tx.insert(bookingGear).values(
					items.map((g) => ({
						studioId: b.studioId,
						bookingId: b.id,
						gearItemId: g.id,
						hireFee: g.hireable ? g.hireFee : 0,
						startsAt: b.startsAt,
						busyUntil: b.busyUntil
					}))
				);
				const hired = items.filter((g) => g.hireable && g.hireFee > 0);
				if (hired.length) {
					const q = quoteBooking({
						start: b.startsAt,
						end: b.endsAt,
						room: roomRates(roomRow!),
						engineer: false,
						gear: hired.map((g) => ({ id: g.id, label: `${g.name} (added on the day)`, fee: g.hireFee })),
						policy,
						holidays,
						vatTreatment: treatmentOf(b.quote as Quote)
					});
					extraLines = q.lines.filter((l) => l.kind === 'gear');
				}
			}

			await setBookingStatus(tx, b, 'completed', { actualEndsAt: actualEnd });
			// The balance request, when one is owed, is planned once this has committed.
			after.push(() => syncBookingMessagesQuietly(b.id));
			const final = await issueFinalInvoice(tx, { bookingId: b.id, overtimeLines: overtime?.lines ?? [], extraLines });
			await auditTx(
				tx,
				'booking.closed',
				b.id,
				{ actualEnd: actualEnd.toISOString(), invoice: final.displayNumber, extraGear: extraIds },
				actor.id
			);
			return {
				ok: true,
				already: false,
				invoice: invoiceSummary(final),
				overtime: overtime
					? { minutes: overtime.overtimeMinutes, billedMinutes: overtime.billedMinutes, total: overtime.total }
					: null
			};
		});
	} catch (e) {
		if (pgCode(e).code === '23P01') {
			return {
				ok: false,
				status: 409,
				code: 'gear_taken',
				message: 'A piece of that gear is booked by another session at this time.'
			};
		}
		throw e;
	}
}

function invoiceSummary(i: {
	id: string;
	displayNumber: string;
	gross: number;
	rounding: number;
	amountDue: number;
	currency: string;
}) {
	return { id: i.id, number: i.displayNumber, gross: i.gross + i.rounding, amountDue: i.amountDue, currency: i.currency };
}

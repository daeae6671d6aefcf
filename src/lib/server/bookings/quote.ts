// Pricing a booking request: checked against the room, the policy and the calendar, then priced
// by the pricing engine. Nothing about the price comes from the request.
import { getRoomBySlug, roomRates, type RoomRow } from '../studio';
import { isUnboundedTime, quoteBooking, validateBookingTimes, type Quote } from '$lib/domain/pricing';
import { closedDays } from './availability';
import { hireableGear, type GearRow } from './resources';
import type { PricingContext } from './context';
import { vatTreatmentFor } from '$lib/domain/vat-treatment';
import {
	invalidRequest,
	localDays,
	parseBookingRequest,
	requestInstants,
	type BookingRequest,
	type FieldErrors,
	type InvalidRequest
} from './request';

export type Priced = { ok: true; quote: Quote; room: RoomRow; start: Date; end: Date; gear: GearRow[] } | InvalidRequest;

/**
 * Checks a parsed request against the room, the policy and the calendar, and prices it, with the
 * VAT treatment the studio gives the request's billing details (standard VAT, or reverse charge for
 * an EU business buyer abroad when the studio has opted in: $lib/domain/vat-treatment.ts). The
 * quote keeps the treatment, so the booking made from it does.
 */
export async function priceRequest(req: BookingRequest, ctx: PricingContext, now = new Date()): Promise<Priced> {
	const tz = ctx.policy.timeZone;
	const roomRow = await getRoomBySlug(ctx.studio.id, req.room);
	const fields: FieldErrors = {};
	if (!roomRow) fields.room = ['There is no room by that name.'];
	const { start, end, fields: timeFields } = requestInstants(req, tz);
	Object.assign(fields, timeFields);
	if (!start || !end || !roomRow) return invalidRequest(fields);

	const timeIssues = validateBookingTimes(start, end, ctx.policy, now);
	for (const issue of timeIssues) (fields[issue.field] ??= []).push(issue.message);
	// Blackouts and holidays are looked up day by day: only for a time that is in range.
	if (isUnboundedTime(timeIssues)) return invalidRequest(fields);

	const days = localDays(start, end, tz);
	const closed = await closedDays(ctx, days.first, days.last);
	if (closed.length)
		(fields.start ??= []).push(
			`The studio is closed on ${closed[0]!.date}${closed[0]!.reason ? ` (${closed[0]!.reason})` : ''}.`
		);

	const unique = [...new Set(req.gear)];
	const gear = await hireableGear(ctx.studio.id, unique);
	if (gear.length !== unique.length) fields.gear = ['Some of the chosen gear cannot be hired.'];
	if (Object.keys(fields).length) return invalidRequest(fields);

	const quote = quoteBooking({
		start,
		end,
		room: roomRates(roomRow),
		engineer: req.engineer,
		gear: gear.map((g) => ({ id: g.id, label: g.name, fee: g.hireFee })),
		policy: ctx.policy,
		holidays: ctx.holidays,
		vatTreatment: vatTreatmentFor(ctx.studio, req.billing ?? null)
	});
	return { ok: true, quote, room: roomRow, start, end, gear };
}

/** POST /api/studios/STUDIO/quote: the body parsed once, the request priced at the studio read once. */
export async function quoteFor(ctx: PricingContext, input: unknown, now = new Date()): Promise<Priced> {
	const parsed = parseBookingRequest(input);
	if (!parsed.ok) return parsed;
	return priceRequest(parsed.request, ctx, now);
}

/** The quote as the public API shows it: the lines, VAT, totals, deposit and balance, all in minor units. */
export function publicQuote(q: Quote) {
	return {
		currency: q.currency,
		pricesIncludeVat: q.pricesIncludeVat,
		durationMinutes: q.durationMinutes,
		lines: q.lines.map((l) => ({ key: l.key, label: l.label, quantity: l.quantity, amount: l.amount, net: l.net })),
		net: q.net,
		vat: q.vat.map((v) => ({ ratePercent: v.ratePercent, base: v.base, amount: v.amount })),
		vatTotal: q.vatTotal,
		gross: q.gross,
		rounding: q.rounding,
		total: q.total,
		deposit: q.deposit,
		balance: q.balance,
		/** 'reverse-charge': priced without VAT, the buyer accounts for it (from the billing details sent). */
		vatTreatment: q.vatTreatment ?? 'standard'
	};
}

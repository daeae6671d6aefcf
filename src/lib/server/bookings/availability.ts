// The calendar as bookings see it: closed days, the times a room is taken, the open windows of a
// few days, the nearest starts that fit a booking, and whether a lapsed hold's time is free again.
import { and, asc, eq, gt, gte, lt, lte } from 'drizzle-orm';
import { db } from '../db';
import { blackout, booking } from '../db/schema';
import { getRoomBySlug, type RoomRow } from '../studio';
import {
	AvailabilityInputError,
	computeAvailability,
	nearestFreeStarts,
	startsThatFit,
	type Blackout
} from '$lib/domain/availability';
import { publicHolidayList } from '$lib/domain/holidays';
import { dateProblem, lineText } from '$lib/schemas/input';
import { pricingContext, type PricingContext } from './context';
import { occupying } from './occupancy';
import type { BookingDetail } from './read';
import {
	addDays,
	busyUntil as busyUntilOf,
	daysFrom,
	instantsAround,
	isoInZone,
	localDateOf,
	localDays,
	minutesBetween,
	shiftDays,
	type FieldErrors
} from './request';
import { hireableGear, resourceCalendar, type BookingNeeds, type Taken } from './resources';

const AVAILABILITY_MAX_DAYS = 62;
const roomSlugSchema = lineText().max(80);

/** Local dates the studio is closed between two dates: blackouts, and public holidays if it closes on them. */
export async function closedDays(ctx: PricingContext, from: string, to: string): Promise<Blackout[]> {
	const rows = await db
		.select()
		.from(blackout)
		.where(and(eq(blackout.studioId, ctx.studio.id), lte(blackout.startsOn, to), gte(blackout.endsOn, from)));
	const out: Blackout[] = [];
	for (const r of rows) {
		for (let d = r.startsOn > from ? r.startsOn : from; d <= r.endsOn && d <= to; d = addDays(d, 1)) {
			out.push({ date: d, reason: r.reason || 'Closed' });
		}
	}
	if (ctx.studio.closedOnPublicHolidays) {
		for (let y = Number(from.slice(0, 4)); y <= Number(to.slice(0, 4)); y++) {
			for (const h of publicHolidayList(ctx.policy.country, y)) {
				if (h.date >= from && h.date <= to) out.push({ date: h.date, reason: h.name });
			}
		}
	}
	return out;
}

/** The times a room of a studio is kept (its bookings' start to busy-until) over [from, to). */
export async function busyIntervals(room: { id: string; studioId: string }, from: Date, to: Date, now = new Date()) {
	return db
		.select({ start: booking.startsAt, end: booking.endsAt })
		.from(booking)
		.where(
			and(
				eq(booking.studioId, room.studioId),
				eq(booking.roomId, room.id),
				occupying(now),
				lt(booking.startsAt, to),
				gt(booking.busyUntil, from)
			)
		)
		.orderBy(asc(booking.startsAt));
}

export type AvailabilityResult =
	| {
			ok: true;
			body: {
				timeZone: string;
				room: string;
				open: { start: string; end: string }[];
				busy: { start: string; end: string }[];
				closed: { date: string; reason: string }[];
			};
	  }
	| { ok: false; fields: FieldErrors };

/**
 * GET /api/studios/STUDIO/availability, the calendar and the booking page: a room of the studio's
 * open and busy times over local dates.
 */
export async function availability(
	ctx: PricingContext,
	params: { room: string | null; from: string | null; to: string | null },
	now = new Date()
): Promise<AvailabilityResult> {
	const fields: FieldErrors = {};
	if (!params.room) fields.room = ['Choose a room.'];
	else if (!roomSlugSchema.safeParse(params.room).success) fields.room = ['There is no room by that name.'];
	// A real calendar date, not merely its shape: Date.parse reads 2027-02-31 as 3 March.
	const fromProblem = dateProblem(params.from ?? '');
	const toProblem = dateProblem(params.to ?? '');
	if (fromProblem) fields.from = [fromProblem];
	if (toProblem) fields.to = [toProblem];
	if (Object.keys(fields).length || !params.room || !params.from || !params.to) return { ok: false, fields };
	const { from, to } = params;
	const days = daysFrom(from, to) + 1;
	if (days < 1) return { ok: false, fields: { to: ['The end date is before the start date.'] } };
	if (days > AVAILABILITY_MAX_DAYS)
		return { ok: false, fields: { to: [`Ask for at most ${AVAILABILITY_MAX_DAYS} days at a time.`] } };

	const roomRow = await getRoomBySlug(ctx.studio.id, params.room);
	if (!roomRow) return { ok: false, fields: { room: ['There is no room by that name.'] } };
	const tz = ctx.policy.timeZone;
	const window = instantsAround(from, to);
	const [busy, blackouts] = await Promise.all([busyIntervals(roomRow, window.start, window.end, now), closedDays(ctx, from, to)]);
	const result = computeAvailability({ from, to, policy: ctx.policy, busy, blackouts, now });
	return {
		ok: true,
		body: {
			timeZone: tz,
			room: roomRow.slug,
			open: result.open.map((i) => ({ start: isoInZone(i.start, tz), end: isoInZone(i.end, tz) })),
			busy: result.busy.map((i) => ({ start: isoInZone(i.start, tz), end: isoInZone(i.end, tz) })),
			closed: result.closed
		}
	};
}

/**
 * Up to three starts near the wanted one where the same length of booking fits in the room, with
 * an engineer and the chosen gear free too when the booking needs them; closest first.
 */
export async function nearestStarts(
	roomRow: RoomRow,
	ctx: PricingContext,
	wanted: Date,
	minutes: number,
	now = new Date(),
	needs: BookingNeeds = {}
): Promise<string[]> {
	const tz = ctx.policy.timeZone;
	const from = localDateOf(shiftDays(wanted, -3), tz);
	const to = localDateOf(shiftDays(wanted, 3), tz);
	const windowStart = shiftDays(wanted, -5);
	const windowEnd = shiftDays(wanted, 5);
	const [busy, blackouts, resources] = await Promise.all([
		busyIntervals(roomRow, windowStart, windowEnd, now),
		closedDays(ctx, from, to),
		resourceCalendar(ctx.studio.id, needs, windowStart, windowEnd, now)
	]);
	// Closest first, an earlier start winning a tie, and only where the engineer and gear are free too.
	const resourcesFree = (s: Date) =>
		!resources.taken(s.getTime(), busyUntilOf(s.getTime() + minutes * 60_000, ctx.policy.turnaroundMinutes).getTime());
	try {
		return nearestFreeStarts(
			{ from, to, policy: ctx.policy, busy, blackouts, now, durationMinutes: minutes },
			wanted,
			3,
			resourcesFree
		).map((s) => isoInZone(s, tz));
	} catch (e) {
		if (e instanceof AvailabilityInputError) return [];
		throw e;
	}
}

/**
 * Whether a booking's time could be booked again just as it was (room, opening hours, notice,
 * closed days, other bookings, an engineer and its gear), for a booking whose hold ran out.
 * `taken` says what stands in the way. `studioId` is the booking's own studio.
 */
export async function rebookable(
	b: BookingDetail,
	studioId: string,
	now = new Date()
): Promise<{ free: true } | { free: false; taken: Taken }> {
	const ctx = await pricingContext(studioId);
	const tz = ctx.policy.timeZone;
	const roomRow = await getRoomBySlug(ctx.studio.id, b.roomSlug);
	if (!roomRow) return { free: false, taken: 'room' };
	const start = b.startsAt.getTime();
	const minutes = minutesBetween(b.startsAt, b.endsAt);
	const days = localDays(b.startsAt, b.endsAt, tz);
	const [busy, blackouts] = await Promise.all([
		busyIntervals(roomRow, shiftDays(start, -2), shiftDays(b.endsAt, 2), now),
		closedDays(ctx, days.first, days.last)
	]);
	let fits = false;
	try {
		fits = startsThatFit({
			from: days.first,
			to: days.first,
			policy: ctx.policy,
			busy,
			blackouts,
			now,
			durationMinutes: minutes
		}).some((s) => s.getTime() === start);
	} catch (e) {
		if (!(e instanceof AvailabilityInputError)) throw e;
	}
	if (!fits) return { free: false, taken: 'room' };
	const until = busyUntilOf(b.endsAt, ctx.policy.turnaroundMinutes).getTime();
	const gearIds = b.gear.map((g) => g.id);
	const [resources, hireable] = await Promise.all([
		resourceCalendar(
			ctx.studio.id,
			{ engineer: !!b.engineerId, gearIds, exceptBookingId: b.id },
			shiftDays(start, -1),
			shiftDays(until, 1),
			now
		),
		hireableGear(ctx.studio.id, gearIds)
	]);
	const taken = resources.taken(start, until);
	if (taken === 'engineer') return { free: false, taken };
	if (taken === 'gear' || hireable.length !== gearIds.length) return { free: false, taken: 'gear' };
	return { free: true };
}

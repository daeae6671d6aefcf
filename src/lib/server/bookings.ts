// Bookings: quoting, holding a slot, and reading bookings as each role may.
// The price always comes from the pricing engine and the slot from the database's exclusion
// constraints; nothing about price, status, artist or hold expiry is taken from the request.
import { and, asc, desc, eq, gt, gte, inArray, isNull, lt, lte, or, sql } from 'drizzle-orm';
import { z } from 'zod';
import { db } from './db';
import {
	blackout,
	booking,
	bookingGear,
	gearItem,
	invoice,
	payment,
	room,
	user,
	ACTIVE_BOOKING_STATUSES,
	type BookingStatus
} from './db/schema';
import { getPolicy, getRoomBySlug, roomRates, type RoomRow, type StudioRow } from './studio';
import { isUnboundedTime, quoteBooking, validateBookingTimes, type Quote } from '$lib/domain/pricing';
import {
	AvailabilityInputError,
	computeAvailability,
	parseBookingInstant,
	startsThatFit,
	TimeInputError,
	type Blackout
} from '$lib/domain/availability';
import { dateProblem, lineText, multilineText } from '$lib/schemas/input';
import { publicHolidayChecker, publicHolidayList } from '$lib/domain/holidays';
import type { StudioPolicy } from '$lib/domain/types';
import type { SessionUser } from './auth';
import { isoInZone, localYmd } from './time';

export type FieldErrors = Record<string, string[]>;

export const bookingRequestSchema = z.object({
	room: lineText({ error: 'Choose a room.' }).trim().min(1, { error: 'Choose a room.' }).max(80),
	start: lineText({ error: 'Choose a start time.' }).trim().min(1, { error: 'Choose a start time.' }).max(40),
	end: lineText({ error: 'Choose an end time.' }).trim().min(1, { error: 'Choose an end time.' }).max(40),
	engineer: z.boolean({ error: 'engineer is true or false.' }).optional().default(false),
	gear: z
		.array(z.uuid({ error: 'Unknown gear.' }), { error: 'gear is a list of gear ids.' })
		.max(20)
		.optional()
		.default([]),
	project: lineText().trim().max(200, { error: 'Keep the project name under 200 characters.' }).optional().default(''),
	notes: multilineText().trim().max(4000, { error: 'Keep notes under 4000 characters.' }).optional().default('')
});

const roomSlugSchema = lineText().max(80);
export type BookingRequest = z.infer<typeof bookingRequestSchema>;

export function zodFieldErrors(error: z.ZodError): FieldErrors {
	const fields: FieldErrors = {};
	for (const issue of error.issues) {
		const key = issue.path.length ? String(issue.path[0]) : '_';
		(fields[key] ??= []).push(issue.message);
	}
	return fields;
}

export interface PricingContext {
	studio: StudioRow;
	policy: StudioPolicy;
	holidays: (ymd: string) => boolean;
}

export async function pricingContext(): Promise<PricingContext> {
	const { studio, policy } = await getPolicy();
	return { studio, policy, holidays: publicHolidayChecker(policy.country) };
}

/** Local dates the studio is closed between two dates: blackouts, and public holidays if it closes on them. */
export async function closedDays(ctx: PricingContext, from: string, to: string): Promise<Blackout[]> {
	const rows = await db
		.select()
		.from(blackout)
		.where(and(lte(blackout.startsOn, to), gte(blackout.endsOn, from)));
	const out: Blackout[] = [];
	for (const r of rows) {
		for (let d = r.startsOn > from ? r.startsOn : from; d <= r.endsOn && d <= to; d = nextYmd(d)) {
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

function nextYmd(ymd: string): string {
	const d = new Date(`${ymd}T00:00:00Z`);
	d.setUTCDate(d.getUTCDate() + 1);
	return d.toISOString().slice(0, 10);
}

export type Priced =
	| {
			ok: true;
			quote: Quote;
			room: RoomRow;
			start: Date;
			end: Date;
			gear: (typeof gearItem.$inferSelect)[];
			ctx: PricingContext;
	  }
	| { ok: false; status: 422; fields: FieldErrors; message: string };

function invalid(fields: FieldErrors, message = 'Some details need another look.'): Priced {
	return { ok: false, status: 422, fields, message };
}

/** Checks a request against the room, the policy and the calendar, and prices it. */
export async function priceRequest(input: unknown, now = new Date()): Promise<Priced> {
	const parsed = bookingRequestSchema.safeParse(input);
	if (!parsed.success) return invalid(zodFieldErrors(parsed.error));
	const req = parsed.data;
	const ctx = await pricingContext();
	const tz = ctx.policy.timeZone;

	const roomRow = await getRoomBySlug(req.room);
	const fields: FieldErrors = {};
	if (!roomRow) fields.room = ['There is no room by that name.'];

	const times: { start?: Date; end?: Date } = {};
	for (const key of ['start', 'end'] as const) {
		try {
			times[key] = parseBookingInstant(req[key], tz);
		} catch (e) {
			if (e instanceof TimeInputError) fields[key] = [e.message];
			else throw e;
		}
	}
	if (!times.start || !times.end || !roomRow) return invalid(fields);
	const { start, end } = times;

	const timeIssues = validateBookingTimes(start, end, ctx.policy, now);
	for (const issue of timeIssues) (fields[issue.field] ??= []).push(issue.message);
	// Blackouts and holidays are looked up day by day: only for a time that is in range.
	if (isUnboundedTime(timeIssues)) return invalid(fields);

	const startDay = localYmd(start, tz);
	const endDay = localYmd(new Date(end.getTime() - 1), tz);
	const closed = await closedDays(ctx, startDay, endDay);
	if (closed.length)
		(fields.start ??= []).push(
			`The studio is closed on ${closed[0]!.date}${closed[0]!.reason ? ` (${closed[0]!.reason})` : ''}.`
		);

	let gear: (typeof gearItem.$inferSelect)[] = [];
	if (req.gear.length) {
		const unique = [...new Set(req.gear)];
		gear = await db
			.select()
			.from(gearItem)
			.where(and(inArray(gearItem.id, unique), eq(gearItem.active, true), eq(gearItem.hireable, true)));
		if (gear.length !== unique.length) fields.gear = ['Some of the chosen gear cannot be hired.'];
	}
	if (Object.keys(fields).length) return invalid(fields);

	const quote = quoteBooking({
		start,
		end,
		room: roomRates(roomRow),
		engineer: req.engineer,
		gear: gear.map((g) => ({ id: g.id, label: g.name, fee: g.hireFee })),
		policy: ctx.policy,
		holidays: ctx.holidays
	});
	return { ok: true, quote, room: roomRow, start, end, gear, ctx };
}

/** The quote as the public API shows it (PRODUCT.md: POST /api/quote). */
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
		balance: q.balance
	};
}

// ---------------------------------------------------------------------------------------------
// Availability

const AVAILABILITY_MAX_DAYS = 62;

/** An active booking, leaving out holds whose time ran out (they no longer keep anyone out). */
function stillActive(now: Date) {
	return and(
		inArray(booking.status, ACTIVE_BOOKING_STATUSES),
		or(sql`${booking.status} <> 'held'`, gt(booking.holdExpiresAt, now), isNull(booking.holdExpiresAt))
	);
}

export async function busyIntervals(roomId: string, from: Date, to: Date, now = new Date()) {
	const rows = await db
		.select({ start: booking.startsAt, end: booking.endsAt })
		.from(booking)
		.where(and(eq(booking.roomId, roomId), stillActive(now), lt(booking.startsAt, to), gt(booking.busyUntil, from)))
		.orderBy(asc(booking.startsAt));
	return rows;
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

export async function availability(
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
	if (Object.keys(fields).length || !params.from || !params.to) return { ok: false, fields };
	const from = { data: params.from };
	const to = { data: params.to };
	const days = (Date.parse(to.data) - Date.parse(from.data)) / 86_400_000 + 1;
	if (days < 1) return { ok: false, fields: { to: ['The end date is before the start date.'] } };
	if (days > AVAILABILITY_MAX_DAYS)
		return { ok: false, fields: { to: [`Ask for at most ${AVAILABILITY_MAX_DAYS} days at a time.`] } };

	const roomRow = await getRoomBySlug(params.room!);
	if (!roomRow) return { ok: false, fields: { room: ['There is no room by that name.'] } };
	const ctx = await pricingContext();
	const tz = ctx.policy.timeZone;
	// A generous window around the local dates: a day is at most 26 hours from UTC midnight.
	const windowStart = new Date(Date.parse(from.data) - 36 * 3600_000);
	const windowEnd = new Date(Date.parse(to.data) + 60 * 3600_000);
	const [busy, blackouts] = await Promise.all([
		busyIntervals(roomRow.id, windowStart, windowEnd, now),
		closedDays(ctx, from.data, to.data)
	]);
	const result = computeAvailability({ from: from.data, to: to.data, policy: ctx.policy, busy, blackouts, now });
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

/** What else a booking needs besides its room, for finding other times that suit it. */
export interface BookingNeeds {
	engineer?: boolean;
	gearIds?: readonly string[];
	/** A booking of the artist's own to leave out (one whose hold ran out). */
	exceptBookingId?: string;
}

/**
 * A test of whether an engineer (any one) and every chosen piece of gear are free over
 * [start, busyUntil), from the bookings of a window read once. The overlap rule is the one of the
 * exclusion constraints: existing start < new busy-until and existing busy-until > new start.
 */
async function resourcesFreeTest(
	needs: BookingNeeds,
	from: Date,
	to: Date,
	now: Date
): Promise<(start: number, busyUntil: number) => boolean> {
	const tests: ((start: number, busyUntil: number) => boolean)[] = [];
	const except = needs.exceptBookingId ? sql`${booking.id} <> ${needs.exceptBookingId}` : undefined;
	if (needs.engineer) {
		const engineers = await db.select({ id: user.id }).from(user).where(eq(user.role, 'engineer'));
		const rows = engineers.length
			? await db
					.select({ id: booking.engineerId, start: booking.startsAt, end: booking.busyUntil })
					.from(booking)
					.where(
						and(
							inArray(
								booking.engineerId,
								engineers.map((e) => e.id)
							),
							stillActive(now),
							lt(booking.startsAt, to),
							gt(booking.busyUntil, from),
							except
						)
					)
			: [];
		tests.push((start, busyUntil) =>
			engineers.some((e) => !rows.some((r) => r.id === e.id && r.start.getTime() < busyUntil && r.end.getTime() > start))
		);
	}
	if (needs.gearIds?.length) {
		const rows = await db
			.select({ start: bookingGear.startsAt, end: bookingGear.busyUntil })
			.from(bookingGear)
			.innerJoin(booking, eq(booking.id, bookingGear.bookingId))
			.where(
				and(
					inArray(bookingGear.gearItemId, [...needs.gearIds]),
					stillActive(now),
					lt(bookingGear.startsAt, to),
					gt(bookingGear.busyUntil, from),
					except
				)
			);
		tests.push((start, busyUntil) => !rows.some((r) => r.start.getTime() < busyUntil && r.end.getTime() > start));
	}
	return (start, busyUntil) => tests.every((t) => t(start, busyUntil));
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
	const from = localYmd(new Date(wanted.getTime() - 3 * 86_400_000), tz);
	const to = localYmd(new Date(wanted.getTime() + 3 * 86_400_000), tz);
	const windowStart = new Date(wanted.getTime() - 5 * 86_400_000);
	const windowEnd = new Date(wanted.getTime() + 5 * 86_400_000);
	const [busy, blackouts, resourcesFree] = await Promise.all([
		busyIntervals(roomRow.id, windowStart, windowEnd, now),
		closedDays(ctx, from, to),
		resourcesFreeTest(needs, windowStart, windowEnd, now)
	]);
	let starts: Date[];
	try {
		starts = startsThatFit({ from, to, policy: ctx.policy, busy, blackouts, now, durationMinutes: minutes });
	} catch (e) {
		if (e instanceof AvailabilityInputError) return [];
		throw e;
	}
	const length = (minutes + ctx.policy.turnaroundMinutes) * 60_000;
	const want = wanted.getTime();
	// Closest first; an earlier start wins a tie.
	return starts
		.map((d) => d.getTime())
		.sort((a, b) => Math.abs(a - want) - Math.abs(b - want) || a - b)
		.filter((s) => resourcesFree(s, s + length))
		.slice(0, 3)
		.map((s) => isoInZone(new Date(s), tz));
}

/**
 * Whether a booking's time could be booked again just as it was (room, opening hours, notice,
 * closed days, other bookings, an engineer and its gear), for a booking whose hold ran out.
 * `taken` says what stands in the way.
 */
export async function rebookable(
	b: BookingDetail,
	now = new Date()
): Promise<{ free: true } | { free: false; taken: 'room' | 'engineer' | 'gear' }> {
	const ctx = await pricingContext();
	const tz = ctx.policy.timeZone;
	const roomRow = await getRoomBySlug(b.roomSlug);
	if (!roomRow) return { free: false, taken: 'room' };
	const start = b.startsAt.getTime();
	const minutes = Math.round((b.endsAt.getTime() - start) / 60_000);
	const date = localYmd(b.startsAt, tz);
	const lastDay = localYmd(new Date(b.endsAt.getTime() - 1), tz);
	const [busy, blackouts] = await Promise.all([
		busyIntervals(roomRow.id, new Date(start - 2 * 86_400_000), new Date(b.endsAt.getTime() + 2 * 86_400_000), now),
		closedDays(ctx, date, lastDay)
	]);
	let fits = false;
	try {
		fits = startsThatFit({ from: date, to: date, policy: ctx.policy, busy, blackouts, now, durationMinutes: minutes }).some(
			(s) => s.getTime() === start
		);
	} catch (e) {
		if (!(e instanceof AvailabilityInputError)) throw e;
	}
	if (!fits) return { free: false, taken: 'room' };
	const busyUntil = b.endsAt.getTime() + ctx.policy.turnaroundMinutes * 60_000;
	const window = [new Date(start - 86_400_000), new Date(busyUntil + 86_400_000)] as const;
	if (b.engineerId && !(await resourcesFreeTest({ engineer: true, exceptBookingId: b.id }, ...window, now))(start, busyUntil)) {
		return { free: false, taken: 'engineer' };
	}
	if (b.gear.length) {
		const hireable = await db
			.select({ id: gearItem.id })
			.from(gearItem)
			.where(
				and(
					inArray(
						gearItem.id,
						b.gear.map((g) => g.id)
					),
					eq(gearItem.active, true),
					eq(gearItem.hireable, true)
				)
			);
		const free = await resourcesFreeTest({ gearIds: b.gear.map((g) => g.id), exceptBookingId: b.id }, ...window, now);
		if (hireable.length !== b.gear.length || !free(start, busyUntil)) return { free: false, taken: 'gear' };
	}
	return { free: true };
}

// ---------------------------------------------------------------------------------------------
// Holding a slot

const REFERENCE_ALPHABET = '23456789ABCDEFGHJKMNPQRSTUVWXYZ';
function newReference(): string {
	const bytes = crypto.getRandomValues(new Uint8Array(6));
	return 'HP-' + [...bytes].map((b) => REFERENCE_ALPHABET[b % REFERENCE_ALPHABET.length]).join('');
}

export type HoldOutcome =
	| { ok: true; booking: typeof booking.$inferSelect; quote: Quote }
	| { ok: false; status: 422; fields: FieldErrors; message: string }
	| { ok: false; status: 409; taken: 'room' | 'engineer' | 'gear'; message: string; nearestStarts: string[] };

function pgError(e: unknown): { code?: string; constraint?: string } {
	for (let cur: unknown = e, i = 0; cur && i < 4; i++) {
		const c = cur as { code?: string; constraint_name?: string; cause?: unknown };
		if (c.code && /^[0-9A-Z]{5}$/.test(c.code)) return { code: c.code, constraint: c.constraint_name };
		cur = c.cause;
	}
	return {};
}

const CONFLICT_MESSAGES = {
	room: 'That time in this room has just been taken.',
	engineer: 'No engineer is free for that time.',
	gear: 'A piece of the chosen gear is already booked for that time.'
} as const;

/** Makes a hold: the slot is the artist's for the studio's hold time, until the deposit is paid. */
export async function createHold(artist: SessionUser, input: unknown, now = new Date()): Promise<HoldOutcome> {
	const priced = await priceRequest(input, now);
	if (!priced.ok) return priced;
	const { quote, room: roomRow, start, end, gear, ctx } = priced;
	const req = bookingRequestSchema.parse(input);
	const busyUntil = new Date(end.getTime() + ctx.policy.turnaroundMinutes * 60_000);
	const holdExpiresAt = new Date(now.getTime() + ctx.policy.holdMinutes * 60_000);

	// Holds whose time ran out must not keep anyone else from this slot.
	await db
		.update(booking)
		.set({ status: 'expired' })
		.where(and(eq(booking.status, 'held'), lt(booking.holdExpiresAt, now)));

	const minutes = Math.round((end.getTime() - start.getTime()) / 60_000);
	const needs: BookingNeeds = { engineer: req.engineer, gearIds: gear.map((g) => g.id) };
	const conflict = async (taken: 'room' | 'engineer' | 'gear'): Promise<HoldOutcome> => ({
		ok: false,
		status: 409,
		taken,
		message: CONFLICT_MESSAGES[taken],
		nearestStarts: await nearestStarts(roomRow, ctx, start, minutes, now, needs)
	});
	// What stood in the way last, should the retries run out.
	let lastTaken: 'room' | 'engineer' | 'gear' = 'room';

	for (let attempt = 0; attempt < 6; attempt++) {
		let engineerId: string | null = null;
		if (req.engineer) {
			engineerId = await freeEngineer(start, busyUntil, now);
			if (!engineerId) return conflict('engineer');
		}
		try {
			const created = await db.transaction(async (tx) => {
				// Queue writers of the same room, engineer and gear (always in this order, gear by id, so
				// the queue itself cannot deadlock). Without it, concurrent inserts that conflict in an
				// exclusion constraint wait on each other and end in deadlocks (SQLSTATE 40P01) that
				// PostgreSQL only breaks after deadlock_timeout. The constraint stays the final word.
				const keys = [
					`room:${roomRow.id}`,
					...(engineerId ? [`engineer:${engineerId}`] : []),
					...gear.map((g) => `gear:${g.id}`).sort()
				];
				for (const key of keys) await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${key}, 0))`);
				const [row] = await tx
					.insert(booking)
					.values({
						reference: newReference(),
						roomId: roomRow.id,
						engineerId,
						artistId: artist.id,
						startsAt: start,
						endsAt: end,
						busyUntil,
						status: 'held',
						holdExpiresAt,
						project: req.project,
						notes: req.notes,
						quote,
						currency: quote.currency,
						total: quote.total,
						deposit: quote.deposit
					})
					.returning();
				if (gear.length) {
					await tx
						.insert(bookingGear)
						.values(gear.map((g) => ({ bookingId: row!.id, gearItemId: g.id, hireFee: g.hireFee, startsAt: start, busyUntil })));
				}
				return row!;
			});
			return { ok: true, booking: created, quote };
		} catch (e) {
			const { code, constraint } = pgError(e);
			// Deadlocks and serialization failures are retried, never shown (PostgreSQL manual, Appendix A).
			if (code === '40P01' || code === '40001') {
				await new Promise((r) => setTimeout(r, 5 + Math.random() * 20 * (attempt + 1)));
				continue;
			}
			if (code === '23505' && constraint?.includes('reference')) continue;
			if (code === '23P01') {
				if (constraint === 'booking_engineer_no_overlap') {
					lastTaken = 'engineer';
					continue; // another engineer may still be free
				}
				return conflict(constraint === 'booking_gear_no_overlap' ? 'gear' : 'room');
			}
			throw e;
		}
	}
	return conflict(lastTaken);
}

/** An engineer with no active booking overlapping the time, turnaround included. */
async function freeEngineer(start: Date, busyUntil: Date, now: Date): Promise<string | null> {
	const engineers = await db.select({ id: user.id }).from(user).where(eq(user.role, 'engineer')).orderBy(asc(user.createdAt));
	if (!engineers.length) return null;
	const busy = await db
		.select({ id: booking.engineerId })
		.from(booking)
		.where(
			and(
				inArray(
					booking.engineerId,
					engineers.map((e) => e.id)
				),
				stillActive(now),
				lt(booking.startsAt, busyUntil),
				gt(booking.busyUntil, start)
			)
		);
	const taken = new Set(busy.map((b) => b.id));
	return engineers.find((e) => !taken.has(e.id))?.id ?? null;
}

// ---------------------------------------------------------------------------------------------
// Reading bookings, scoped by role (OWASP ASVS 8.2.2): an artist sees their own only.

export function canSeeAll(actor: SessionUser): boolean {
	return actor.role === 'owner' || actor.role === 'engineer';
}

const summaryColumns = {
	id: booking.id,
	reference: booking.reference,
	status: booking.status,
	startsAt: booking.startsAt,
	endsAt: booking.endsAt,
	holdExpiresAt: booking.holdExpiresAt,
	currency: booking.currency,
	total: booking.total,
	deposit: booking.deposit,
	project: booking.project,
	roomSlug: room.slug,
	roomName: room.name,
	artistId: booking.artistId,
	artistName: user.name,
	engineerId: booking.engineerId,
	createdAt: booking.createdAt
};

export async function listForViewer(actor: SessionUser, filter: { status?: BookingStatus[]; from?: Date; to?: Date } = {}) {
	const conditions = [];
	if (!canSeeAll(actor)) conditions.push(eq(booking.artistId, actor.id));
	if (filter.status?.length) conditions.push(inArray(booking.status, filter.status));
	if (filter.from) conditions.push(gte(booking.endsAt, filter.from));
	if (filter.to) conditions.push(lt(booking.startsAt, filter.to));
	return db
		.select(summaryColumns)
		.from(booking)
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(conditions.length ? and(...conditions) : undefined)
		.orderBy(desc(booking.startsAt))
		.limit(500);
}

/**
 * Whether a booking appears in the accounts: it has a document, or money paid or on its way. The accountant reads
 * those bookings (the references in the month lead to them), and no others.
 */
async function inTheAccounts(bookingId: string): Promise<boolean> {
	const [documents, payments] = await Promise.all([
		db.select({ id: invoice.id }).from(invoice).where(eq(invoice.bookingId, bookingId)).limit(1),
		db
			.select({ id: payment.id })
			.from(payment)
			.where(and(eq(payment.bookingId, bookingId), inArray(payment.status, ['paid', 'processing'])))
			.limit(1)
	]);
	return documents.length > 0 || payments.length > 0;
}

/**
 * One booking, or undefined when it does not exist or is not the viewer's to see (a 404 either
 * way): the artist's own, any for the owner and engineers, and for the accountant those in the accounts.
 */
export async function getForViewer(actor: SessionUser, id: string) {
	if (!z.uuid().safeParse(id).success) return undefined;
	const [row] = await db
		.select({
			...summaryColumns,
			quote: booking.quote,
			notes: booking.notes,
			actualEndsAt: booking.actualEndsAt,
			cancelledAt: booking.cancelledAt,
			cancelReason: booking.cancelReason,
			sequence: booking.sequence
		})
		.from(booking)
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(eq(booking.id, id));
	if (!row) return undefined;
	if (!canSeeAll(actor) && row.artistId !== actor.id && !(actor.role === 'accountant' && (await inTheAccounts(id)))) {
		return undefined;
	}
	const [gear, engineer] = await Promise.all([
		db
			.select({
				id: gearItem.id,
				name: gearItem.name,
				category: gearItem.category,
				hireFee: bookingGear.hireFee,
				caution: gearItem.caution
			})
			.from(bookingGear)
			.innerJoin(gearItem, eq(gearItem.id, bookingGear.gearItemId))
			.where(eq(bookingGear.bookingId, id)),
		row.engineerId ? db.select({ name: user.name }).from(user).where(eq(user.id, row.engineerId)) : Promise.resolve([])
	]);
	return { ...row, quote: row.quote as Quote, gear, engineerName: engineer[0]?.name ?? null };
}

export type BookingDetail = NonNullable<Awaited<ReturnType<typeof getForViewer>>>;

/** The booking as the JSON API shows it. */
export function bookingJson(b: Awaited<ReturnType<typeof listForViewer>>[number] | BookingDetail, timeZone: string) {
	return {
		id: b.id,
		reference: b.reference,
		status: b.status,
		start: isoInZone(b.startsAt, timeZone),
		end: isoInZone(b.endsAt, timeZone),
		holdExpiresAt: b.holdExpiresAt ? isoInZone(b.holdExpiresAt, timeZone) : null,
		room: { slug: b.roomSlug, name: b.roomName },
		artist: { name: b.artistName },
		project: b.project,
		currency: b.currency,
		total: b.total,
		deposit: b.deposit,
		...('quote' in b
			? {
					quote: publicQuote(b.quote),
					gear: b.gear.map((g) => ({ id: g.id, name: g.name, hireFee: g.hireFee })),
					engineer: b.engineerName
				}
			: {})
	};
}

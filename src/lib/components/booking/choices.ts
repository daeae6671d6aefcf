// The choices of a booking in progress, as the calendar, the booking page and its query string
// share them. Pure and framework-free: the same helpers run in the load and in the browser.
// Times are local wall times in the studio's zone ('YYYY-MM-DD', 'HH:MM'); the server turns them
// into instants (parseBookingInstant), refusing a wall time that the clocks skip.

import { wallClock } from '$lib/domain/time';
import { isStudioDate } from '$lib/schemas/input';
import { studioPath } from '$lib/studio-paths';

export const BOOKING_KINDS = ['hourly', 'half', 'full'] as const;
export type BookingKind = (typeof BOOKING_KINDS)[number];

export interface BookingChoices {
	room: string;
	kind: BookingKind;
	date: string;
	start: string;
	/** Length of an hourly booking, in hours (half-hour steps); ignored for blocks. */
	hours: number;
	engineer: boolean;
	gear: string[];
	project: string;
	notes?: string;
}

export interface BlockLengths {
	halfDayMinutes: number;
	fullDayMinutes: number;
}

export const YMD_RE = /^\d{4}-\d{2}-\d{2}$/;

/**
 * A real calendar date written 'YYYY-MM-DD' (ISO 8601, proleptic Gregorian) within the years the
 * studio's calendar covers: '2027-02-31' is not one, though Date.parse quietly rolls it over to
 * 3 March, and neither is 0001-01-01.
 */
export function isCalendarDate(s: string): boolean {
	return isStudioDate(s);
}
export const HHMM_RE = /^([01]\d|2[0-3]):[0-5]\d$/;

/** Booked length in minutes: a block's length from the studio settings, or the chosen hours. */
export function lengthMinutes(kind: BookingKind, hours: number, lengths: BlockLengths): number {
	if (kind === 'half') return lengths.halfDayMinutes;
	if (kind === 'full') return lengths.fullDayMinutes;
	return Math.round(hours * 60);
}

/** The query string that brings the booking page back with these choices (notes stay out). */
export function choicesQuery(c: Partial<BookingChoices>): string {
	const q = new URLSearchParams();
	if (c.room) q.set('room', c.room);
	if (c.date) q.set('date', c.date);
	if (c.start) q.set('start', c.start);
	if (c.kind) q.set('kind', c.kind);
	if (c.kind === 'hourly' && c.hours) q.set('hours', String(c.hours));
	if (c.engineer !== undefined) q.set('engineer', c.engineer ? '1' : '0');
	for (const g of c.gear ?? []) q.append('gear', g);
	if (c.project) q.set('project', c.project);
	return q.toString();
}

/** The studio's booking page with these choices filled in. */
export function bookPath(studio: string, c: Partial<BookingChoices>): string {
	const q = choicesQuery(c);
	const page = studioPath(studio, 'book');
	return q ? `${page}?${q}` : page;
}

/** Reads the choices back from a query string; anything malformed is left out, never guessed. */
export function choicesFromQuery(q: URLSearchParams): Partial<BookingChoices> {
	const out: Partial<BookingChoices> = {};
	const room = q.get('room');
	if (room && /^[a-z0-9-]{1,80}$/.test(room)) out.room = room;
	const date = q.get('date');
	if (date && isCalendarDate(date)) out.date = date;
	const start = q.get('start');
	if (start && HHMM_RE.test(start)) out.start = start;
	const kind = q.get('kind');
	if (kind && (BOOKING_KINDS as readonly string[]).includes(kind)) out.kind = kind as BookingKind;
	const hours = Number(q.get('hours'));
	if (q.has('hours') && Number.isFinite(hours) && hours > 0 && hours <= 24 && Number.isInteger(hours * 2)) {
		out.hours = hours;
		out.kind ??= 'hourly';
	}
	const engineer = q.get('engineer');
	if (engineer === '1' || engineer === '0') out.engineer = engineer === '1';
	const gear = q.getAll('gear').filter((g) => /^[0-9a-f-]{36}$/i.test(g));
	if (gear.length) out.gear = [...new Set(gear)].slice(0, 20);
	const project = q.get('project');
	if (project) out.project = project.slice(0, 200);
	return out;
}

// ---------------------------------------------------------------------------------------------
// Picking starts from the studio's open windows.

export interface Window {
	start: string;
	end: string;
}

export interface StartOption {
	date: string;
	time: string;
	/** The start as an ISO instant, for ordering and distance. */
	at: number;
}

/**
 * Every start on the increment grid at which a booking of `minutes` fits wholly inside one of
 * the open windows (as GET /api/studios/STUDIO/availability returns them), in time order. The windows are
 * already snapped to the studio's grid, so stepping by the increment from a window's start stays
 * on it (the studio's zone has whole-hour offsets in the demo; a half-hour zone still steps from
 * an on-grid start).
 */
export function startsInWindows(
	open: readonly Window[],
	minutes: number,
	incrementMinutes: number,
	timeZone: string
): StartOption[] {
	const out: StartOption[] = [];
	if (minutes <= 0 || incrementMinutes <= 0) return out;
	const length = minutes * 60_000;
	const step = incrementMinutes * 60_000;
	for (const w of open) {
		const end = Date.parse(w.end);
		for (let s = Date.parse(w.start); s + length <= end; s += step) {
			out.push({ ...wallClock(s, timeZone), at: s });
		}
	}
	return out;
}

// A booking request, read once: the JSON API's body is parsed here, the /book form's choices
// (already checked by superforms against the same field rules, src/lib/schemas/booking.ts) become
// the same request through requestFromChoices (passed on from the schemas, where the page asks
// for its live quote with it too), and the times they name become instants here, through the time engine
// ($lib/domain/time), which the rest of src/lib/server/bookings reaches only through this file.
import type { z } from 'zod';
import { bookingRequestSchema, requestFromChoices, type BookingRequest } from '$lib/schemas/booking';
import { addDays, daysFrom, isoInZone, localDateOf, parseBookingInstant, TimeInputError } from '$lib/domain/time';

export { bookingRequestSchema, requestFromChoices, type BookingRequest };

export type FieldErrors = Record<string, string[]>;

/**
 * A zod error as field messages, by the first part of each issue's path ('_' for the whole); the
 * billing object's fields by their own names under it ('billing.vatId').
 */
export function zodFieldErrors(error: z.ZodError): FieldErrors {
	const fields: FieldErrors = {};
	for (const issue of error.issues) {
		const [first, second] = issue.path;
		const key =
			first === undefined ? '_' : first === 'billing' && second !== undefined ? `billing.${String(second)}` : String(first);
		(fields[key] ??= []).push(issue.message);
	}
	return fields;
}

/** A request that needs another look: field messages, and a 422. */
export type InvalidRequest = { ok: false; status: 422; fields: FieldErrors; message: string };

export function invalidRequest(fields: FieldErrors, message = 'Some details need another look.'): InvalidRequest {
	return { ok: false, status: 422, fields, message };
}

/** The JSON API's body, parsed once. */
export function parseBookingRequest(input: unknown): { ok: true; request: BookingRequest } | InvalidRequest {
	const parsed = bookingRequestSchema.safeParse(input);
	return parsed.success ? { ok: true, request: parsed.data } : invalidRequest(zodFieldErrors(parsed.error));
}

// ---------------------------------------------------------------------------------------------
// Time: the one place the bookings code reads and shifts times.

const MINUTE = 60_000;
const DAY = 86_400_000;

/** The request's start and end as instants in the studio's zone, with a message for each that is not one. */
export function requestInstants(req: Pick<BookingRequest, 'start' | 'end'>, timeZone: string) {
	const fields: FieldErrors = {};
	const times: { start?: Date; end?: Date } = {};
	for (const key of ['start', 'end'] as const) {
		try {
			times[key] = parseBookingInstant(req[key], timeZone);
		} catch (e) {
			if (e instanceof TimeInputError) fields[key] = [e.message];
			else throw e;
		}
	}
	return { ...times, fields };
}

/** What a booking keeps its room, engineer and gear for: its end plus the studio's turnaround. */
export function busyUntil(end: Date | number, turnaroundMinutes: number): Date {
	return new Date(new Date(end).getTime() + turnaroundMinutes * MINUTE);
}

/** Whole minutes from start to end. */
export function minutesBetween(start: Date, end: Date): number {
	return Math.round((end.getTime() - start.getTime()) / MINUTE);
}

/** The instant `days` whole 24-hour days away (for search windows, never for calendar days). */
export function shiftDays(instant: Date | number, days: number): Date {
	return new Date(new Date(instant).getTime() + days * DAY);
}

/** The local dates a booking's time touches: its first day and its last (an end at midnight is the day before). */
export function localDays(start: Date, end: Date, timeZone: string): { first: string; last: string } {
	return { first: localDateOf(start, timeZone), last: localDateOf(new Date(end.getTime() - 1), timeZone) };
}

/**
 * A generous window of instants around local dates: a local day starts at most 14 hours before
 * and ends at most 26 hours after its UTC midnight, so 36 h before and 60 h after cover any zone.
 */
export function instantsAround(from: string, to: string): { start: Date; end: Date } {
	return { start: new Date(Date.parse(from) - 36 * 3600_000), end: new Date(Date.parse(to) + 60 * 3600_000) };
}

export { addDays, daysFrom, isoInZone, localDateOf };

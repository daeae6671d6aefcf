// What a booking request says, as the /book form and the JSON API (POST /api/studios/STUDIO/quote,
// POST /api/bookings) both take it: one set of field rules and messages, run in the browser and
// on the server. Shapes only: whether the time is free, long enough and open is the server's to
// say (src/lib/server/bookings), because only it knows the calendar.
import { z } from 'zod';
import {
	BOOKING_KINDS,
	HHMM_RE,
	YMD_RE,
	isCalendarDate,
	lengthMinutes,
	type BlockLengths,
	type BookingChoices
} from '$lib/components/booking/choices';
import { addWallMinutes } from '$lib/domain/time';
import { lineText, multilineText } from './input';

/** The fields the form and the API share. */
const shared = {
	room: lineText({ error: 'Choose a room.' }).trim().min(1, { error: 'Choose a room.' }).max(80),
	engineer: z.boolean({ error: 'engineer is true or false.' }).default(false),
	gear: z
		.array(z.uuid({ error: 'Unknown gear.' }), { error: 'gear is a list of gear ids.' })
		.max(20, { error: 'Choose at most 20 pieces of gear.' })
		.default([]),
	project: lineText().trim().max(200, { error: 'Keep the project name under 200 characters.' }).default(''),
	notes: multilineText().trim().max(4000, { error: 'Keep notes under 4000 characters.' }).default('')
};

/** The JSON API's body: start and end as studio wall times or instants with an offset. */
export const bookingRequestSchema = z.object({
	...shared,
	start: lineText({ error: 'Choose a start time.' }).trim().min(1, { error: 'Choose a start time.' }).max(40),
	end: lineText({ error: 'Choose an end time.' }).trim().min(1, { error: 'Choose an end time.' }).max(40)
});
export type BookingRequest = z.infer<typeof bookingRequestSchema>;

/** The /book form: a date, a start and a length (a block or hours) instead of two times. */
export const bookFormSchema = z.object({
	...shared,
	kind: z.enum(BOOKING_KINDS, { error: 'Choose hourly, a half day or a full day.' }).default('half'),
	date: z
		.string({ error: 'Choose a date.' })
		.regex(YMD_RE, { error: 'Choose a date.' })
		.refine(isCalendarDate, { error: 'That date is not on the calendar: choose another.' }),
	start: z.string({ error: 'Choose a start time.' }).regex(HHMM_RE, { error: 'Choose a start time.' }),
	hours: z
		.number({ error: 'Choose how many hours.' })
		.min(0.5, { error: 'Choose how many hours.' })
		.max(24, { error: 'Book at most 24 hours at a time.' })
		.multipleOf(0.5, { error: 'Book in half-hour steps.' })
		.default(2)
});
export type BookForm = z.infer<typeof bookFormSchema>;

/**
 * The API's request for the form's choices: the start as the studio's wall time, the end that
 * wall time plus the booked length. The page asks POST /api/studios/STUDIO/quote with it as the choices change,
 * and the form's action books it, so both price the same thing.
 */
export function requestFromChoices(c: BookingChoices, lengths: BlockLengths): BookingRequest {
	const minutes = lengthMinutes(c.kind, c.hours, lengths);
	// A date or start that is not one (a form sent back with errors) gives no times at all.
	const when = isCalendarDate(c.date) && HHMM_RE.test(c.start);
	return {
		room: c.room,
		start: when ? `${c.date}T${c.start}` : '',
		end: when && minutes > 0 ? addWallMinutes(c.date, c.start, minutes) : '',
		engineer: c.engineer,
		gear: c.gear,
		project: c.project ?? '',
		notes: c.notes ?? ''
	};
}

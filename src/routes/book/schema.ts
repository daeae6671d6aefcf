// The booking form: one schema for the browser's checks and the action's (superforms with zod 4).
// It checks shapes only; whether the time is free, long enough and open is the server's to say
// (priceRequest and createHold), because only it knows the calendar.
import { z } from 'zod';
import { BOOKING_KINDS, HHMM_RE, YMD_RE, isCalendarDate } from '$lib/components/booking/choices';
import { lineText, multilineText } from '$lib/schemas/input';

export const bookFormSchema = z.object({
	room: lineText({ error: 'Choose a room.' }).trim().min(1, { error: 'Choose a room.' }).max(80),
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
		.default(2),
	engineer: z.boolean().default(false),
	gear: z
		.array(z.uuid({ error: 'Unknown gear.' }))
		.max(20, { error: 'Choose at most 20 pieces of gear.' })
		.default([]),
	project: lineText().trim().max(200, { error: 'Keep the project name under 200 characters.' }).default(''),
	notes: multilineText().trim().max(4000, { error: 'Keep notes under 4000 characters.' }).default('')
});

export type BookForm = z.infer<typeof bookFormSchema>;

/** What the action says besides field errors. */
export type BookMessage =
	{ kind: 'error'; text: string } | { kind: 'taken'; text: string; nearestStarts: { date: string; time: string }[] };

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
import { BUYER_KINDS, billingFields, billingSchema, checkVatIdOf, normaliseBilling } from '$lib/domain/billing';
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

/**
 * The JSON API's body: start and end as studio wall times or instants with an offset, and
 * optionally whom to bill (absent or null: the artist's name alone).
 */
export const bookingRequestSchema = z.object({
	...shared,
	start: lineText({ error: 'Choose a start time.' }).trim().min(1, { error: 'Choose a start time.' }).max(40),
	end: lineText({ error: 'Choose an end time.' }).trim().min(1, { error: 'Choose an end time.' }).max(40),
	// Normalised once here (the VAT ID's form, none for a person), so pricing and the hold keep the same details.
	billing: billingSchema.transform(normaliseBilling).nullish()
});
export type BookingRequest = z.infer<typeof bookingRequestSchema>;

/** Whom the booking is billed to: the saved details, details typed for it, or the artist's name alone. */
export const BILL_TO = ['name', 'saved', 'other'] as const;
export type BillTo = (typeof BILL_TO)[number];

/**
 * The "other details" of the /book form as flat fields (the form works without the page's script,
 * so no nested object), checked by the billing rules only when they are the ones chosen.
 */
const billFields = {
	billTo: z.enum(BILL_TO, { error: 'Choose whom to bill.' }).default('name'),
	billKind: z.enum(BUYER_KINDS, { error: 'Choose a person or an organisation.' }).default('person'),
	billName: z.string().default(''),
	billStreet: z.string().default(''),
	billPostalCode: z.string().default(''),
	billCity: z.string().default(''),
	billCountry: z.string().default(''),
	billVatId: z.string().default(''),
	saveBilling: z.boolean().default(false)
};
/** Each billing detail's field on the booking form (the kind is `billKind`). */
export const BILL_FIELD = {
	name: 'billName',
	street: 'billStreet',
	postalCode: 'billPostalCode',
	city: 'billCity',
	country: 'billCountry',
	vatId: 'billVatId'
} as const;
type BillFields = { [K in keyof typeof billFields]: z.infer<(typeof billFields)[K]> };

/** The form's other details in the billing rules' names. */
export function typedBilling(f: BillFields) {
	return {
		kind: f.billKind,
		name: f.billName,
		street: f.billStreet,
		postalCode: f.billPostalCode,
		city: f.billCity,
		country: f.billCountry,
		vatId: f.billKind === 'organisation' ? f.billVatId : ''
	};
}

/** The /book form: a date, a start and a length (a block or hours) instead of two times. */
const bookFormObject = z.object({
	...shared,
	...billFields,
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
export const bookFormSchema = bookFormObject.superRefine((f, ctx) => {
	if (f.billTo !== 'other') return;
	// The billing rules, each message on the form's own field.
	const typed = typedBilling(f);
	for (const key of Object.keys(BILL_FIELD) as (keyof typeof BILL_FIELD)[]) {
		const checked = billingFields[key].safeParse(typed[key]);
		for (const issue of checked.error?.issues ?? [])
			ctx.addIssue({ code: 'custom', path: [BILL_FIELD[key]], message: issue.message });
	}
	checkVatIdOf(typed, (message) => ctx.addIssue({ code: 'custom', path: ['billVatId'], message }));
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

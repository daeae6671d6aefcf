import { error, fail, redirect } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { listHireableGear } from '$lib/server/inventory';
import * as bookings from '$lib/server/bookings';
import { listRooms, publicRoom } from '$lib/server/studio';
import { pageStudio } from '$lib/server/storefront';
import { bookPath, choicesFromQuery, YMD_RE } from '$lib/components/booking/choices';
import { addDays, wallClock } from '$lib/domain/time';
import type { AvailabilityBody } from '$lib/components/calendar/availability';
import { mayBook } from '$lib/roles';
import { studioPath } from '$lib/studio-paths';
import { dateProblem } from '$lib/schemas/input';
import * as billing from '$lib/server/billing';
import { billingCountries, normaliseBilling, type BillingDetails } from '$lib/domain/billing';
import { bookFormSchema, typedBilling, type BookForm, type BookMessage } from './schema';
import type { Actions, PageServerLoad } from './$types';

/** The accountant reads the accounts only: no booking page, no holds (OWASP ASVS 8.2.1). */
function refuseNonBookers(locals: App.Locals) {
	if (locals.user && !mayBook(locals.user.role)) {
		error(403, { error: 'forbidden', message: 'Your role reads the accounts; it does not book sessions.' });
	}
}

export const load: PageServerLoad = async ({ url, locals, parent }) => {
	refuseNonBookers(locals);
	const { storefront } = await parent();
	const ctx = await bookings.pricingContext(storefront.id);
	const { studio, policy } = ctx;
	const [rows, gearRows] = await Promise.all([listRooms(studio.id), listHireableGear(studio.id)]);
	const rooms = rows.map((r) => ({ ...publicRoom(r, studio.currency), id: r.id }));
	const slugOf = new Map(rooms.map((r) => [r.id, r.slug]));

	const asked = choicesFromQuery(url.searchParams);
	const room = rooms.find((r) => r.slug === asked.room)?.slug ?? rooms[0]?.slug ?? '';
	const initial: Partial<BookForm> = {
		kind: 'half',
		hours: studio.minBookingMinutes / 60,
		engineer: false,
		...asked,
		room
	};
	const form = await superValidate<BookForm, BookMessage>(initial, zod4(bookFormSchema), { errors: false });
	// A date in the address that is not on the calendar (2027-02-31) is left out and said so.
	const askedDate = url.searchParams.get('date');
	if (askedDate && !asked.date) {
		const problem = dateProblem(askedDate);
		setError(
			form,
			'date',
			!YMD_RE.test(askedDate) || !problem
				? 'Choose a date such as 2027-03-28.'
				: problem.startsWith('There is no')
					? `${problem.slice(0, -1)}: choose another date.`
					: problem
		);
	}

	// The chosen day's open windows, so the starts that fit are there on the first paint; the page
	// asks GET /api/studios/STUDIO/availability again when the room or the day changes.
	let open: AvailabilityBody | null = null;
	if (room && form.data.date) {
		const result = await bookings.availability(ctx, { room, from: form.data.date, to: form.data.date });
		if (result.ok) open = result.body;
	}

	const today = wallClock(Date.now(), studio.timeZone).date;
	const saved = locals.user ? await billing.get(locals.user) : null;
	// Whom to bill: the saved details when there are some (a choice the artist can change).
	if (saved) form.data.billTo = 'saved';
	return {
		form,
		signedIn: !!locals.user,
		savedBilling: saved,
		countries: billingCountries(),
		rooms: rooms.map(({ id: _id, ...r }) => r),
		gear: gearRows.map(({ homeRoomId, ...g }) => ({ ...g, room: slugOf.get(homeRoomId!) ?? '' })),
		open,
		rules: {
			halfDayMinutes: studio.halfDayMinutes,
			fullDayMinutes: studio.fullDayMinutes,
			minBookingMinutes: studio.minBookingMinutes,
			incrementMinutes: studio.incrementMinutes,
			minNoticeHours: studio.minNoticeMinutes / 60,
			holdMinutes: studio.holdMinutes,
			depositPercent: studio.depositBp / 100,
			pricesIncludeVat: studio.pricesIncludeVat,
			// Hourly lengths offered: up to the longest opening of any day.
			maxMinutes: Math.max(studio.fullDayMinutes, ...policy.openingHours.map((h) => h.closeMinute - h.openMinute)),
			earliestDate: today,
			latestDate: addDays(today, studio.horizonDays),
			engineer: { hourly: studio.engineerHourly, halfDay: studio.engineerHalfDay, fullDay: studio.engineerFullDay }
		}
	};
};

/** Where each of the server's field names shows on this form. */
function formField(field: string, kind: BookForm['kind']): Exclude<keyof BookForm, 'gear'> | 'gear._errors' | null {
	switch (field) {
		case 'gear':
			return 'gear._errors';
		case 'room':
		case 'start':
		case 'project':
		case 'notes':
		case 'engineer':
			return field;
		// The end follows from the start and the length: its problems belong to the length.
		case 'end':
			return kind === 'hourly' ? 'hours' : 'kind';
		default:
			return null;
	}
}

export const actions: Actions = {
	default: async ({ request, locals, url, params, getClientAddress }) => {
		// Actions run before any load: the studio of the address is looked up (and hidden) here too.
		const { studio: found, slug } = await pageStudio(params.studio, locals);
		const form = await superValidate<BookForm, BookMessage>(request, zod4(bookFormSchema));
		// Signed out (a session that ended while choosing): keep every choice through sign-in.
		if (!locals.user) {
			// The choices ride along only when sign-in can follow them back (at most 500 characters).
			const back = bookPath(slug, form.data);
			redirect(303, `/sign-in?next=${encodeURIComponent(back.length <= 500 ? back : studioPath(slug, 'book'))}`);
		}
		refuseNonBookers(locals);
		if (!form.valid) return fail(422, { form });

		// Whom to bill: the saved details, the details typed here (checked by the schema), or the name alone.
		let billTo: BillingDetails | null = null;
		if (form.data.billTo === 'saved') {
			billTo = await billing.get(locals.user);
			if (!billTo) {
				return message(
					form,
					{ kind: 'error', text: 'You have no billing details saved yet: enter them under “Other details”.' },
					{ status: 422 }
				);
			}
		} else if (form.data.billTo === 'other') {
			billTo = normaliseBilling(typedBilling(form.data));
		}

		const ctx = await bookings.pricingContext(found.id);
		const { studio } = ctx;
		const wish = { ...bookings.requestFromChoices(form.data, studio), billing: billTo };
		const outcome = await bookings.holdAndCheckout(locals.user, wish, {
			origin: url.origin,
			ip: getClientAddress(),
			ctx
		});
		if (!outcome.ok) {
			if (outcome.status === 409) {
				return message(
					form,
					{
						kind: 'taken',
						text:
							outcome.taken === 'room'
								? 'That time was just taken. These starts nearby still fit the same booking:'
								: outcome.nearestStarts.length
									? `${outcome.message} These starts nearby suit the same booking:`
									: outcome.message,
						nearestStarts: outcome.nearestStarts.map((iso) => wallClock(iso, studio.timeZone))
					},
					{ status: 409 }
				);
			}
			const general: string[] = [];
			for (const [field, messages] of Object.entries(outcome.fields)) {
				const target = formField(field, form.data.kind);
				if (target) setError(form, target, messages);
				else general.push(...messages);
			}
			return message(form, { kind: 'error', text: general.join(' ') || outcome.message }, { status: 422 });
		}

		if (billTo && form.data.billTo === 'other' && form.data.saveBilling) await billing.save(locals.user, billTo);
		redirect(303, outcome.checkoutUrl ?? `/bookings/${outcome.booking.id}`);
	}
};

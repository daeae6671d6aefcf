import { fail, redirect } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireRole } from '$lib/server/guard';
import { staffActor } from '$lib/server/actor';
import { listRooms, staffStudio } from '$lib/server/studio';
import * as settings from '$lib/server/settings';
import * as setup from '$lib/server/studio-setup';
import * as payouts from '$lib/server/payouts';
import { readFormData, formText } from '$lib/server/api';
import { countryChoices, countryProblem } from '$lib/domain/studio-place';
import { hasPublicHolidayCalendar } from '$lib/domain/holidays';
import { isSetupStep, nextStep, SETUP_STEPS, type SetupStep } from '$lib/domain/setup';
import { policyValuesFrom, settingsFormFrom, settingsSchema, type SettingsForm } from '../settings/schema';
import { NEW_ROOM, roomFormFrom, roomSchema, type RoomForm } from '../rooms/schema';
import { roomAction } from '../rooms/room-action';
import { addressSchema, SECTION_FIELDS, STEP_SECTIONS, type AddressForm } from './schema';
import type { Actions, PageServerLoad } from './$types';

type Note = { kind: 'saved' | 'error'; text: string };
type Step = SetupStep | 'review';

function stepOf(text: string | null, done: readonly string[]): Step {
	if (text === 'review' || (text && isSetupStep(text))) return text;
	return nextStep(done) ?? 'review';
}

function after(step: SetupStep): Step {
	return SETUP_STEPS[SETUP_STEPS.indexOf(step) + 1] ?? 'review';
}

export const load: PageServerLoad = async ({ locals, url }) => {
	requireRole(locals, 'owner');
	const studio = await staffStudio(locals);
	const state = await setup.setupState(studio.id);
	const step = stepOf(url.searchParams.get('step'), state.done);
	const currency = studio.currency;
	const blocks = { halfDayMinutes: studio.halfDayMinutes, fullDayMinutes: studio.fullDayMinutes };
	const rooms = await listRooms(studio.id, { includeInactive: true });
	const [address, policy, roomForms, newRoom, payout] = await Promise.all([
		superValidate<AddressForm, Note>(
			{ street: studio.street, postalCode: studio.postalCode, city: studio.city, country: studio.country, vatId: studio.vatId },
			zod4(addressSchema),
			{ errors: false }
		),
		superValidate<SettingsForm, Note>(settingsFormFrom(studio, currency), zod4(settingsSchema(currency, blocks)), {
			errors: false
		}),
		Promise.all(
			rooms.map((r) =>
				superValidate<RoomForm, Note>(roomFormFrom(r, currency), zod4(roomSchema(currency, blocks)), {
					id: `room-${r.id}`,
					errors: false
				})
			)
		),
		superValidate<RoomForm, Note>({ ...NEW_ROOM }, zod4(roomSchema(currency, blocks)), { id: 'room-new', errors: false }),
		payouts.payoutState(studio.id)
	]);
	return {
		step,
		done: state.done,
		missing: state.missing,
		published: state.published,
		slug: locals.studio!.slug,
		currency,
		blocks,
		halfDayHours: studio.halfDayMinutes / 60,
		fullDayHours: studio.fullDayMinutes / 60,
		holidaysKnown: hasPublicHolidayCalendar(studio.country),
		countries: countryChoices().map(({ code, name }) => ({ code, name })),
		address,
		policy,
		rooms: rooms.map((r) => ({ id: r.id, slug: r.slug, name: r.name, active: r.active, hourly: r.hourly })),
		roomForms,
		newRoom,
		payout,
		summary: {
			street: studio.street,
			postalCode: studio.postalCode,
			city: studio.city,
			country: studio.country,
			vatId: studio.vatId,
			referencePrefix: studio.referencePrefix,
			timeZone: studio.timeZone
		}
	};
};

export const actions: Actions = {
	address: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const form = await superValidate<AddressForm, Note>(request, zod4(addressSchema));
		if (form.valid) {
			const problem = countryProblem(form.data.country);
			if (problem) return setError(form, 'country', problem, { status: 422 });
		}
		if (!form.valid) return message(form, { kind: 'error', text: 'Not saved: check the marked fields.' }, { status: 422 });
		const actor = staffActor(locals, getClientAddress());
		await setup.saveAddress(actor, { ...form.data, vatId: form.data.vatId.toUpperCase() });
		await setup.markDone(actor, 'address');
		redirect(303, `/studio/setup?step=${after('address')}`);
	},

	/** A step of the Rates & policy form: its sections as posted, the rest as saved. */
	policy: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const fd = await readFormData(request);
		const step = formText(fd?.get('step'));
		const sections = isSetupStep(step) ? STEP_SECTIONS[step] : undefined;
		if (!fd || !isSetupStep(step) || !sections) return fail(400, { error: 'Unknown set-up step.' });
		const studio = await staffStudio(locals);
		const currency = studio.currency;
		const schema = zod4(
			settingsSchema(currency, { halfDayMinutes: studio.halfDayMinutes, fullDayMinutes: studio.fullDayMinutes })
		);
		// Read what the step posted with the form's own rules, then check it together with the rest as saved.
		const posted = await superValidate<SettingsForm, Note>(fd, schema);
		const merged: SettingsForm = settingsFormFrom(studio, currency);
		for (const key of sections.flatMap((s) => SECTION_FIELDS[s])) {
			(merged as Record<string, unknown>)[key] = posted.data[key];
		}
		const form = await superValidate<SettingsForm, Note>(merged, schema);
		if (!form.valid) return message(form, { kind: 'error', text: 'Not saved: check the marked fields.' }, { status: 422 });
		const actor = staffActor(locals, getClientAddress());
		await settings.updatePolicy(actor, policyValuesFrom(form.data, currency));
		await setup.markDone(actor, step);
		redirect(303, `/studio/setup?step=${after(step)}`);
	},

	room: (event) => roomAction(event),

	/** Leaves the rooms step once the studio has a bookable room. */
	rooms: async ({ locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const actor = staffActor(locals, getClientAddress());
		const state = await setup.setupState(actor.studioId);
		if (state.rooms === 0) return fail(422, { roomsMissing: true });
		await setup.markDone(actor, 'rooms');
		redirect(303, `/studio/setup?step=${after('rooms')}`);
	},

	publish: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		// The button says what it does; a post without its word changes nothing.
		const fd = await readFormData(request);
		if (formText(fd?.get('confirm')) !== 'publish') return fail(400, { missing: [] as string[] });
		const outcome = await setup.publish(staffActor(locals, getClientAddress()));
		if (!outcome.ok) return fail(422, { missing: outcome.missing });
		redirect(303, '/studio/setup?step=review');
	}
};

import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireRole } from '$lib/server/guard';
import { staffActor } from '$lib/server/actor';
import { staffStudio } from '$lib/server/studio';
import * as settings from '$lib/server/settings';
import * as setup from '$lib/server/studio-setup';
import { formText, readFormData } from '$lib/server/api';
import { blockRateFindings, surchargeFindings } from '$lib/schemas/rate-card';
import { isEuMemberState } from '$lib/domain/vat-treatment';
import { normaliseReminderHours, REMINDER_CHOICES } from '$lib/domain/messages';
import { toDecimalString } from '$lib/domain/money';
import {
	engineerRates,
	policyValuesFrom,
	settingsFormFrom,
	settingsSchema,
	surchargeFormFrom,
	surchargeSchema,
	surchargeValuesFrom,
	type SettingsForm,
	type SurchargeForm
} from './schema';
import type { Actions, PageServerLoad } from './$types';

type Saved = { kind: 'saved' | 'error'; text: string };

const NEW_SURCHARGE = 'surcharge-new';
/** The longest directions or load-in note the reminders carry. */
const MAX_NOTE_CHARS = 2000;
const NEW_SURCHARGE_VALUES: SurchargeForm = {
	id: '',
	label: '',
	kind: 'window',
	percent: '',
	weekdays: [],
	from: '18:00',
	to: '24:00',
	active: true
};

function surchargeForm(row: settings.SurchargeRow): SurchargeForm {
	return surchargeFormFrom({ ...row, kind: row.kind === 'holiday' ? 'holiday' : 'window' });
}

export const load: PageServerLoad = async ({ locals }) => {
	requireRole(locals, 'owner');
	const studio = await staffStudio(locals);
	const surcharges = await settings.listSurcharges(studio.id);
	const blocks = { halfDayMinutes: studio.halfDayMinutes, fullDayMinutes: studio.fullDayMinutes };
	const schema = zod4(settingsSchema(studio.currency, blocks));
	const [form, surchargeForms, newSurcharge] = await Promise.all([
		superValidate<SettingsForm, Saved>(settingsFormFrom(studio, studio.currency), schema, { errors: false }),
		Promise.all(
			surcharges.map((r) =>
				superValidate<SurchargeForm, Saved>(surchargeForm(r), zod4(surchargeSchema), { id: `surcharge-${r.id}`, errors: false })
			)
		),
		superValidate<SurchargeForm, Saved>({ ...NEW_SURCHARGE_VALUES }, zod4(surchargeSchema), { id: NEW_SURCHARGE, errors: false })
	]);
	return {
		form,
		surchargeForms,
		newSurcharge,
		currency: studio.currency,
		blocks,
		updatedAt: studio.updatedAt.toISOString(),
		published: studio.published,
		reminders: {
			hours: normaliseReminderHours(studio.reminderHours),
			directions: studio.directions,
			loadInNotes: studio.loadInNotes
		},
		movePolicy: {
			freeHours: studio.moveFreeHours,
			minHours: studio.moveMinHours,
			fee: toDecimalString(studio.moveFee, studio.currency)
		},
		reverseCharge: {
			on: studio.reverseChargeAbroad,
			// What keeps the setting from applying to this studio at all, in words; null when nothing does.
			blocked: !isEuMemberState(studio.country)
				? 'Your studio is not in an EU member state, so this does not apply to it.'
				: !studio.vatId.trim()
					? 'Your studio has no VAT ID yet: add it in the set-up’s address step first.'
					: null
		}
	};
};

export const actions: Actions = {
	save: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const { currency, halfDayMinutes, fullDayMinutes } = await staffStudio(locals);
		const form = await superValidate<SettingsForm, Saved>(
			request,
			zod4(settingsSchema(currency, { halfDayMinutes, fullDayMinutes }))
		);
		if (!form.valid) {
			return message(form, { kind: 'error', text: 'Nothing was saved: some values need another look.' }, { status: 422 });
		}
		const changed = await settings.updatePolicy(staffActor(locals, getClientAddress()), policyValuesFrom(form.data, currency));
		const odd = blockRateFindings(engineerRates(form.data), { halfDayMinutes, fullDayMinutes }, currency).length > 0;
		return message(form, {
			kind: 'saved',
			text:
				(changed.length ? 'Saved. New quotes and bookings use these rates and rules from now on.' : 'Nothing had changed.') +
				(odd ? ' Some engineer rates look odd: see the notes beside them.' : '')
		});
	},

	surcharge: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const form = await superValidate<SurchargeForm, Saved>(request, zod4(surchargeSchema));
		if (!form.valid) return message(form, { kind: 'error', text: 'Not saved: check the marked fields.' }, { status: 422 });
		const actor = staffActor(locals, getClientAddress());
		const odd = surchargeFindings(form.data).length ? ' It looks odd: see the note beside it.' : '';
		if (form.data.id) {
			const found = await settings.updateSurcharge(actor, form.data.id, surchargeValuesFrom(form.data));
			if (!found) return fail(404, { form });
			return message(form, { kind: 'saved', text: `${form.data.label} saved.${odd}` });
		}
		await settings.addSurcharge(actor, surchargeValuesFrom(form.data));
		// The new rule shows in the list; the add form starts empty again.
		const label = form.data.label;
		form.data = { ...NEW_SURCHARGE_VALUES };
		return message(form, { kind: 'saved', text: `${label} added.${odd}` });
	},
	reverseCharge: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const fd = await readFormData(request);
		if (!fd) return fail(400, { reverseCharge: 'error' as const });
		const on = formText(fd.get('reverseChargeAbroad')) === 'on';
		const changed = await settings.setReverseChargeAbroad(staffActor(locals, getClientAddress()), on);
		return { reverseCharge: changed ? ('saved' as const) : ('unchanged' as const) };
	},

	// The reminder e-mails block: its own form and action, apart from the policy form.
	reminders: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const fd = await readFormData(request);
		if (!fd) return fail(400, { reminders: { ok: false as const, text: 'Nothing was saved.' } });
		const allowed = new Set(REMINDER_CHOICES.map((c) => c.hours));
		const picked = fd.getAll('reminderHours').map((v) => Number(formText(v)));
		const directions = formText(fd.get('directions')).trim();
		const loadInNotes = formText(fd.get('loadInNotes')).trim();
		if (picked.some((h) => !allowed.has(h))) {
			return fail(422, { reminders: { ok: false as const, text: 'Nothing was saved: choose reminder times from the list.' } });
		}
		if (directions.length > MAX_NOTE_CHARS || loadInNotes.length > MAX_NOTE_CHARS) {
			return fail(422, {
				reminders: { ok: false as const, text: `Nothing was saved: keep each note under ${MAX_NOTE_CHARS} characters.` }
			});
		}
		const changed = await settings.updateReminders(staffActor(locals, getClientAddress()), {
			reminderHours: normaliseReminderHours(picked),
			directions,
			loadInNotes
		});
		return {
			reminders: {
				ok: true as const,
				text: changed.length ? 'Saved. Reminders of upcoming sessions follow it from now on.' : 'Nothing had changed.'
			}
		};
	},

	movePolicy: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const { currency } = await staffStudio(locals);
		const fd = await readFormData(request);
		if (!fd) return fail(400, { movePolicy: { state: 'error' as const, fields: {} } });
		const typed = {
			freeHours: formText(fd.get('moveFreeHours')),
			minHours: formText(fd.get('moveMinHours')),
			fee: formText(fd.get('moveFee'))
		};
		const read = settings.readMovePolicy(typed, currency);
		if (!read.ok) return fail(422, { movePolicy: { state: 'error' as const, fields: read.fields, typed } });
		const changed = await settings.setMovePolicy(staffActor(locals, getClientAddress()), read.values);
		return { movePolicy: { state: changed ? ('saved' as const) : ('unchanged' as const), fields: {} as Record<string, string> } };
	},

	unpublish: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		// The button says what it does; a post without its word changes nothing.
		const fd = await readFormData(request);
		if (formText(fd?.get('confirm')) !== 'unpublish') return fail(400, { unpublished: false });
		await setup.unpublish(staffActor(locals, getClientAddress()));
		return { unpublished: true };
	}
};

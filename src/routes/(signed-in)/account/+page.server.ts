import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireUser } from '$lib/server/guard';
import * as billing from '$lib/server/billing';
import { billingCountries, billingSchema, type BillingForm } from '$lib/domain/billing';
import type { Actions, PageServerLoad } from './$types';

type Note = { kind: 'saved' | 'error'; text: string };

const EMPTY: BillingForm = { kind: 'person', name: '', street: '', postalCode: '', city: '', country: '', vatId: '' };

export const load: PageServerLoad = async ({ locals }) => {
	const me = requireUser(locals);
	const saved = await billing.get(me);
	const form = await superValidate<BillingForm, Note>(saved ?? { ...EMPTY, name: me.name }, zod4(billingSchema), {
		errors: false
	});
	return { form, hasSaved: saved !== null, countries: billingCountries() };
};

export const actions: Actions = {
	default: async ({ request, locals }) => {
		const me = requireUser(locals);
		const form = await superValidate<BillingForm, Note>(request, zod4(billingSchema));
		// Every field comes back as typed, so nothing is lost; each problem sits beside its field.
		if (!form.valid) return fail(422, { form });
		form.data = await billing.save(me, form.data);
		return message(form, { kind: 'saved', text: 'Saved. They are offered whenever you book.' });
	}
};

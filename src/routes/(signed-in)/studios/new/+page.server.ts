import { redirect } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireUser } from '$lib/server/guard';
import * as setup from '$lib/server/studio-setup';
import { newStudioSchema } from '$lib/schemas/new-studio';
import type { NewStudio } from '$lib/schemas/studio';
import { countryChoices, STRIPE_PRESENTMENT_CURRENCIES } from '$lib/domain/studio-place';
import type { Actions, PageServerLoad } from './$types';

type Note = { kind: 'error'; text: string };

const EMPTY: NewStudio = { name: '', slug: '', country: '', timeZone: '', currency: '' };

export const load: PageServerLoad = async ({ locals }) => {
	requireUser(locals);
	const form = await superValidate<NewStudio, Note>(EMPTY, zod4(newStudioSchema), { errors: false });
	return {
		form,
		countries: countryChoices(),
		currencies: [...STRIPE_PRESENTMENT_CURRENCIES].sort()
	};
};

export const actions: Actions = {
	create: async ({ request, locals, getClientAddress }) => {
		const user = requireUser(locals);
		const form = await superValidate<NewStudio, Note>(request, zod4(newStudioSchema));
		if (!form.valid) return message(form, { kind: 'error', text: 'Not created yet: check the marked fields.' }, { status: 422 });
		const outcome = await setup.createStudio(user, locals.session!.id, form.data, getClientAddress());
		if (!outcome.ok) return setError(form, 'slug', outcome.message, { status: 409 });
		redirect(303, '/studio/setup');
	}
};

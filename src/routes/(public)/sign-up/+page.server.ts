import { fail, redirect } from '@sveltejs/kit';
import { superValidate, message, setError } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { safeNext, signUpSchema } from '$lib/schemas/auth';
import { signUp } from '$lib/server/auth-actions';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const next = safeNext(url.searchParams.get('next'));
	if (locals.user) redirect(303, next ?? '/bookings');
	const form = await superValidate({ next: next ?? '' }, zod4(signUpSchema), { errors: false });
	return { form };
};

export const actions: Actions = {
	default: async ({ request, getClientAddress }) => {
		const form = await superValidate(request, zod4(signUpSchema));
		const password = form.data.password;
		// The password never travels back to the browser in the form data.
		form.data.password = '';
		if (!form.valid) return fail(400, { form });
		const outcome = await signUp({ name: form.data.name, email: form.data.email, password }, request.headers, getClientAddress());
		if (!outcome.ok) {
			if (outcome.field) return setError(form, outcome.field, outcome.message, { status: outcome.status });
			return message(form, outcome.message, { status: outcome.status });
		}
		redirect(303, safeNext(form.data.next) ?? '/bookings');
	}
};

import { fail, redirect } from '@sveltejs/kit';
import { superValidate, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { safeNext, signInSchema } from '$lib/schemas/auth';
import { signIn } from '$lib/server/auth-actions';
import { HOME_FOR_ROLE, isRole } from '$lib/roles';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const next = safeNext(url.searchParams.get('next'));
	if (locals.user) redirect(303, next ?? HOME_FOR_ROLE[locals.user.role]);
	const form = await superValidate({ next: next ?? '' }, zod4(signInSchema), { errors: false });
	return { form };
};

export const actions: Actions = {
	default: async ({ request, getClientAddress }) => {
		const form = await superValidate(request, zod4(signInSchema));
		if (!form.valid) return fail(400, { form: { ...form, data: { ...form.data, password: '' } } });
		const outcome = await signIn(form.data, request.headers, getClientAddress());
		if (!outcome.ok) {
			form.data.password = '';
			return message(form, outcome.message, { status: outcome.status });
		}
		const role = isRole(outcome.role) ? outcome.role : 'artist';
		redirect(303, safeNext(form.data.next) ?? HOME_FOR_ROLE[role]);
	}
};

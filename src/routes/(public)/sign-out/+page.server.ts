import { redirect } from '@sveltejs/kit';
import { auth } from '$lib/server/auth';
import { audit } from '$lib/server/audit';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => redirect(303, '/');

export const actions: Actions = {
	// Signing out ends the session on the server, not just in the browser (OWASP ASVS 7.4.1).
	default: async ({ request, locals, getClientAddress }) => {
		if (locals.user) {
			await auth.api.signOut({ headers: request.headers });
			await audit({ actorId: locals.user.id, action: 'auth.sign_out', ip: getClientAddress() });
		}
		redirect(303, '/');
	}
};

import { error, fail, redirect } from '@sveltejs/kit';
import * as invitations from '$lib/server/invitations';
import { auth } from '$lib/server/auth';
import { audit } from '$lib/server/audit';
import { requireUser } from '$lib/server/guard';
import { roleIn } from '$lib/server/team';
import { HOME_FOR_ROLE } from '$lib/roles';
import type { Actions, PageServerLoad } from './$types';

/**
 * An invitation's link: anyone holding it sees the studio and the role; the person it was sent to,
 * signed in with that address, accepts it.
 */
export const load: PageServerLoad = async ({ params, locals, url }) => {
	const inv = await invitations.view(params.id);
	if (!inv) error(404, { error: 'not_found', message: 'There is no such invitation. Check the link in the e-mail.' });
	const here = url.pathname;
	let standing: 'closed' | 'signed-out' | 'other-account' | 'member' | 'invited';
	if (inv.state !== 'open') standing = 'closed';
	else if (!locals.user) standing = 'signed-out';
	else if (locals.user.email.toLowerCase() !== inv.email.toLowerCase()) standing = 'other-account';
	else if (await roleIn(inv.studioId, locals.user.id)) standing = 'member';
	else standing = 'invited';
	return {
		invitation: {
			studioName: inv.studioName,
			role: inv.role,
			email: inv.email,
			expiresAt: inv.expiresAt.toISOString()
		},
		standing,
		closedMessage: inv.state === 'open' ? null : invitations.closedMessage(inv.state),
		signedInAs: locals.user?.email ?? null,
		next: encodeURIComponent(here)
	};
};

export const actions: Actions = {
	accept: async ({ params, locals, request, getClientAddress }) => {
		const me = requireUser(locals);
		const done = await invitations.accept(me, request.headers, params.id, getClientAddress());
		if (!done.ok) return fail(done.status, { error: done.message });
		redirect(303, HOME_FOR_ROLE[done.role]);
	},
	/** Signed in with another address: sign out, then sign in (or up) with the invited one and come back here. */
	switchAccount: async ({ params, locals, request, getClientAddress }) => {
		if (locals.user) {
			await auth.api.signOut({ headers: request.headers });
			await audit({ actorId: locals.user.id, action: 'auth.sign_out', ip: getClientAddress() });
		}
		redirect(303, `/sign-in?next=${encodeURIComponent(`/invitations/${params.id}`)}`);
	}
};

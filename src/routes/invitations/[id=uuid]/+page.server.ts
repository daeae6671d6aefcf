import { error, fail, redirect } from '@sveltejs/kit';
import * as invitations from '$lib/server/invitations';
import { requireUser } from '$lib/server/guard';
import { roleIn } from '$lib/server/team';
import { HOME_FOR_ROLE } from '$lib/roles';
import type { Actions, PageServerLoad } from './$types';

const OTHER_ACCOUNT = (email: string) =>
	`This invitation was sent to another e-mail address than ${email}. Sign out, then open the link again and sign in (or create an account) with the address it was sent to.`;

/**
 * An invitation's link: signed out, its holder sees the studio and the role and signs in or up;
 * the person it was sent to, signed in with that address, accepts it. Anyone signed in as somebody
 * else gets a 403 that names nothing of the studio.
 */
export const load: PageServerLoad = async ({ params, locals, url }) => {
	const inv = await invitations.view(params.id);
	if (!inv) error(404, { error: 'not_found', message: 'There is no such invitation. Check the link in the e-mail.' });
	const here = url.pathname;
	// Signed in as someone else: the link is not theirs, so it names nothing of the studio or of
	// the person invited (they sign out and open it again as the invited address).
	if (
		locals.user &&
		locals.user.email.toLowerCase() !== inv.email.toLowerCase() &&
		!(await roleIn(inv.studioId, locals.user.id))
	) {
		error(403, { error: 'forbidden', message: OTHER_ACCOUNT(locals.user.email) });
	}
	let standing: 'closed' | 'signed-out' | 'member' | 'invited';
	if (inv.state !== 'open') standing = 'closed';
	else if (!locals.user) standing = 'signed-out';
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
	}
};

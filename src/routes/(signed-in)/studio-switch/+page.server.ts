import { error, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { requireUser } from '$lib/server/guard';
import { readFormData } from '$lib/server/api';
import { setActiveStudio } from '$lib/server/team';
import { zoneFor } from '$lib/server/zones';
import { safeNext } from '$lib/schemas/auth';
import { HOME_FOR_ROLE } from '$lib/roles';
import { lineText } from '$lib/schemas/input';
import type { Actions, PageServerLoad } from './$types';

// Nothing to show: the switcher in the header posts here.
export const load: PageServerLoad = ({ locals }) => {
	redirect(303, locals.user ? HOME_FOR_ROLE[locals.user.role] : '/sign-in');
};

const switchSchema = z.object({ studio: lineText().min(1).max(64), back: z.string().max(500).optional() });

export const actions: Actions = {
	/** A person in several teams chooses the studio they work in: only one whose team they are in. */
	default: async ({ request, locals }) => {
		requireUser(locals);
		const form = await readFormData(request);
		const parsed = switchSchema.safeParse(form ? Object.fromEntries(form) : {});
		if (!parsed.success) error(400, { error: 'invalid', message: 'Choose one of your studios.' });
		const chosen = locals.memberships.find((m) => m.studioId === parsed.data.studio);
		if (!chosen || !locals.session) error(403, { error: 'forbidden', message: 'You are not in that studio’s team.' });
		await setActiveStudio(locals.session.id, chosen.studioId);
		// Back to the page they were on when their role in the new studio may open it, else that role's home.
		const back = safeNext(parsed.data.back);
		const zone = back ? zoneFor(new URL(back, 'http://x.invalid').pathname) : undefined;
		const fits = back && (!zone || zone.roles === 'signed-in' || zone.roles.includes(chosen.role));
		redirect(303, fits ? back : HOME_FOR_ROLE[chosen.role]);
	}
};

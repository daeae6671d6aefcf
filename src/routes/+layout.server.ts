import { error } from '@sveltejs/kit';
import { getStudio, StudioMissing } from '$lib/server/studio';
import { DATABASE_UNAVAILABLE, isDatabaseDown } from '$lib/server/db/health';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ locals }) => {
	// A staff member sees the studio they work in; everyone else, for now, the studio the app serves.
	const studio = await getStudio(locals.studio?.studioId).catch((e: unknown) => {
		if (isDatabaseDown(e)) error(503, { error: 'unavailable', message: DATABASE_UNAVAILABLE });
		// A platform with no studio yet still shows its front page and the set-up.
		if (e instanceof StudioMissing && !locals.studio) return null;
		throw e;
	});
	return {
		user: locals.user ? { name: locals.user.name, email: locals.user.email, role: locals.user.role } : null,
		studio: studio
			? { name: studio.name, timeZone: studio.timeZone, currency: studio.currency, locale: studio.locale }
			: { name: 'Slateroom', timeZone: 'UTC', currency: 'EUR', locale: 'en-GB' }
	};
};

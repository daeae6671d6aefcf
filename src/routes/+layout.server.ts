import { error } from '@sveltejs/kit';
import { getStudio } from '$lib/server/studio';
import { DATABASE_UNAVAILABLE, isDatabaseDown } from '$lib/server/db/health';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ locals }) => {
	// A staff member sees the studio they work in; everyone else, for now, the studio the app serves.
	const studio = await getStudio(locals.studio?.studioId).catch((e: unknown) => {
		if (isDatabaseDown(e)) error(503, { error: 'unavailable', message: DATABASE_UNAVAILABLE });
		throw e;
	});
	return {
		user: locals.user ? { name: locals.user.name, email: locals.user.email, role: locals.user.role } : null,
		studio: { name: studio.name, timeZone: studio.timeZone, currency: studio.currency, locale: studio.locale }
	};
};

import { error } from '@sveltejs/kit';
import { findStudio } from '$lib/server/studio';
import { DATABASE_UNAVAILABLE, isDatabaseDown } from '$lib/server/db/health';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ locals }) => {
	// A staff member sees the studio they work in; everyone else, for now, the studio the app serves.
	const studio = await findStudio(locals.studio?.studioId).catch((e: unknown) => {
		if (isDatabaseDown(e)) error(503, { error: 'unavailable', message: DATABASE_UNAVAILABLE });
		throw e;
	});
	return {
		user: locals.user ? { name: locals.user.name, email: locals.user.email, role: locals.user.role } : null,
		// The header's studio switcher, for someone in more than one team.
		teams:
			locals.memberships.length > 1 && locals.studio
				? { current: locals.studio.studioId, all: locals.memberships.map((m) => ({ id: m.studioId, name: m.name })) }
				: null,
		// With no studio set up yet (SEED_DEMO=0), the pages that need none (signing in and up, My
		// bookings) still serve, under the platform's name.
		studio: studio
			? { name: studio.name, timeZone: studio.timeZone, currency: studio.currency, locale: studio.locale }
			: { name: 'Slateroom', timeZone: 'UTC', currency: 'EUR', locale: 'en-GB' }
	};
};

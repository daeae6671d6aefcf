import { error } from '@sveltejs/kit';
import { findStudio } from '$lib/server/studio';
import { DATABASE_UNAVAILABLE, isDatabaseDown } from '$lib/server/db/health';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ locals }) => {
	// A staff member works in their studio; everyone else is on the platform's own pages, unless a
	// page (a storefront, a booking) gives its studio itself.
	const studio = locals.studio
		? await findStudio(locals.studio.studioId).catch((e: unknown) => {
				if (isDatabaseDown(e)) error(503, { error: 'unavailable', message: DATABASE_UNAVAILABLE });
				throw e;
			})
		: null;
	return {
		user: locals.user ? { name: locals.user.name, email: locals.user.email, role: locals.user.role } : null,
		// The header's studio switcher, for someone in more than one team.
		teams:
			locals.memberships.length > 1 && locals.studio
				? { current: locals.studio.studioId, all: locals.memberships.map((m) => ({ id: m.studioId, name: m.name })) }
				: null,
		atStudio: studio !== null,
		// Outside a studio, the platform's name (and UTC for the few times a platform page shows).
		studio: studio
			? { name: studio.name, timeZone: studio.timeZone, currency: studio.currency, locale: studio.locale }
			: { name: 'Slateroom', timeZone: 'UTC', currency: 'EUR', locale: 'en-GB' }
	};
};

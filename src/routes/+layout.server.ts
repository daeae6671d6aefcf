import { error } from '@sveltejs/kit';
import { getStudio } from '$lib/server/studio';
import { DATABASE_UNAVAILABLE, isDatabaseDown } from '$lib/server/db/health';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ locals }) => {
	const studio = await getStudio().catch((e: unknown) => {
		if (isDatabaseDown(e)) error(503, { error: 'unavailable', message: DATABASE_UNAVAILABLE });
		throw e;
	});
	return {
		user: locals.user ? { name: locals.user.name, email: locals.user.email, role: locals.user.role } : null,
		studio: { name: studio.name, timeZone: studio.timeZone, currency: studio.currency, locale: studio.locale }
	};
};

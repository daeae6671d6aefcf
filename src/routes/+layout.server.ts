import { getStudio } from '$lib/server/studio';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ locals }) => {
	const studio = await getStudio();
	return {
		user: locals.user ? { name: locals.user.name, email: locals.user.email, role: locals.user.role } : null,
		studio: { name: studio.name, timeZone: studio.timeZone, currency: studio.currency, locale: studio.locale }
	};
};

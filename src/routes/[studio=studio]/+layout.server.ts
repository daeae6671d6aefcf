// A studio's storefront (/SLUG and the pages under it): the studio its short name names, read once
// here. An unknown name, a reserved word and a studio not published yet (to anyone outside its
// team) are all the same 404.
import { pageStudio } from '$lib/server/storefront';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ params, locals }) => {
	const { studio, slug } = await pageStudio(params.studio, locals);
	return {
		studio: { name: studio.name, timeZone: studio.timeZone, currency: studio.currency, locale: studio.locale },
		// A studio takes bookings (and their deposits) only once its payment account can take charges.
		storefront: { id: studio.id, slug, published: studio.published, bookingsOpen: studio.chargesEnabled }
	};
};

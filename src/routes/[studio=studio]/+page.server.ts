import { getStudio, listRooms, publicRoom } from '$lib/server/studio';
import { countryChoice } from '$lib/domain/studio-place';
import { postalLines } from '$lib/domain/setup';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ parent }) => {
	const { storefront } = await parent();
	const [studio, rooms] = await Promise.all([getStudio(storefront.id), listRooms(storefront.id)]);
	return {
		about: {
			tagline: studio.tagline,
			description: studio.description,
			// The address as a letter carries it: street, postal code and city, then the country.
			addressLines: [...postalLines(studio), countryChoice(studio.country)?.name ?? studio.country],
			pricesIncludeVat: studio.pricesIncludeVat,
			vatRatePercent: studio.vatRateBp / 100,
			halfDayHours: studio.halfDayMinutes / 60,
			fullDayHours: studio.fullDayMinutes / 60,
			engineer: { hourly: studio.engineerHourly, halfDay: studio.engineerHalfDay, fullDay: studio.engineerFullDay }
		},
		rooms: rooms.map((r) => publicRoom(r, studio.currency))
	};
};

import { getStudio, listRooms, publicRoom } from '$lib/server/studio';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ parent }) => {
	const { storefront } = await parent();
	const [studio, rooms] = await Promise.all([getStudio(storefront.id), listRooms(storefront.id)]);
	return {
		about: {
			tagline: studio.tagline,
			description: studio.description,
			addressLines: studio.addressLines,
			pricesIncludeVat: studio.pricesIncludeVat,
			vatRatePercent: studio.vatRateBp / 100,
			halfDayHours: studio.halfDayMinutes / 60,
			fullDayHours: studio.fullDayMinutes / 60,
			engineer: { hourly: studio.engineerHourly, halfDay: studio.engineerHalfDay, fullDay: studio.engineerFullDay }
		},
		rooms: rooms.map((r) => publicRoom(r, studio.currency))
	};
};

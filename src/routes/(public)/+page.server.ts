import { getStudio, listRooms, publicRoom, slugOf } from '$lib/server/studio';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const studio = await getStudio();
	const [rooms, slug] = await Promise.all([listRooms(studio.id), slugOf(studio.id)]);
	return {
		slug,
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

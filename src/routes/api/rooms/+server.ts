import { json } from '@sveltejs/kit';
import { getStudio, listRooms, publicRoom } from '$lib/server/studio';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async () => {
	const studio = await getStudio();
	const rooms = await listRooms(studio.id);
	return json(
		{
			currency: studio.currency,
			pricesIncludeVat: studio.pricesIncludeVat,
			vatRatePercent: studio.vatRateBp / 100,
			halfDayHours: studio.halfDayMinutes / 60,
			fullDayHours: studio.fullDayMinutes / 60,
			rooms: rooms.map((r) => publicRoom(r, studio.currency))
		},
		{ headers: { 'cache-control': 'public, max-age=60' } }
	);
};

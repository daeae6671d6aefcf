import { json } from '@sveltejs/kit';
import { listRooms, publicRoom } from '$lib/server/studio';
import { apiStudio } from '$lib/server/storefront';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params, locals }) => {
	const found = await apiStudio(params.studio, locals);
	if (!found.ok) return found.response;
	const { studio } = found.at;
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
		// A studio not published yet is its team's alone: never kept by a shared cache.
		{ headers: { 'cache-control': studio.published ? 'public, max-age=60' : 'private, no-store' } }
	);
};

import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError } from '$lib/server/api';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ url }) => {
	const result = await bookings.availability({
		room: url.searchParams.get('room'),
		from: url.searchParams.get('from'),
		to: url.searchParams.get('to')
	});
	if (!result.ok) return apiError(422, 'invalid', 'Check the room and the dates.', { fields: result.fields });
	// Short public caching: free times change as people book, and never show who booked.
	return json(result.body, { headers: { 'cache-control': 'public, max-age=15, stale-while-revalidate=30' } });
};

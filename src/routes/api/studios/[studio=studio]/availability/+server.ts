import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError } from '$lib/server/api';
import { apiStudio } from '$lib/server/storefront';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params, locals, url }) => {
	const found = await apiStudio(params.studio, locals);
	if (!found.ok) return found.response;
	const ctx = await bookings.pricingContext(found.at.studio.id);
	const result = await bookings.availability(ctx, {
		room: url.searchParams.get('room'),
		from: url.searchParams.get('from'),
		to: url.searchParams.get('to')
	});
	if (!result.ok) return apiError(422, 'invalid', 'Check the room and the dates.', { fields: result.fields });
	// Short public caching: free times change as people book, and never show who booked. A studio
	// not published yet is its team's alone: never kept by a shared cache.
	const cache = ctx.studio.published ? 'public, max-age=15, stale-while-revalidate=30' : 'private, no-store';
	return json(result.body, { headers: { 'cache-control': cache } });
};

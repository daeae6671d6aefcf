import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError, readJson } from '$lib/server/api';
import { apiStudio } from '$lib/server/storefront';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ params, locals, request }) => {
	const found = await apiStudio(params.studio, locals);
	if (!found.ok) return found.response;
	const read = await readJson(request);
	if (!read.ok) return read.response;
	const priced = await bookings.quoteFor(await bookings.pricingContext(found.at.studio.id), read.body);
	if (!priced.ok) return apiError(422, 'invalid', priced.message, { fields: priced.fields });
	return json(bookings.publicQuote(priced.quote), { headers: { 'cache-control': 'no-store' } });
};

import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError, readJson } from '$lib/server/api';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ request }) => {
	const read = await readJson(request);
	if (!read.ok) return read.response;
	const priced = await bookings.quoteFor(read.body);
	if (!priced.ok) return apiError(422, 'invalid', priced.message, { fields: priced.fields });
	return json(bookings.publicQuote(priced.quote), { headers: { 'cache-control': 'no-store' } });
};

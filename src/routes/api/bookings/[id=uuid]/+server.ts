import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError } from '$lib/server/api';
import { moneyFigures } from '$lib/server/payments/recorded';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, params }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	const b = await bookings.getForViewer(locals.user, params.id);
	// Another artist's booking, or another studio's, is a 404, not a 403: its existence is not theirs to know.
	if (!b) return apiError(404, 'not_found', 'No such booking.');
	// `billing`: whom it is billed to (null: the artist's name alone), for all but its engineers.
	const billing = bookings.billedTo(b);
	// `money`: paid by card, recorded by hand, refunded, invoiced and still owed; `recordedPayments`: the entries.
	const money = await moneyFigures(b);
	return json({ ...bookings.bookingJson(b, b.studio), ...(billing === undefined ? {} : { billing }), ...money });
};

import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError, readJson } from '$lib/server/api';
import { getStudio } from '$lib/server/studio';
import { mayBook } from '$lib/roles';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	// The accountant reads bookings only through the accounts, one at a time.
	if (locals.user.role === 'accountant') return apiError(403, 'forbidden', 'Your role reads the accounts, not the booking list.');
	const [studio, rows] = await Promise.all([getStudio(), bookings.listForViewer(locals.user)]);
	return json({ bookings: rows.map((b) => bookings.bookingJson(b, studio.timeZone)) });
};

export const POST: RequestHandler = async ({ request, locals, url, getClientAddress }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in to book.');
	if (!mayBook(locals.user.role)) return apiError(403, 'forbidden', 'Your role reads the accounts; it does not book sessions.');
	const read = await readJson(request);
	if (!read.ok) return read.response;
	const parsed = bookings.parseBookingRequest(read.body);
	if (!parsed.ok) return apiError(422, 'invalid', parsed.message, { fields: parsed.fields });
	const outcome = await bookings.holdAndCheckout(locals.user, parsed.request, { origin: url.origin, ip: getClientAddress() });
	if (!outcome.ok) {
		if (outcome.status === 409) {
			return apiError(409, 'slot_taken', outcome.message, { taken: outcome.taken, nearestStarts: outcome.nearestStarts });
		}
		return apiError(422, 'invalid', outcome.message, { fields: outcome.fields });
	}
	const b = outcome.booking;
	return json(
		{
			id: b.id,
			reference: b.reference,
			status: b.status,
			holdExpiresAt: outcome.holdExpiresAt,
			checkoutUrl: outcome.checkoutUrl,
			quote: bookings.publicQuote(outcome.quote)
		},
		{ status: 201 }
	);
};

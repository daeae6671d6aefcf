import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError, readJson } from '$lib/server/api';
import { apiStudio } from '$lib/server/storefront';
import { mayBook } from '$lib/roles';
import { BOOKINGS_NOT_OPEN } from '$lib/server/payouts';
import type { RequestHandler } from './$types';

/** A hold at the studio of the address (its rooms and gear only), and the deposit's Checkout. */
export const POST: RequestHandler = async ({ params, request, locals, url, getClientAddress }) => {
	const found = await apiStudio(params.studio, locals);
	if (!found.ok) return found.response;
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in to book.');
	if (!mayBook(locals.user.role)) return apiError(403, 'forbidden', 'Your role reads the accounts; it does not book sessions.');
	// No deposit can be taken before the studio's payment account takes charges: no hold either.
	if (!found.at.studio.chargesEnabled) return apiError(409, 'bookings_not_open', BOOKINGS_NOT_OPEN);
	const read = await readJson(request);
	if (!read.ok) return read.response;
	const parsed = bookings.parseBookingRequest(read.body);
	if (!parsed.ok) return apiError(422, 'invalid', parsed.message, { fields: parsed.fields });
	const outcome = await bookings.holdAndCheckout(locals.user, parsed.request, {
		origin: url.origin,
		ip: getClientAddress(),
		ctx: await bookings.pricingContext(found.at.studio.id)
	});
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

import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError, readJson } from '$lib/server/api';
import { getStudio } from '$lib/server/studio';
import { mayBook } from '$lib/roles';
import { hasSlugShape, slugProblem } from '$lib/domain/studio-slug';
import type { RequestHandler } from './$types';

/**
 * Without `studio`: the caller's own bookings as an artist, at every studio, each with its studio.
 * With `?studio=SHORT-NAME`: that studio's bookings, for its owner and engineers (the accountant
 * reads bookings only through the accounts, 403); a studio whose team the caller is not in is a
 * 404 whether it exists or not.
 */
export const GET: RequestHandler = async ({ locals, url }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	const asked = url.searchParams.get('studio');
	if (asked === null) {
		const rows = await bookings.listOwn(locals.user);
		return json({
			bookings: rows.map((b) => bookings.bookingJson(b, { slug: b.studioSlug, name: b.studioName, timeZone: b.studioTimeZone }))
		});
	}
	const problem = hasSlugShape(asked) ? null : slugProblem(asked);
	if (problem) return apiError(422, 'invalid', 'studio is not a studio’s short name.', { fields: { studio: [problem] } });
	const membership = locals.memberships.find((m) => m.slug === asked);
	if (!membership) return apiError(404, 'not_found', 'No such studio in your teams.');
	if (membership.role === 'accountant') {
		return apiError(403, 'forbidden', 'Your role reads the accounts, not the booking list.');
	}
	const [place, rows] = await Promise.all([getStudio(membership.studioId), bookings.listInStudio(membership)]);
	const tag = { slug: membership.slug, name: place.name, timeZone: place.timeZone };
	return json({ bookings: rows.map((b) => bookings.bookingJson(b, tag)) });
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

import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError } from '$lib/server/api';
import { getStudio } from '$lib/server/studio';
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

import { json } from '@sveltejs/kit';
import { apiError, readJson } from '$lib/server/api';
import { zodFieldErrors } from '$lib/server/bookings';
import * as setup from '$lib/server/studio-setup';
import { newStudioSchema } from '$lib/schemas/new-studio';
import type { RequestHandler } from './$types';

/** The published studios, by name: what anyone may know of them. */
export const GET: RequestHandler = async () => {
	const studios = await setup.listPublished();
	return json({
		studios: studios.map(({ slug, name, country, currency, timeZone }) => ({ slug, name, country, currency, timeZone }))
	});
};

/** Anyone signed in creates a studio and becomes its owner; it stays unpublished until set up. */
export const POST: RequestHandler = async ({ request, locals, getClientAddress }) => {
	if (!locals.user || !locals.session) return apiError(401, 'unauthenticated', 'Please sign in to set up a studio.');
	const read = await readJson(request);
	if (!read.ok) return read.response;
	const parsed = newStudioSchema.safeParse(read.body);
	if (!parsed.success) {
		return apiError(422, 'invalid', 'Some details need another look.', { fields: zodFieldErrors(parsed.error) });
	}
	const outcome = await setup.createStudio(locals.user, locals.session.id, parsed.data, getClientAddress());
	if (!outcome.ok) return apiError(409, 'slug_taken', outcome.message, { fields: outcome.fields });
	const { slug, name, country, currency, timeZone } = outcome.studio;
	return json({ slug, name, country, currency, timeZone }, { status: 201, headers: { location: `/${slug}` } });
};

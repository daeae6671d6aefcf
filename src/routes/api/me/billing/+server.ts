import { json } from '@sveltejs/kit';
import * as billing from '$lib/server/billing';
import { apiError, readJson } from '$lib/server/api';
import { parseBilling } from '$lib/domain/billing';
import type { RequestHandler } from './$types';

const SIGN_IN = 'Please sign in to see your billing details.';

/** The caller's saved billing details: 200 with them, or 200 with null when none are saved yet. */
export const GET: RequestHandler = async ({ locals }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', SIGN_IN);
	return json(await billing.get(locals.user), { headers: { 'cache-control': 'no-store' } });
};

/** Saves the caller's billing details whole: 200 with them as kept, 422 with a message per field. */
export const PUT: RequestHandler = async ({ locals, request }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', SIGN_IN);
	const read = await readJson(request);
	if (!read.ok) return read.response;
	const parsed = parseBilling(read.body);
	if (!parsed.ok) return apiError(422, 'invalid', 'Some billing details need another look.', { fields: parsed.fields });
	return json(await billing.save(locals.user, parsed.details), { headers: { 'cache-control': 'no-store' } });
};

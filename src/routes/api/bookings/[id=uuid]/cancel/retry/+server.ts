// POST (the owner of the booking's studio): tries the booking's failed refunds again, each with a new Idempotency-Key.
import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { retryFailedRefunds } from '$lib/server/payments';
import { readInput, unauthenticated } from '$lib/server/payments/http';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ locals, params, request }) => {
	if (!locals.user) return unauthenticated();
	const read = await readInput(request);
	if (!read.ok) return read.response;
	const result = await retryFailedRefunds(locals.user, params.id);
	if (!result.ok) {
		return result.status === 404
			? apiError(404, 'not_found', 'No such booking.')
			: apiError(403, 'forbidden', 'Only the owner may retry a refund.');
	}
	return json({ retried: result.retried });
};

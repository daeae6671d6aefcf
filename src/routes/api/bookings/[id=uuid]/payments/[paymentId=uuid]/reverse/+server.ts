// POST (owner of the booking's studio): reverses a recorded payment, `{ reason }`. 201 with the
// reversal (a negative entry for the whole amount); 409 `already_reversed` the second time.
import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { reversePayment } from '$lib/server/payments/recorded';
import { readInput, unauthenticated } from '$lib/server/payments/http';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ locals, params, request }) => {
	if (!locals.user) return unauthenticated();
	const read = await readInput(request);
	if (!read.ok) return read.response;
	const outcome = await reversePayment(locals.user, params.id, params.paymentId, read.body);
	if (!outcome.ok)
		return apiError(outcome.status, outcome.code, outcome.message, outcome.fields ? { fields: outcome.fields } : {});
	return json({ ...outcome.entry, balanceOwed: outcome.owed }, { status: 201 });
};

// POST (owner, engineer): records when the session ended and the gear used, prices overtime,
// issues the final invoice and completes the booking. Body `{ actualEnd, gearUsed? }`.
import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { closeBooking } from '$lib/server/payments';
import { readInput, unauthenticated } from '$lib/server/payments/http';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ locals, params, request }) => {
	if (!locals.user) return unauthenticated();
	const read = await readInput(request, ['gearUsed']);
	if (!read.ok) return read.response;
	const outcome = await closeBooking(locals.user, params.id, read.body);
	if (!outcome.ok)
		return apiError(outcome.status, outcome.code, outcome.message, outcome.fields ? { fields: outcome.fields } : {});
	return json({
		id: params.id,
		status: 'completed',
		alreadyClosed: outcome.already,
		invoice: outcome.invoice,
		overtime: outcome.overtime
	});
};

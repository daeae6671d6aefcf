// POST (owner of the booking's studio): records a payment taken outside Checkout.
// Body `{ amount, method, paidOn, note? }`: amount in integer minor units, method `cash` or
// `bank_transfer`, paidOn 'YYYY-MM-DD' in the studio's calendar. 201 with the entry and what is
// still owed; 422 for a bad field or more than is owed (`overpayment`, with `owed`); 409 on a
// booking that takes none.
import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { recordPayment } from '$lib/server/payments/recorded';
import { readInput, unauthenticated } from '$lib/server/payments/http';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ locals, params, request }) => {
	if (!locals.user) return unauthenticated();
	const read = await readInput(request);
	if (!read.ok) return read.response;
	const outcome = await recordPayment(locals.user, params.id, read.body);
	if (!outcome.ok) {
		const { status, code, message, fields, owed } = outcome;
		return apiError(status, code, message, { ...(fields ? { fields } : {}), ...(owed !== undefined ? { owed } : {}) });
	}
	return json({ ...outcome.entry, balanceOwed: outcome.owed }, { status: 201 });
};

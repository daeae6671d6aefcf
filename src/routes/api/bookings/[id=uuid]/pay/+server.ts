// POST: a Checkout page for the booking's deposit (while held) or balance (once closed), made or
// reused: `{ checkoutUrl, sessionId, kind }`. Amounts come from the booking and its final invoice,
// never from the request (OWASP ASVS 15.3.3).
import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import * as payments from '$lib/server/payments';
import { readInput, unauthenticated } from '$lib/server/payments/http';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = async ({ locals, params, request, url }) => {
	if (!locals.user) return unauthenticated();
	const found = await payments.payable(locals.user, params.id);
	if (!found.ok) return apiError(found.status, found.code, found.message);
	const read = await readInput(request);
	if (!read.ok) return read.response;
	const paid = await payments.pay(found.booking, read.body.kind, url.origin);
	if (!paid.ok) return apiError(paid.status, paid.code, paid.message, paid.fields ? { fields: paid.fields } : {});
	return json({ checkoutUrl: paid.checkoutUrl, sessionId: paid.sessionId, kind: paid.kind });
};

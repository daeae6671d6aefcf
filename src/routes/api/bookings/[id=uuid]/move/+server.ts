// GET: what moving the session to ?start=&end=(&room=&engineer=&gear=) would cost, and whether it
// can be made. POST { start, end, room?, engineer?, gear? }: moves it (200), or, when it costs more,
// waits for the payment of the difference (202 with the Checkout address); 409 onto a taken slot,
// with the nearest free starts. Amounts come from the booking and the pricing engine, never from
// the request.
import { json } from '@sveltejs/kit';
import { apiError, readJson } from '$lib/server/api';
import { moveBooking, moveRequestFromQuery, previewMove, type MoveFailure } from '$lib/server/bookings/move';
import { CheckoutError } from '$lib/server/payments/checkout';
import { unauthenticated } from '$lib/server/payments/http';
import type { RequestHandler } from './$types';

function failure(f: MoveFailure) {
	const extra: Record<string, unknown> = {};
	if ('fields' in f) extra.fields = f.fields;
	if ('nearestStarts' in f && f.nearestStarts) extra.nearestStarts = f.nearestStarts;
	if ('taken' in f && f.taken) extra.taken = f.taken;
	return apiError(f.status, f.code, f.message, extra);
}

export const GET: RequestHandler = async ({ locals, params, url }) => {
	if (!locals.user) return unauthenticated();
	const preview = await previewMove(locals.user, params.id, moveRequestFromQuery(url.searchParams));
	if (!preview.ok) return failure(preview);
	return json(preview.body, { headers: { 'cache-control': 'no-store' } });
};

export const POST: RequestHandler = async ({ locals, params, request, url }) => {
	if (!locals.user) return unauthenticated();
	const read = await readJson(request);
	if (!read.ok) return read.response;
	try {
		const moved = await moveBooking(locals.user, params.id, read.body, { origin: url.origin });
		if (!moved.ok) return failure(moved);
		return json(moved.body, { status: moved.status });
	} catch (e) {
		// The move waits for its payment, but Checkout could not be started: the booking page offers it again.
		if (e instanceof CheckoutError) return apiError(e.code === 'payments_not_ready' ? 409 : 503, e.code, e.message);
		throw e;
	}
};

import { json } from '@sveltejs/kit';
import { bookingJson, createHold, listForViewer, publicQuote } from '$lib/server/bookings';
import { apiError, readJson } from '$lib/server/api';
import { startDepositCheckout } from '$lib/server/payments';
import { getStudio } from '$lib/server/studio';
import { isoInZone } from '$lib/domain/time';
import { audit } from '$lib/server/audit';
import { mayBook } from '$lib/roles';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	// The accountant reads bookings only through the accounts, one at a time.
	if (locals.user.role === 'accountant') return apiError(403, 'forbidden', 'Your role reads the accounts, not the booking list.');
	const [studio, rows] = await Promise.all([getStudio(), listForViewer(locals.user)]);
	return json({ bookings: rows.map((b) => bookingJson(b, studio.timeZone)) });
};

export const POST: RequestHandler = async ({ request, locals, url, getClientAddress }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in to book.');
	if (!mayBook(locals.user.role)) return apiError(403, 'forbidden', 'Your role reads the accounts; it does not book sessions.');
	const read = await readJson(request);
	if (!read.ok) return read.response;
	const outcome = await createHold(locals.user, read.body);
	if (!outcome.ok) {
		if (outcome.status === 409) {
			return apiError(409, 'slot_taken', outcome.message, { taken: outcome.taken, nearestStarts: outcome.nearestStarts });
		}
		return apiError(422, 'invalid', outcome.message, { fields: outcome.fields });
	}
	const b = outcome.booking;
	await audit({ actorId: locals.user.id, action: 'booking.held', entity: 'booking', entityId: b.id, ip: getClientAddress() });
	const studio = await getStudio();
	const checkout = await startDepositCheckout(b.id, url.origin).catch((e: unknown) => {
		console.warn('[bookings] could not start the deposit checkout', (e as Error).message);
		return null;
	});
	return json(
		{
			id: b.id,
			reference: b.reference,
			status: b.status,
			holdExpiresAt: isoInZone(b.holdExpiresAt!, studio.timeZone),
			checkoutUrl: checkout?.url ?? null,
			quote: publicQuote(outcome.quote)
		},
		{ status: 201 }
	);
};

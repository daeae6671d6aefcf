import { json } from '@sveltejs/kit';
import * as bookings from '$lib/server/bookings';
import { apiError } from '$lib/server/api';
import { messagesOf } from '$lib/server/messages';
import { isoInZone } from '$lib/domain/time';
import { moneyFigures } from '$lib/server/payments/recorded';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, params }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	const b = await bookings.getForViewer(locals.user, params.id);
	// Another artist's booking, or another studio's, is a 404, not a 403: its existence is not theirs to know.
	if (!b) return apiError(404, 'not_found', 'No such booking.');
	// `billing`: whom it is billed to (null: the artist's name alone), for all but its engineers.
	const billing = bookings.billedTo(b);
	// `messages`: its scheduled e-mails by due time, sent or not; one cancelled (no longer wanted:
	// the booking was cancelled or moved away from it) keeps its row and says when.
	const zone = b.studio.timeZone;
	const at = (d: Date | null) => (d ? isoInZone(d, zone) : null);
	const messages = (await messagesOf(b.id)).map((m) => ({
		kind: m.kind,
		dueAt: at(m.dueAt),
		sentAt: at(m.sentAt),
		cancelledAt: at(m.cancelledAt)
	}));
	// `money`: paid by card, recorded by hand, refunded, invoiced and still owed; `recordedPayments`: the entries.
	const money = await moneyFigures(b);
	return json({ ...bookings.bookingJson(b, b.studio), ...(billing === undefined ? {} : { billing }), ...money, messages });
};

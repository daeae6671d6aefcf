// What a person asks of a booking's money, the same whether the booking page's form actions or
// the JSON API ask: start paying, cancel. Who may ask is checked here, against the acting user.
import type { SessionUser } from '../auth';
import { audit } from '../audit';
import { getRow, type BookingRow } from '../bookings/read';
import { CheckoutError, startCheckout, type CheckoutKind } from './checkout';
import { cancelBooking, type CancelOutcome } from './refunds';

export type MoneyRefusal = {
	ok: false;
	status: 403 | 404 | 409 | 422 | 503;
	code: string;
	message: string;
	fields?: Record<string, string[]>;
};

/** The booking, when the acting user may start a payment on it: its artist or its studio's owner. */
export async function payable(actor: SessionUser, bookingId: string): Promise<{ ok: true; booking: BookingRow } | MoneyRefusal> {
	const found = await getRow(actor, bookingId);
	if (!found) return { ok: false, status: 404, code: 'not_found', message: 'No such booking.' };
	// The role at the booking's own studio: an engineer elsewhere pays for their own session here.
	if (found.as.role !== 'artist' && found.as.role !== 'owner') {
		return { ok: false, status: 403, code: 'forbidden', message: 'Only the artist or the owner starts a payment.' };
	}
	return { ok: true, booking: found.booking };
}

/**
 * A Checkout page for the booking's deposit (while held) or balance (once closed), made or reused.
 * Amounts come from the booking and its final invoice, never from the request (OWASP ASVS 15.3.3);
 * `asked` only says which of the two, and the booking's status decides when it says nothing.
 */
export async function pay(
	b: BookingRow,
	asked: unknown,
	origin: string
): Promise<{ ok: true; checkoutUrl: string; sessionId: string; kind: CheckoutKind } | MoneyRefusal> {
	if (asked !== undefined && asked !== 'deposit' && asked !== 'balance') {
		return {
			ok: false,
			status: 422,
			code: 'invalid',
			message: 'kind is deposit or balance.',
			fields: { kind: ['Choose deposit or balance.'] }
		};
	}
	const kind: CheckoutKind = asked ?? (b.status === 'completed' ? 'balance' : 'deposit');
	try {
		const checkout = await startCheckout(b.id, kind, origin);
		return { ok: true, checkoutUrl: checkout.url, sessionId: checkout.sessionId, kind };
	} catch (e) {
		if (!(e instanceof CheckoutError)) throw e;
		const status = e.code === 'not_found' ? 404 : e.code === 'stripe_unavailable' ? 503 : 409;
		return { ok: false, status, code: e.code, message: e.message };
	}
}

/** Cancels (the artist or the owner), recording who asked and from where; a second ask answers with the first. */
export async function cancel(actor: SessionUser, bookingId: string, reason: unknown, ip: string): Promise<CancelOutcome> {
	const outcome = await cancelBooking(actor, bookingId, {
		reason: typeof reason === 'string' ? reason.slice(0, 500) : undefined
	});
	if (outcome.ok && !outcome.already) {
		await audit({ actorId: actor.id, action: 'booking.cancel', entity: 'booking', entityId: bookingId, ip });
	}
	return outcome;
}

// Payments through Stripe Checkout: deposits, balances, refunds and the webhook that confirms
// them. The booking routes and the booking page use these entry points.
import { registerPaymentJobs } from './jobs';
import { startCheckout } from './checkout';

registerPaymentJobs();

/** Creates (or hands back the open) Checkout Session for a held booking's deposit. */
export async function startDepositCheckout(bookingId: string, origin: string): Promise<{ url: string; sessionId: string }> {
	return startCheckout(bookingId, 'deposit', origin);
}

export { startCheckout, CheckoutError, type CheckoutKind } from './checkout';
export { loadMoneyPanel } from './panel';
export {
	cancelBooking,
	previewCancellation,
	retryFailedRefunds,
	cancelAccess,
	onBookingCancelled,
	type CancellationFact
} from './refunds';
export { closeBooking } from './close';
export { processStripeEvent } from './webhook';
export { onBookingConfirmed } from './state';
export { registerPaymentJobs } from './jobs';
export type { MoneyPanelData } from '$lib/types/money';

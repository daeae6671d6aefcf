// Payments through Stripe Checkout: deposits, balances, refunds and the webhook that confirms
// them. The booking routes and the booking page use these entry points; the periodic sweeps are
// started with the other jobs (src/lib/server/jobs.ts).
import { startCheckout } from './checkout';

/** Creates (or hands back the open) Checkout Session for a held booking's deposit. */
export async function startDepositCheckout(bookingId: string, origin: string): Promise<{ url: string; sessionId: string }> {
	return startCheckout(bookingId, 'deposit', origin);
}

export { startCheckout, CheckoutError, PaymentsNotReadyError, PAYMENTS_NOT_READY, type CheckoutKind } from './checkout';
export { loadMoneyPanel } from './panel';
export { cancelBooking, previewCancellation, retryFailedRefunds, cancelAccess, type CancellationFact } from './refunds';
export { closeBooking } from './close';
export { recordNoShow, mayRecordNoShow, type NoShowOutcome } from './no-show';
export { cancel, pay, payable, type MoneyRefusal } from './actions';
export { processStripeEvent } from './webhook';
export { recordPayment, reversePayment, recordedEntries, moneyFigures } from './recorded';
export { receiveWebhook } from './receive';
export type { MoneyPanelData } from '$lib/types/money';

// Payments through Stripe Checkout. Deposit checkout for a held booking.
export async function startDepositCheckout(_bookingId: string, _origin: string): Promise<{ url: string; sessionId: string } | null> {
	return null;
}

import type { MoneyPanelData } from '$lib/types/money';
export type { MoneyPanelData };

export async function loadMoneyPanel(
	_viewer: import('../auth').SessionUser,
	_booking: { id: string; status: string; currency: string; total: number; deposit: number }
): Promise<MoneyPanelData | null> {
	return null;
}

/**
 * The platform's fee on a studio's charge (Stripe Connect, direct charges: the studio is the
 * merchant of record and the platform takes `application_fee_amount` out of each charge; Stripe
 * API reference, "Create a Checkout Session", payment_intent_data.application_fee_amount).
 *
 * Our rule: the fee is the studio's platformFeeBp (basis points: 250 = 2.5 %) of the amount
 * charged, rounded DOWN, so a studio never pays more than the share it agreed to:
 *
 * - to the currency's minor unit (ISO 4217: cents for EUR, whole yen for JPY);
 * - and further down to the step Stripe takes amounts in, where Stripe's rule is coarser than
 *   ISO's (Stripe docs, "Supported currencies": three-decimal currencies in tens, ISK in whole
 *   krónur), so the fee Stripe is asked for is exactly the fee recorded.
 *
 * 0 bp is no fee at all (the parameter is then left out of the request).
 */
import { assertInteger, fromStripeAmount, mulDivFloor, stripeCurrencyRule } from './money';
import type { Minor } from './types';

export const MAX_FEE_BP = 10_000;

/** The smallest fee step in the currency's minor units that Stripe can state exactly. */
function minorStep(currency: string): number {
	return Math.max(1, fromStripeAmount(stripeCurrencyRule(currency).step, currency));
}

/** feeBp of `amount` (minor units of `currency`), rounded down as above; never more than `amount`. */
export function platformFee(amount: Minor, feeBp: number, currency: string): Minor {
	assertInteger(amount, 'amount');
	assertInteger(feeBp, 'fee');
	if (feeBp < 0 || feeBp > MAX_FEE_BP) throw new RangeError(`a platform fee is 0 to ${MAX_FEE_BP} basis points, got ${feeBp}`);
	if (amount <= 0 || feeBp === 0) return 0;
	const step = minorStep(currency);
	return mulDivFloor(amount, feeBp, MAX_FEE_BP * step) * step;
}

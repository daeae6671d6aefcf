/**
 * Slateroom's pricing engine: quotes, overtime, refunds on cancellation and booking-time checks.
 * Pure TypeScript; every amount is an integer of the currency's minor units.
 *
 * Sources by rule: block cover and surcharges — common practice / our rule: the
 * cover with the lowest price + surcharge, each surcharged minute paying its percent of its share
 * of the block time bought (blocks.ts, surcharges.ts); VAT and totals — EN 16931-1 BR-CO-10/13/14/15/16/17 (vat.ts); deposit —
 * our rule, whole units per ISO 4217 (deposit.ts); wall-clock time — the time engine
 * (../time: IANA tz via @date-fns/tz, Directive 2000/84/EC); overtime and the cancellation ladder — common practice
 * (overtime.ts, cancellation.ts).
 */
export { quoteBooking, type QuoteInput } from './quote';
export { overtimeCharge, type OvertimeInput } from './overtime';
export { refundForCancellation, rungLabel, type RefundInput, type RefundResult } from './cancellation';
export {
	validateBookingTimes,
	isUnboundedTime,
	MAX_BOOKING_MINUTES,
	toFieldErrors,
	type BookingTimeCode,
	type BookingTimeField,
	type BookingTimeIssue
} from './validation';
export { cheapestCover, hourlyAmount, type BlockCover } from './blocks';
export { surchargeShares, surchargeAmount, surchargeSplit, surchargeWeight, type SurchargeShare } from './surcharges';
export { chargeTotals, reverseChargeItems, summariseCharges, lineNet, vatOf, en16931Violations, type ChargeItem } from './vat';
export { depositFor, depositAndBalance } from './deposit';
export { decimalHours, formatPercent } from './labels';
export type { ChargeTotals, LineKind, OvertimeCharge, PriceLine, Quote, SurchargeMinutes, VatGroup } from './types';
export { DEMO_POLICY, DEMO_ROOMS, DEMO_STUDIO, demoPolicy, demoRoom } from '../demo';

import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { platformFee } from './platform-fee';
import { isExactStripeAmount } from './money';

describe('platform fee (basis points of the charge, rounded down)', () => {
	it('is the share of the amount, rounded down to the minor unit', () => {
		expect(platformFee(4200, 500, 'EUR')).toBe(210); // 5 % of 42.00 = 2.10 exactly
		expect(platformFee(4299, 250, 'EUR')).toBe(107); // 2.5 % of 42.99 = 1.07475 → 1.07
		expect(platformFee(1999, 1, 'EUR')).toBe(0); // 0.01 % of 19.99 = 0.001999 → 0.00
		expect(platformFee(10_000, 9999, 'SEK')).toBe(9999);
		expect(platformFee(501, 333, 'JPY')).toBe(16); // 3.33 % of ¥501 = ¥16.6833 → ¥16
	});

	it('is nothing at 0 bp and the whole amount at 10 000 bp', () => {
		expect(platformFee(4200, 0, 'EUR')).toBe(0);
		expect(platformFee(4200, 10_000, 'EUR')).toBe(4200);
		expect(platformFee(0, 500, 'EUR')).toBe(0);
	});

	it('goes down to the step Stripe takes a currency in (tens of fils, whole krónur)', () => {
		// KWD: ISO 3 digits, Stripe takes the last one as 0. 1.5 % of 5.120 = 0.0768 → 0.076 → 0.070.
		expect(platformFee(5120, 150, 'KWD')).toBe(70);
		// ISK: ISO 0 digits, Stripe whole krónur. 10 % of 995 kr = 99.5 → 99.
		expect(platformFee(995, 1000, 'ISK')).toBe(99);
	});

	it('refuses a rate outside 0 to 10 000 bp and amounts that are not whole minor units', () => {
		expect(() => platformFee(4200, -1, 'EUR')).toThrow(RangeError);
		expect(() => platformFee(4200, 10_001, 'EUR')).toThrow(RangeError);
		expect(() => platformFee(4200, 2.5, 'EUR')).toThrow(RangeError);
		expect(() => platformFee(42.5, 250, 'EUR')).toThrow(RangeError);
	});

	it('never exceeds the share nor falls a whole step below it, and Stripe can state it exactly (property)', () => {
		fc.assert(
			fc.property(
				fc.integer({ min: 0, max: 1_000_000_000 }),
				fc.integer({ min: 0, max: 10_000 }),
				fc.constantFrom('EUR', 'SEK', 'JPY', 'KWD', 'ISK', 'GBP'),
				(amount, bp, currency) => {
					const fee = platformFee(amount, bp, currency);
					const step = currency === 'KWD' ? 10 : 1;
					// fee ≤ amount × bp / 10 000 < fee + step, in exact integers.
					expect(BigInt(fee) * 10_000n).toBeLessThanOrEqual(BigInt(amount) * BigInt(bp));
					expect(BigInt(fee + step) * 10_000n).toBeGreaterThan(BigInt(amount) * BigInt(bp));
					expect(fee % step).toBe(0);
					expect(isExactStripeAmount(fee, currency)).toBe(true);
				}
			)
		);
	});
});

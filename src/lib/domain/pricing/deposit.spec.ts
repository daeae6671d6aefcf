import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEMO_POLICY } from '../demo';
import { depositAndBalance, depositFor } from './deposit';

describe('deposit (demo policy: 30 % of the gross, up to whole euros, at least 50.00, never above the total)', () => {
	it('rounds 30 % up to whole euros', () => {
		expect(depositFor(20500, DEMO_POLICY)).toBe(6200); // 30 % of 205.00 = 61.50 → 62.00
		expect(depositFor(41400, DEMO_POLICY)).toBe(12500); // 30 % of 414.00 = 124.20 → 125.00
		expect(depositFor(36000, DEMO_POLICY)).toBe(10800); // 30 % of 360.00 = 108.00 exactly
		expect(depositFor(39975, DEMO_POLICY)).toBe(12000); // 30 % of 399.75 = 119.925 → 120.00
	});

	it('is at least 50.00', () => {
		expect(depositFor(13500, DEMO_POLICY)).toBe(5000); // 30 % of 135.00 = 40.50 → 41.00 < 50.00
		expect(depositFor(6000, DEMO_POLICY)).toBe(5000); // vocal booth 2 h = 60.00
	});

	it('is the whole total when the total is smaller than the minimum', () => {
		expect(depositAndBalance(4000, DEMO_POLICY)).toEqual({ deposit: 4000, balance: 0 });
		expect(depositAndBalance(4050, DEMO_POLICY)).toEqual({ deposit: 4050, balance: 0 });
		expect(depositFor(0, DEMO_POLICY)).toBe(0);
	});

	it('asks no deposit, not even the minimum, when there is nothing to pay or the total is a credit', () => {
		// Without the rule, the minimum (50.00) capped by a total of −5.00 would ask −5.00.
		expect(depositAndBalance(-500, DEMO_POLICY)).toEqual({ deposit: 0, balance: -500 });
	});

	it('rounds up to whole units of other currencies (ISO 4217: JPY 0 digits, KWD 3)', () => {
		const jpy = { currency: 'JPY', depositBp: 3000, depositMinimum: 0 };
		expect(depositFor(20501, jpy)).toBe(6151); // 6150.3 → 6151 yen
		const kwd = { currency: 'KWD', depositBp: 3000, depositMinimum: 0 };
		expect(depositFor(20500, kwd)).toBe(7000); // 6.150 KWD → 7.000 KWD
	});

	it('never exceeds the total, and deposit + balance = total (property)', () => {
		fc.assert(
			fc.property(
				fc.integer({ min: 0, max: 100_000_000 }),
				fc.integer({ min: 0, max: 10_000 }),
				fc.integer({ min: 0, max: 100_000 }),
				(total, bp, min) => {
					const policy = { currency: 'EUR', depositBp: bp, depositMinimum: min };
					const { deposit, balance } = depositAndBalance(total, policy);
					expect(deposit + balance).toBe(total);
					expect(deposit).toBeLessThanOrEqual(total);
					expect(deposit).toBeGreaterThanOrEqual(Math.min(total, min));
					expect(deposit * 10_000).toBeGreaterThanOrEqual(Math.min(total * bp, total * 10_000));
					if (deposit !== total && deposit !== min) expect(deposit % 100).toBe(0);
				}
			)
		);
	});
});

import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEMO_POLICY } from '../demo';
import { divRoundHalfUp } from '../money';
import type { BlockLengths, BlockRates } from '../types';
import { cheapestCover, hourlyAmount } from './blocks';
import { LIVE_ROOM } from './spec-fixtures';

const blocks = DEMO_POLICY.blocks; // half day 240 min, full day 480 min (PRODUCT.md)
const live = LIVE_ROOM.rates; // 45.00 / 160.00 / 300.00 (PRODUCT.md)
const engineer = DEMO_POLICY.engineerRates; // 35.00 / 120.00 / 230.00 (PRODUCT.md)
const cover = (minutes: number, rates: BlockRates = live) => cheapestCover(minutes, rates, blocks, 30);

describe('cheapest cover of the booked time (source: PRODUCT.md rate card and worked examples)', () => {
	it('5 h in the live room = half day + 1 h = 205.00, not 5 × 45 = 225.00', () => {
		// 160.00 + 45.00 = 205.00 < 225.00; full day 300.00 is dearer still.
		const c = cover(300);
		expect(c).toMatchObject({ fullDays: 0, halfDays: 1, hourlyMinutes: 60, price: 20500 });
	});

	it('7 h 30 = full day 300.00 (cheaper than 160.00 + 3.5 × 45.00 = 317.50)', () => {
		expect(cover(450)).toMatchObject({ fullDays: 1, halfDays: 0, hourlyMinutes: 0, price: 30000 });
	});

	it('4 h = half day 160.00 (not 4 × 45.00 = 180.00)', () => {
		expect(cover(240)).toMatchObject({ halfDays: 1, hourlyMinutes: 0, price: 16000 });
	});

	it('3 h = 3 × 45.00 = 135.00 (cheaper than a half day)', () => {
		expect(cover(180)).toMatchObject({ halfDays: 0, hourlyMinutes: 180, increments: 6, price: 13500 });
	});

	it('10 h = full day + 2 × 45.00 = 390.00', () => {
		expect(cover(600)).toMatchObject({ fullDays: 1, hourlyMinutes: 120, price: 39000 });
	});

	it('bills hourly time per started increment, pro rata: 30 min = half the hourly rate', () => {
		// 45.00 × 0.5 = 22.50; 2 h 10 min of hourly time bills as 2 h 30 min = 112.50.
		expect(hourlyAmount(4500, 30)).toBe(2250);
		expect(cover(130)).toMatchObject({ hourlyMinutes: 150, increments: 5, price: 11250 });
	});

	it('prices engineer time the same way from its own rates (35.00 / 120.00 / 230.00)', () => {
		expect(cover(300, engineer).price).toBe(15500); // half day 120.00 + 1 h 35.00
		expect(cover(450, engineer).price).toBe(23000); // full day beats 120.00 + 3.5 × 35.00 = 242.50
		expect(cover(180, engineer).price).toBe(10500); // 3 × 35.00
	});

	it('covers a 23 h and a 25 h night with the cheapest mix', () => {
		// 23 h: 2 full (600.00) + half (160.00) + 3 h (135.00) = 895.00, cheaper than 3 full (900.00).
		expect(cover(23 * 60)).toMatchObject({ fullDays: 2, halfDays: 1, hourlyMinutes: 180, price: 89500 });
		// 25 h: 3 full (900.00) + 1 h (45.00) = 945.00.
		expect(cover(25 * 60)).toMatchObject({ fullDays: 3, halfDays: 0, hourlyMinutes: 60, price: 94500 });
	});

	it('treats a 0 price as "not sold" (common practice for an empty cell on a rate card)', () => {
		// No half days: 5 h = 5 × 45.00 = 225.00 (full day 300.00 is dearer).
		expect(cover(300, { ...live, halfDay: 0 }).price).toBe(22500);
		// Blocks only: 5 h needs a full day, or two half days (320.00): full day 300.00.
		expect(cover(300, { ...live, hourly: 0 })).toMatchObject({ fullDays: 1, price: 30000 });
		// Nothing sold: the time is free.
		expect(cover(300, { hourly: 0, halfDay: 0, fullDay: 0 }).price).toBe(0);
	});

	it('refuses nonsense durations', () => {
		expect(() => cover(-30)).toThrow(RangeError);
		expect(() => cover(1.5)).toThrow(RangeError);
		expect(() => cheapestCover(60, live, blocks, 0)).toThrow(RangeError);
	});
});

/**
 * Independent check: an unbounded covering DP over increments, in exact sixtieths of a minor
 * unit (hourly × increment is the exact price of one increment × 60). best[u] = cheapest way to
 * cover at least u increments.
 */
function dpCheapestExact(minutes: number, rates: BlockRates, lengths: BlockLengths, inc: number): number {
	const units = Math.ceil(minutes / inc);
	const full = lengths.fullDayMinutes / inc;
	const half = lengths.halfDayMinutes / inc;
	const best: number[] = [0];
	for (let u = 1; u <= units; u++) {
		const options: number[] = [];
		if (rates.hourly > 0) options.push((best[u - 1] ?? Infinity) + rates.hourly * inc);
		if (rates.fullDay > 0) options.push((best[Math.max(0, u - full)] ?? Infinity) + rates.fullDay * 60);
		if (rates.halfDay > 0) options.push((best[Math.max(0, u - half)] ?? Infinity) + rates.halfDay * 60);
		best.push(Math.min(...options));
	}
	return best[units] ?? Infinity;
}

describe('cheapest cover, property (fast-check) against a covering DP', () => {
	it('is never dearer than any mix the DP can find, and covers the time', () => {
		const inc = fc.constantFrom(15, 30, 60);
		fc.assert(
			fc.property(
				inc,
				fc.integer({ min: 1, max: 40 }),
				fc.record({
					hourly: fc.integer({ min: 1, max: 20_000 }),
					halfDay: fc.integer({ min: 0, max: 80_000 }),
					fullDay: fc.integer({ min: 0, max: 160_000 })
				}),
				fc.integer({ min: 1, max: 8 }),
				(increment, units, rates, halfUnits) => {
					const lengths = { halfDayMinutes: halfUnits * 60, fullDayMinutes: halfUnits * 120 };
					const minutes = units * increment - (units > 1 ? Math.floor(increment / 2) : 0);
					const c = cheapestCover(minutes, rates, lengths, increment);
					// Rounding half-up once is monotone, so the cheapest rounded price is the rounded DP optimum.
					expect(c.price).toBe(divRoundHalfUp(dpCheapestExact(minutes, rates, lengths, increment), 60));
					expect(c.coveredMinutes).toBeGreaterThanOrEqual(minutes);
					expect(c.price).toBe(c.fullDayAmount + c.halfDayAmount + c.hourlyAmount);
				}
			),
			{ numRuns: 300 }
		);
	});

	it('never gets cheaper when the booking gets longer', () => {
		fc.assert(
			fc.property(fc.integer({ min: 0, max: 3000 }), fc.integer({ min: 1, max: 600 }), (a, extra) => {
				expect(cover(a + extra).price).toBeGreaterThanOrEqual(cover(a).price);
			})
		);
	});
});

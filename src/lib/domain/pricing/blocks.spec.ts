import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEMO_POLICY } from '../demo';
import { divRoundHalfUp, mulDivRoundHalfUp } from '../money';
import type { BlockLengths, BlockRates } from '../types';
import { cheapestCover, hourlyAmount } from './blocks';
import { LIVE_ROOM } from '$fixtures/pricing';

const blocks = DEMO_POLICY.blocks; // half day 240 min, full day 480 min (demo policy)
const live = LIVE_ROOM.rates; // 45.00 / 160.00 / 300.00 (demo rates)
const engineer = DEMO_POLICY.engineerRates; // 35.00 / 120.00 / 230.00 (demo rates)
const cover = (minutes: number, rates: BlockRates = live, surchargeBpMinutes = 0) =>
	cheapestCover(minutes, rates, blocks, 30, surchargeBpMinutes);

describe('cheapest cover of the booked time (demo rate card, examples worked by hand)', () => {
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

describe('the cover with surcharges included (our rule: price + price × Σ% ÷ capacity)', () => {
	it('7 h 30 with 4 h 30 at +25 %: a full day, 300.00 + 300.00 × 25 % × 270/480 = 42.19', () => {
		// Half day + 3 h 30 = 317.50 buying 450 min: 317.50 + 317.50 × 25 % × 270/450 = 47.63 → 365.13.
		expect(cover(450, live, 270 * 2500)).toMatchObject({ fullDays: 1, halfDays: 0, hourlyMinutes: 0, coveredMinutes: 480 });
	});

	it('7 h all at +20 %: a full day (352.50) for the room, half day + 3 h (270.00) for the engineer', () => {
		// Without surcharges half day + 3 h is cheapest for both: 295.00 < 300.00 and 225.00 < 230.00.
		expect(cover(420)).toMatchObject({ halfDays: 1, hourlyMinutes: 180, price: 29500 });
		// Room: 295.00 × 1.2 = 354.00 against 300.00 + 300.00 × 20 % × 420/480 = 352.50.
		expect(cover(420, live, 420 * 2000)).toMatchObject({ fullDays: 1, halfDays: 0, hourlyMinutes: 0, price: 30000 });
		// Engineer: 225.00 × 1.2 = 270.00 against 230.00 + 230.00 × 20 % × 420/480 = 270.25.
		expect(cover(420, engineer, 420 * 2000)).toMatchObject({ halfDays: 1, hourlyMinutes: 180, price: 22500 });
	});

	it('buys more block time than booked when that lowers the total (invented card, 30 min at +1000 %)', () => {
		// 600.00/h, full day (480 min) 10.00. Hourly: 300.00 + 300.00 × 1000 % × 30/30 = 3300.00;
		// a full day: 10.00 + 10.00 × 1000 % × 30/480 = 16.25.
		const card = { hourly: 60_000, halfDay: 0, fullDay: 1000 };
		expect(cover(30, card, 30 * 100_000)).toMatchObject({ fullDays: 1, hourlyMinutes: 0, coveredMinutes: 480 });
	});

	it('refuses a negative surcharge weight', () => {
		expect(() => cover(60, live, -1)).toThrow(RangeError);
	});
});

/** price + price × W ÷ (capacity × 10 000) as an exact fraction [numerator, denominator]. */
function exactTotal(price: number, capacity: number, weight: number): [bigint, bigint] {
	const d = BigInt(capacity) * 10_000n;
	return [BigInt(price) * (d + BigInt(weight)), d];
}

/**
 * Independent check by brute force: every mix (f, h, i) whose PRICE is at most the total found
 * (a mix with a higher price has a higher total still, since surcharges are ≥ 0), priced the way
 * the rate card reads, must not have a lower exact total.
 */
function cheaperCoverExists(
	minutes: number,
	rates: BlockRates,
	lengths: BlockLengths,
	inc: number,
	weight: number,
	found: number[]
) {
	const [fn, fd] = exactTotal(found[0] ?? 0, found[1] ?? 1, weight);
	const bound = Number(fn / fd) + 1;
	const fulls = rates.fullDay > 0 ? Math.floor(bound / rates.fullDay) : 0;
	for (let f = 0; f <= fulls; f++) {
		const halves = rates.halfDay > 0 ? Math.floor((bound - f * rates.fullDay) / rates.halfDay) : 0;
		for (let h = 0; h <= halves; h++) {
			const blockTime = f * lengths.fullDayMinutes + h * lengths.halfDayMinutes;
			const firstI = Math.ceil(Math.max(0, minutes - blockTime) / inc);
			for (let i = firstI; ; i++) {
				if (i > 0 && rates.hourly <= 0) break;
				const price = f * rates.fullDay + h * rates.halfDay + hourlyAmount(rates.hourly, i * inc);
				if (price > bound) break;
				const [n, d] = exactTotal(price, blockTime + i * inc, weight);
				if (n * fd < fn * d) return { f, h, i, price };
				if (rates.hourly <= 0) break;
			}
		}
	}
	return undefined;
}

describe('cover with surcharges, property (fast-check) against brute force', () => {
	it('no mix of full days, half days and increments has a lower price + surcharge', () => {
		fc.assert(
			fc.property(
				fc.constantFrom(15, 30, 60),
				fc.integer({ min: 1, max: 24 }),
				fc.record({
					hourly: fc.integer({ min: 1, max: 20_000 }),
					halfDay: fc.integer({ min: 0, max: 80_000 }),
					fullDay: fc.integer({ min: 0, max: 160_000 })
				}),
				fc.integer({ min: 1, max: 8 }),
				fc.integer({ min: 0, max: 15_000 }),
				(increment, units, rates, halfUnits, maxBp) => {
					const lengths = { halfDayMinutes: halfUnits * 60, fullDayMinutes: halfUnits * 120 };
					const minutes = units * increment;
					const weight = Math.floor((minutes * maxBp) / 2); // half the minutes at up to 150 %
					const c = cheapestCover(minutes, rates, lengths, increment, weight);
					expect(c.coveredMinutes).toBeGreaterThanOrEqual(minutes);
					expect(c.coveredMinutes).toBe(
						c.fullDays * lengths.fullDayMinutes + c.halfDays * lengths.halfDayMinutes + c.hourlyMinutes
					);
					expect(cheaperCoverExists(minutes, rates, lengths, increment, weight, [c.price, c.coveredMinutes])).toBeUndefined();
				}
			),
			{ numRuns: 300 }
		);
	});

	it('the rounded price + surcharge never decreases for more minutes and more surcharge', () => {
		const total = (minutes: number, weight: number) => {
			const c = cover(minutes, live, weight);
			return c.price + mulDivRoundHalfUp(c.price, weight, c.coveredMinutes * 10_000);
		};
		fc.assert(
			fc.property(
				fc.integer({ min: 1, max: 1800 }),
				fc.integer({ min: 0, max: 600 }),
				fc.integer({ min: 0, max: 5000 }),
				fc.integer({ min: 0, max: 5000 }),
				(minutes, extra, bp, extraBp) => {
					const weight = minutes * bp;
					expect(total(minutes + extra, weight + extra * extraBp)).toBeGreaterThanOrEqual(total(minutes, weight));
				}
			),
			{ numRuns: 300 }
		);
	});
});

describe('cheapest cover: edges of the input (worked by hand)', () => {
	it('prices nothing booked at nothing', () => {
		expect(cover(0)).toEqual({
			fullDays: 0,
			halfDays: 0,
			hourlyMinutes: 0,
			increments: 0,
			coveredMinutes: 0,
			fullDayAmount: 0,
			halfDayAmount: 0,
			hourlyAmount: 0,
			price: 0
		});
	});

	it('prices up to a year (366 days of 24 h = 1,098 full days of 8 h) and refuses a minute more, saying why', () => {
		expect(cover(366 * 24 * 60)).toMatchObject({ fullDays: 1098, halfDays: 0, hourlyMinutes: 0, price: 1098 * 30000 });
		expect(() => cover(366 * 24 * 60 + 1)).toThrow('cannot price 527041 minutes');
		expect(() => cover(-30)).toThrow('cannot price -30 minutes');
		expect(() => cheapestCover(60, live, blocks, 0)).toThrow('incrementMinutes must be a positive integer');
		expect(() => cheapestCover(60, live, blocks, 7.5)).toThrow('incrementMinutes must be a positive integer');
		expect(() => cover(60, live, 0.5)).toThrow('surchargeBpMinutes must be a non-negative integer');
	});

	it('bills free time as hourly time in whole increments when nothing is sold', () => {
		// 5 h 10 min on a 30-minute grid: 11 increments, 5 h 30 min, at no charge.
		expect(cover(310, { hourly: 0, halfDay: 0, fullDay: 0 })).toMatchObject({
			increments: 11,
			hourlyMinutes: 330,
			coveredMinutes: 330,
			price: 0
		});
	});

	it('does not sell a block of no length, and refuses a block of part of a minute', () => {
		// With the demo 4 h half day, 5 h = half day + 1 h = 205.00; a half day of 0 minutes is
		// an empty cell, so 5 h = 10 × 22.50 = 225.00.
		expect(cover(300, live)).toMatchObject({ halfDays: 1, price: 20500 });
		const noHalf = cheapestCover(300, live, { ...blocks, halfDayMinutes: 0 }, 30);
		expect(noHalf).toMatchObject({ halfDays: 0, increments: 10, price: 22500 });
		expect(() => cheapestCover(300, live, { ...blocks, halfDayMinutes: 240.5 }, 30)).toThrow(
			'halfDay length must be whole minutes'
		);
	});
});

describe('cheapest cover: equal prices (our tie rule: fewer hourly minutes, then less block time, then more full days)', () => {
	it('buys two half days rather than a 6 h day plus 2 h of hourly time at the same 140.00', () => {
		// Invented card: 20.00/h (10.00 per 30 min), half day 4 h 70.00, full day 6 h 100.00.
		// 8 h: full day + 4 increments = 100.00 + 40.00 = 140.00 = two half days 2 × 70.00.
		const card = { hourly: 2000, halfDay: 7000, fullDay: 10000 };
		const sixHourDay = { halfDayMinutes: 240, fullDayMinutes: 360 };
		expect(cheapestCover(480, card, sixHourDay, 30)).toMatchObject({ fullDays: 0, halfDays: 2, hourlyMinutes: 0, price: 14000 });
	});

	it('buys one full day rather than two half days at the same price', () => {
		// Half day 150.00, full day 300.00, no hourly time: 8 h is 300.00 either way.
		expect(cover(480, { hourly: 0, halfDay: 15000, fullDay: 30000 })).toMatchObject({ fullDays: 1, halfDays: 0, price: 30000 });
	});

	it('buys a half day rather than 3 h 30 of hourly time at the same 140.00', () => {
		// 40.00/h: 7 × 20.00 = 140.00 for 3 h 30, the same as a 4 h half day of 140.00.
		expect(cover(210, { hourly: 4000, halfDay: 14000, fullDay: 30000 })).toMatchObject({
			halfDays: 1,
			hourlyMinutes: 0,
			coveredMinutes: 240
		});
	});

	it('buys the shorter block when a half day and a full day cost the same', () => {
		expect(cover(240, { hourly: 4500, halfDay: 14000, fullDay: 14000 })).toMatchObject({
			fullDays: 0,
			halfDays: 1,
			coveredMinutes: 240
		});
	});
});

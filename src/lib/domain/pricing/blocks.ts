/**
 * Block pricing: which mix of full-day blocks, half-day blocks and hourly increments a booking buys
 * (our rule: the artist pays for the cheapest mix of full days, half days and hours that covers
 * the booked time; selling hourly time, half days and full days is common practice in studios).
 *
 * Hourly time is billed per booking increment, pro rata of the hourly rate: with a 30-minute
 * increment, 2 h 10 min of hourly time bills as 2 h 30 min, and 30 min costs half the hourly rate.
 * A block or hourly price of 0 means the studio does not sell it (common practice for a rate
 * card with an empty cell); when nothing is sold at all, the time is free.
 *
 * The cover — common practice / our rule (no outside source): a cover C is any mix of full days,
 * half days and increments whose block time covers the booked minutes;
 *
 *   capacity(C)  = full days × fullDayMinutes + half days × halfDayMinutes + increments × incrementMinutes
 *   surcharge(C) = price(C) × Σ (percent of each booked minute) ÷ capacity(C)          (surcharges.ts)
 *
 * and the booking gets the cover with the lowest price(C) + surcharge(C): the cheapest mix that
 * covers the booked time, surcharges included. Without surcharges that is simply the cheapest mix.
 * On equal totals: fewer hourly minutes, then less block time bought, then more full days.
 *
 * The search is exact and ranges over EVERY cover, surplus blocks included (a longer, cheaper
 * per-minute block can lower the surcharge more than it adds to the price): see cheapestCover.
 * That completeness is what makes the total monotone in the booked time (proof in quote.ts).
 */
import { ceilToMultiple, mulDivRoundHalfUp } from '../money';
import type { BlockLengths, BlockRates, Minor } from '../types';

export interface BlockCover {
	fullDays: number;
	halfDays: number;
	/** Hourly minutes billed, a multiple of the increment. */
	hourlyMinutes: number;
	/** hourlyMinutes ÷ increment. */
	increments: number;
	/**
	 * The capacity: minutes of block time the cover buys (≥ the booked minutes),
	 * fullDays × fullDayMinutes + halfDays × halfDayMinutes + hourlyMinutes.
	 */
	coveredMinutes: number;
	fullDayAmount: Minor;
	halfDayAmount: Minor;
	hourlyAmount: Minor;
	/** fullDayAmount + halfDayAmount + hourlyAmount. */
	price: Minor;
}

/** Pro rata hourly price of `minutes`, rounded half-up to minor units: 45.00/h × 30 min = 22.50. */
export function hourlyAmount(hourly: Minor, minutes: number): Minor {
	return mulDivRoundHalfUp(hourly, minutes, 60);
}

/** Longest booking priced: a year; far beyond any studio's opening hours. */
const MAX_MINUTES = 366 * 24 * 60;

/** One kind of unit the rate card sells. */
interface Unit {
	kind: 'fullDay' | 'halfDay' | 'increment';
	minutes: number;
	/**
	 * Exact price in sixtieths of a minor unit, so increments add up without rounding: a full day
	 * of 300.00 is 30 000 × 60, a 30-minute increment at 45.00/h is 4500 × 30.
	 */
	price60: number;
}

/** A mix of units, before it is priced in minor units. */
interface Mix {
	fullDays: number;
	halfDays: number;
	increments: number;
	price60: number;
}

/**
 * The cover of `minutes` booked minutes with the lowest price + surcharge, where the booked
 * minutes carry `surchargeBpMinutes` = Σ over the minutes of each one's highest surcharge in
 * basis points (surchargeWeight in surcharges.ts; 0 without surcharges: then the cheapest cover).
 *
 * How it searches every cover exactly:
 * 1. For every capacity K on the grid of the unit lengths, the cheapest mix buying exactly K minutes
 *    (an unbounded knapsack in exact sixtieths of a minor unit, so the hourly rounding cannot
 *    mislead it). For a fixed K the surcharge grows with the price, so that mix is the best at K.
 * 2. Among the capacities K ≥ the booked minutes, the one with the lowest total, compared exactly
 *    in BigInt: price × (K × 10 000 + W) ÷ (K × 10 000).
 * 3. Capacities stop where a cover's price ALONE exceeds the total of a reference cover (the best
 *    single-kind cover): price ≥ K × the card's lowest rate per minute − ½ (the hourly amount
 *    rounds by at most half a minor unit), and the total is never below the price, so no cover
 *    beyond (reference total + ½) ÷ lowest rate can win. Nothing is left out that could.
 */
export function cheapestCover(
	minutes: number,
	rates: BlockRates,
	blocks: BlockLengths,
	incrementMinutes: number,
	surchargeBpMinutes = 0
): BlockCover {
	if (!Number.isInteger(minutes) || minutes < 0 || minutes > MAX_MINUTES) {
		throw new RangeError(`cannot price ${minutes} minutes`);
	}
	if (!Number.isInteger(incrementMinutes) || incrementMinutes <= 0) {
		throw new RangeError('incrementMinutes must be a positive integer');
	}
	if (!Number.isSafeInteger(surchargeBpMinutes) || surchargeBpMinutes < 0) {
		throw new RangeError('surchargeBpMinutes must be a non-negative integer');
	}
	const units = soldUnits(rates, blocks, incrementMinutes);
	const priced = (mix: Mix) => toCover(mix, rates, incrementMinutes, blocks);
	if (units.length === 0) {
		// Nothing sold: the time is free, billed as hourly time rounded up to the increment.
		const increments = ceilToMultiple(minutes, incrementMinutes) / incrementMinutes;
		return priced({ fullDays: 0, halfDays: 0, increments, price60: 0 });
	}

	const step = units.reduce((g, unit) => gcd(g, unit.minutes), 0);
	const lastCapacity = capacityLimit(minutes, units, priced, surchargeBpMinutes);
	const cheapest = cheapestMixByCapacity(units, step, Math.floor(lastCapacity / step));

	let best: BlockCover | undefined;
	for (let k = Math.ceil(minutes / step); k < cheapest.length; k++) {
		const mix = cheapest[k];
		if (!mix) continue;
		const candidate = priced(mix);
		if (!best || isBetter(candidate, best, surchargeBpMinutes)) best = candidate;
	}
	if (!best) throw new RangeError('no cover found'); // unreachable: the reference cover is in range
	return best;
}

/** The units the card sells: a price of 0 (or a block of no length) is not sold. */
function soldUnits(rates: BlockRates, blocks: BlockLengths, incrementMinutes: number): Unit[] {
	const units: Unit[] = [];
	const block = (kind: Unit['kind'], length: number, price: Minor) => {
		if (price <= 0 || length <= 0) return;
		if (!Number.isInteger(length)) throw new RangeError(`${kind} length must be whole minutes`);
		units.push({ kind, minutes: length, price60: price * 60 });
	};
	block('fullDay', blocks.fullDayMinutes, rates.fullDay);
	block('halfDay', blocks.halfDayMinutes, rates.halfDay);
	if (rates.hourly > 0) units.push({ kind: 'increment', minutes: incrementMinutes, price60: rates.hourly * incrementMinutes });
	return units;
}

/** The last capacity worth trying (step 3 of cheapestCover). */
function capacityLimit(minutes: number, units: Unit[], priced: (mix: Mix) => BlockCover, weight: number): number {
	// Reference: the best cover made of one kind of unit only.
	let reference: BlockCover | undefined;
	for (const unit of units) {
		const count = Math.ceil(minutes / unit.minutes);
		const cover = priced(addUnits(emptyMix(), unit, count));
		if (!reference || isBetter(cover, reference, weight)) reference = cover;
	}
	const total = exactTotal(reference as BlockCover, weight);
	// Lowest rate per minute, price60 ÷ minutes, by cross-multiplying.
	const lowest = units.reduce((a, b) => (b.price60 * a.minutes < a.price60 * b.minutes ? b : a));
	// K ≤ (total + ½) ÷ (price60 ÷ 60 ÷ minutes) = 60 × (2n + d) × minutes ÷ (2d × price60).
	const limit = (60n * (2n * total.n + total.d) * BigInt(lowest.minutes)) / (2n * total.d * BigInt(lowest.price60));
	return Math.max(minutes, Number(limit));
}

/**
 * cheapest[k] = the cheapest mix buying exactly k × step minutes (undefined when none does), on
 * equal exact price the one with fewer increments, then more full days. Every component of that
 * order adds up unit by unit, so the knapsack recurrence finds the best mix under it. (Only on a
 * card whose increment is not a whole number of minor units can two mixes of one capacity round
 * to the same price; the exact price tells them apart before the tie rule does.)
 */
function cheapestMixByCapacity(units: Unit[], step: number, lastK: number): (Mix | undefined)[] {
	const cheapest: (Mix | undefined)[] = [emptyMix()];
	for (let k = 1; k <= lastK; k++) {
		let chosen: Mix | undefined;
		for (const unit of units) {
			const before = cheapest[k - unit.minutes / step];
			if (!before) continue;
			const mix = addUnits(before, unit, 1);
			if (!chosen || cheaperMix(mix, chosen)) chosen = mix;
		}
		cheapest.push(chosen);
	}
	return cheapest;
}

function cheaperMix(a: Mix, b: Mix): boolean {
	if (a.price60 !== b.price60) return a.price60 < b.price60;
	if (a.increments !== b.increments) return a.increments < b.increments;
	return a.fullDays > b.fullDays;
}

function emptyMix(): Mix {
	return { fullDays: 0, halfDays: 0, increments: 0, price60: 0 };
}

function addUnits(mix: Mix, unit: Unit, count: number): Mix {
	return {
		fullDays: mix.fullDays + (unit.kind === 'fullDay' ? count : 0),
		halfDays: mix.halfDays + (unit.kind === 'halfDay' ? count : 0),
		increments: mix.increments + (unit.kind === 'increment' ? count : 0),
		price60: mix.price60 + unit.price60 * count
	};
}

function toCover(mix: Mix, rates: BlockRates, incrementMinutes: number, blocks: BlockLengths): BlockCover {
	const hourlyMinutes = mix.increments * incrementMinutes;
	const cover: BlockCover = {
		fullDays: mix.fullDays,
		halfDays: mix.halfDays,
		hourlyMinutes,
		increments: mix.increments,
		coveredMinutes: mix.fullDays * blocks.fullDayMinutes + mix.halfDays * blocks.halfDayMinutes + hourlyMinutes,
		fullDayAmount: mix.fullDays * rates.fullDay,
		halfDayAmount: mix.halfDays * rates.halfDay,
		hourlyAmount: hourlyAmount(rates.hourly, hourlyMinutes),
		price: 0
	};
	cover.price = cover.fullDayAmount + cover.halfDayAmount + cover.hourlyAmount;
	return cover;
}

/** price + surcharge of a cover, exactly: price × (capacity × 10 000 + W) ÷ (capacity × 10 000). */
function exactTotal(cover: BlockCover, surchargeBpMinutes: number): { n: bigint; d: bigint } {
	if (cover.coveredMinutes === 0) return { n: BigInt(cover.price), d: 1n }; // nothing booked
	const d = BigInt(cover.coveredMinutes) * 10_000n;
	return { n: BigInt(cover.price) * (d + BigInt(surchargeBpMinutes)), d };
}

function isBetter(a: BlockCover, b: BlockCover, surchargeBpMinutes: number): boolean {
	const ta = exactTotal(a, surchargeBpMinutes);
	const tb = exactTotal(b, surchargeBpMinutes);
	const diff = ta.n * tb.d - tb.n * ta.d;
	if (diff !== 0n) return diff < 0n;
	if (a.hourlyMinutes !== b.hourlyMinutes) return a.hourlyMinutes < b.hourlyMinutes;
	if (a.coveredMinutes !== b.coveredMinutes) return a.coveredMinutes < b.coveredMinutes;
	return a.fullDays > b.fullDays;
}

function gcd(a: number, b: number): number {
	return b === 0 ? a : gcd(b, a % b);
}

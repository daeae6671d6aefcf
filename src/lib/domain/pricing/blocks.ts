/**
 * Block pricing: the cheapest mix of full-day blocks, half-day blocks and hourly time that covers
 * the booked time (PRODUCT.md; selling hourly time, half days and full days is common practice in
 * studios, and "the cheapest cover" is Slateroom's own rule).
 *
 * Hourly time is billed per booking increment, pro rata of the hourly rate: with a 30-minute
 * increment, 2 h 10 min of hourly time bills as 2 h 30 min, and 30 min costs half the hourly rate.
 * A block or hourly price of 0 means the studio does not sell it (common practice for a rate
 * card with an empty cell); when nothing is sold at all, the time is free.
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
	/** Minutes the cover pays for (≥ the booked minutes). */
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

/** Longest booking priced by enumeration: a year; far beyond any studio's opening hours. */
const MAX_MINUTES = 366 * 24 * 60;

/**
 * The cheapest cover of `minutes` booked minutes. Exact enumeration over the counts of full and
 * half days (each loop stops at the first count that covers the time on its own); the rest is
 * hourly time rounded up to the increment. Ties go to fewer hourly minutes, then to less time
 * covered, then to more full days, so the result is deterministic.
 */
export function cheapestCover(minutes: number, rates: BlockRates, blocks: BlockLengths, incrementMinutes: number): BlockCover {
	if (!Number.isInteger(minutes) || minutes < 0 || minutes > MAX_MINUTES) {
		throw new RangeError(`cannot price ${minutes} minutes`);
	}
	if (!Number.isInteger(incrementMinutes) || incrementMinutes <= 0) {
		throw new RangeError('incrementMinutes must be a positive integer');
	}
	const fullSold = rates.fullDay > 0 && blocks.fullDayMinutes > 0;
	const halfSold = rates.halfDay > 0 && blocks.halfDayMinutes > 0;
	const hourlySold = rates.hourly > 0 || (!fullSold && !halfSold);

	let best: BlockCover | undefined;
	const maxFull = fullSold ? Math.ceil(minutes / blocks.fullDayMinutes) : 0;
	for (let fullDays = 0; fullDays <= maxFull; fullDays++) {
		const afterFull = Math.max(0, minutes - fullDays * blocks.fullDayMinutes);
		const maxHalf = halfSold ? Math.ceil(afterFull / blocks.halfDayMinutes) : 0;
		for (let halfDays = 0; halfDays <= maxHalf; halfDays++) {
			const rest = Math.max(0, afterFull - halfDays * blocks.halfDayMinutes);
			if (rest > 0 && !hourlySold) continue;
			const hourlyMinutes = ceilToMultiple(rest, incrementMinutes);
			const candidate: BlockCover = {
				fullDays,
				halfDays,
				hourlyMinutes,
				increments: hourlyMinutes / incrementMinutes,
				coveredMinutes: fullDays * blocks.fullDayMinutes + halfDays * blocks.halfDayMinutes + hourlyMinutes,
				fullDayAmount: fullDays * rates.fullDay,
				halfDayAmount: halfDays * rates.halfDay,
				hourlyAmount: hourlyAmount(rates.hourly, hourlyMinutes),
				price: 0
			};
			candidate.price = candidate.fullDayAmount + candidate.halfDayAmount + candidate.hourlyAmount;
			if (!best || isBetter(candidate, best)) best = candidate;
		}
	}
	if (!best) throw new RangeError('the rate card sells no time'); // unreachable: see hourlySold
	return best;
}

function isBetter(a: BlockCover, b: BlockCover): boolean {
	if (a.price !== b.price) return a.price < b.price;
	if (a.hourlyMinutes !== b.hourlyMinutes) return a.hourlyMinutes < b.hourlyMinutes;
	if (a.coveredMinutes !== b.coveredMinutes) return a.coveredMinutes < b.coveredMinutes;
	return a.fullDays > b.fullDays;
}

/**
 * Property tests (fast-check) over quotes. Demo bookings are drawn inside the demo's opening
 * hours (09:00–23:00, 30-minute grid, at least 2 h) on any day of 2026–2027, so they include
 * weekends, Finnish public holidays (date-holidays) and both DST changes.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEMO_POLICY, DEMO_ROOMS } from '../demo';
import type { GearHire, RoomRates, StudioPolicy, SurchargeRule } from '../types';
import { quoteBooking } from './quote';
import { validateBookingTimes } from './validation';
import { addDays, localToInstant } from '../time';
import { expectEn16931, openAllHours } from '$fixtures/pricing';

const SLOT = 30;
const OPEN = 9 * 60;
const SLOTS_PER_DAY = (23 * 60 - OPEN) / SLOT; // 28

const gearArb: fc.Arbitrary<GearHire[]> = fc.array(
	fc.record({ id: fc.uuid(), label: fc.constant('Gear'), fee: fc.integer({ min: 0, max: 20_000 }) }),
	{ maxLength: 4 }
);

/** A booking the demo studio accepts: day, start slot, length in slots. */
const demoBookingArb = fc
	.record({
		day: fc.integer({ min: 0, max: 729 }),
		startSlot: fc.integer({ min: 0, max: SLOTS_PER_DAY - 4 }),
		lengthSeed: fc.nat(),
		room: fc.constantFrom(...DEMO_ROOMS),
		engineer: fc.boolean(),
		gear: gearArb
	})
	.map(({ day, startSlot, lengthSeed, ...rest }) => {
		const maxLength = SLOTS_PER_DAY - startSlot;
		const lengthSlots = 4 + (lengthSeed % (maxLength - 3));
		const ymd = addDays('2026-01-01', day);
		return { ...rest, ymd, startSlot, lengthSlots };
	});

const instant = (ymd: string, slot: number) => localToInstant(ymd, OPEN + slot * SLOT, DEMO_POLICY.timeZone).instant;

function quoteOf(
	b: { ymd: string; startSlot: number; lengthSlots: number; room: RoomRates; engineer: boolean; gear: GearHire[] },
	policy: StudioPolicy = DEMO_POLICY
) {
	return quoteBooking({
		start: instant(b.ymd, b.startSlot),
		end: instant(b.ymd, b.startSlot + b.lengthSlots),
		room: b.room,
		engineer: b.engineer,
		gear: b.gear,
		policy
	});
}

/** Every number anywhere in a value is a safe integer (money never floats). */
function allIntegers(value: unknown): boolean {
	if (typeof value === 'number') return Number.isSafeInteger(value);
	if (Array.isArray(value)) return value.every(allIntegers);
	if (value && typeof value === 'object') return Object.values(value).every(allIntegers);
	return true;
}

describe('quote properties on demo bookings', () => {
	it('every quote satisfies EN 16931 BR-CO-10/13/14/15/16/17; Σ line nets = net; deposit + balance = total; all integers', () => {
		fc.assert(
			fc.property(demoBookingArb, (b) => {
				const q = quoteOf(b);
				expectEn16931(q);
				expect(q.lines.reduce((n, l) => n + l.net, 0)).toBe(q.net);
				expect(q.deposit + q.balance).toBe(q.total);
				expect(q.deposit).toBeLessThanOrEqual(q.total);
				expect(q.deposit).toBeGreaterThanOrEqual(Math.min(q.total, DEMO_POLICY.depositMinimum));
				expect(allIntegers(q)).toBe(true);
				// The total is exactly the advertised gross (prices include VAT in the demo).
				expect(q.total).toBe(q.lines.reduce((n, l) => n + l.amount, 0));
			}),
			{ numRuns: 300 }
		);
	});

	it('every generated booking is one the demo accepts (so the other properties test real bookings)', () => {
		fc.assert(
			fc.property(demoBookingArb, (b) => {
				const start = instant(b.ymd, b.startSlot);
				const now = new Date(start.getTime() - 3 * 86_400_000);
				expect(validateBookingTimes(start, instant(b.ymd, b.startSlot + b.lengthSlots), DEMO_POLICY, now)).toEqual([]);
			}),
			{ numRuns: 100 }
		);
	});

	it('the total never decreases when the booking gets longer, at either end, within opening hours', () => {
		// Proof in quote.ts: the cover of the longer booking also covers the shorter one and its
		// surcharge there is no larger; rounding is once per resource, so it holds to the cent.
		fc.assert(
			fc.property(demoBookingArb, fc.nat(), fc.nat(), (b, earlierSeed, laterSeed) => {
				const earlier = earlierSeed % (b.startSlot + 1);
				const later = laterSeed % (SLOTS_PER_DAY - b.startSlot - b.lengthSlots + 1);
				const shorter = quoteOf(b);
				const longer = quoteOf({ ...b, startSlot: b.startSlot - earlier, lengthSlots: b.lengthSlots + earlier + later });
				expect(longer.total).toBeGreaterThanOrEqual(shorter.total);
			}),
			{ numRuns: 500 }
		);
	});
});

describe('quote properties on any rate card, VAT setting and instant (incl. DST nights)', () => {
	const policyArb = fc.record({
		vatRateBp: fc.constantFrom(0, 550, 1000, 1400, 2400, 2550, 2700),
		pricesIncludeVat: fc.boolean(),
		hourly: fc.integer({ min: 0, max: 50_000 }),
		halfDay: fc.integer({ min: 0, max: 200_000 }),
		fullDay: fc.integer({ min: 0, max: 400_000 }),
		increment: fc.constantFrom(15, 30, 60)
	});
	// Any start on a 15-minute step in 2027 (UTC), any length up to 30 h.
	const startArb = fc.integer({ min: 0, max: 365 * 96 }).map((q) => new Date(Date.UTC(2027, 0, 1) + q * 15 * 60_000));

	type PolicyParams = {
		vatRateBp: number;
		pricesIncludeVat: boolean;
		hourly: number;
		halfDay: number;
		fullDay: number;
		increment: number;
	};
	const setup = (p: PolicyParams, surcharges: boolean) => ({
		policy: openAllHours({
			vatRateBp: p.vatRateBp,
			pricesIncludeVat: p.pricesIncludeVat,
			incrementMinutes: p.increment,
			...(surcharges ? {} : { surcharges: [] })
		}),
		room: { slug: 'r', name: 'Room', rates: { hourly: p.hourly, halfDay: p.halfDay, fullDay: p.fullDay } }
	});

	it('satisfies EN 16931 and keeps every amount an integer', () => {
		fc.assert(
			fc.property(
				policyArb,
				startArb,
				fc.integer({ min: 1, max: 120 }),
				fc.boolean(),
				gearArb,
				(p, start, quarters, engineer, gear) => {
					const { policy, room } = setup(p, true);
					const end = new Date(start.getTime() + quarters * 15 * 60_000);
					const q = quoteBooking({ start, end, room, engineer, gear, policy });
					expectEn16931(q);
					expect(allIntegers(q)).toBe(true);
					expect(q.durationMinutes).toBe(quarters * 15); // real elapsed minutes, DST or not
					expect(q.deposit + q.balance).toBe(q.total);
				}
			),
			{ numRuns: 200 }
		);
	});

	/** Any surcharge windows (wrapping past midnight too), 0–250 %, plus maybe the FI holiday rule. */
	const surchargesArb: fc.Arbitrary<SurchargeRule[]> = fc
		.tuple(
			fc.array(
				fc.record({
					percentBp: fc.integer({ min: 0, max: 25_000 }),
					weekdays: fc.subarray([1, 2, 3, 4, 5, 6, 7]),
					fromMinute: fc.integer({ min: 0, max: 96 }).map((q) => q * 15),
					toMinute: fc.integer({ min: 0, max: 96 }).map((q) => q * 15)
				}),
				{ maxLength: 4 }
			),
			fc.option(fc.integer({ min: 0, max: 25_000 }), { nil: undefined })
		)
		.map(([windows, holidayBp]) => [
			...windows.map((w, i) => ({ id: `w${i}`, label: `Window ${i}`, kind: 'window' as const, ...w })),
			...(holidayBp === undefined
				? []
				: [
						{
							id: 'holiday',
							label: 'Holiday',
							kind: 'holiday' as const,
							percentBp: holidayBp,
							weekdays: [],
							fromMinute: 0,
							toMinute: 1440
						}
					])
		]);
	const ratesArb = fc.record({
		hourly: fc.integer({ min: 0, max: 50_000 }),
		halfDay: fc.integer({ min: 0, max: 200_000 }),
		fullDay: fc.integer({ min: 0, max: 400_000 })
	});
	// Block lengths on a 15-minute grid: half day 1–10 h, full day from the half day up to 20 h.
	const blocksArb = fc
		.tuple(fc.integer({ min: 4, max: 40 }), fc.integer({ min: 0, max: 40 }))
		.map(([half, more]) => ({ halfDayMinutes: half * 15, fullDayMinutes: (half + more) * 15 }));

	it('with any rate cards, block lengths and surcharges, the total never decreases when the booking gets longer at either end', () => {
		// Open round the clock, so every extension is within opening hours; across DST nights too.
		fc.assert(
			fc.property(
				policyArb,
				ratesArb,
				blocksArb,
				surchargesArb,
				startArb,
				fc.integer({ min: 1, max: 120 }),
				fc.integer({ min: 0, max: 24 }),
				fc.integer({ min: 0, max: 24 }),
				fc.boolean(),
				gearArb,
				(p, engineerRates, blocks, surcharges, start, quarters, before, after, engineer, gear) => {
					const { room } = setup(p, true);
					const policy = openAllHours({
						vatRateBp: p.vatRateBp,
						pricesIncludeVat: p.pricesIncludeVat,
						incrementMinutes: p.increment,
						blocks,
						surcharges,
						engineerRates
					});
					const q = (s: Date, e: Date) => quoteBooking({ start: s, end: e, room, engineer, gear, policy }).total;
					const end = new Date(start.getTime() + quarters * 15 * 60_000);
					const longerStart = new Date(start.getTime() - before * 15 * 60_000);
					const longerEnd = new Date(end.getTime() + after * 15 * 60_000);
					expect(q(longerStart, longerEnd)).toBeGreaterThanOrEqual(q(start, end));
				}
			),
			{ numRuns: 400 }
		);
	});
});

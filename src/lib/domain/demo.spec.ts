import { describe, expect, it } from 'vitest';
import { DEMO_POLICY, DEMO_ROOMS, DEMO_STUDIO, demoPolicy, demoRoom } from './demo';

describe('demo values (the invented demo studio of src/lib/domain/demo.ts)', () => {
	it('has the demo rate card, in cents', () => {
		expect(DEMO_STUDIO.name).toBe('Hollow Pine Studio');
		expect(DEMO_ROOMS.map((r) => [r.slug, r.rates.hourly, r.rates.halfDay, r.rates.fullDay])).toEqual([
			['live-room', 4500, 16000, 30000],
			['vocal-booth', 3000, 10000, 19000],
			['control-room', 4000, 14000, 26000]
		]);
		expect(DEMO_POLICY.engineerRates).toEqual({ hourly: 3500, halfDay: 12000, fullDay: 23000 });
	});

	it('has the demo policy', () => {
		expect(DEMO_POLICY).toMatchObject({
			timeZone: 'Europe/Helsinki',
			currency: 'EUR',
			country: 'FI',
			vatRateBp: 2550,
			pricesIncludeVat: true,
			blocks: { halfDayMinutes: 240, fullDayMinutes: 480 },
			minBookingMinutes: 120,
			incrementMinutes: 30,
			turnaroundMinutes: 30,
			minNoticeMinutes: 1440,
			horizonDays: 180,
			holdMinutes: 30,
			depositBp: 3000,
			depositMinimum: 5000,
			overtimeIncrementMinutes: 15
		});
		expect(DEMO_POLICY.openingHours).toHaveLength(7);
		expect(DEMO_POLICY.openingHours.every((h) => h.openMinute === 540 && h.closeMinute === 1380)).toBe(true);
		expect(DEMO_POLICY.surcharges.map((s) => [s.id, s.percentBp])).toEqual([
			['evening', 2500],
			['weekend', 2000],
			['holiday', 5000]
		]);
	});

	it('keeps the shared constants frozen and hands out mutable copies', () => {
		expect(Object.isFrozen(DEMO_POLICY.surcharges[0])).toBe(true);
		const copy = demoPolicy();
		copy.depositBp = 5000;
		expect(DEMO_POLICY.depositBp).toBe(3000);
		expect(demoRoom('vocal-booth').name).toBe('Vocal booth');
		expect(() => demoRoom('attic')).toThrow(RangeError);
	});
});

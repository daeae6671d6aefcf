import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEMO_POLICY } from '../demo';
import { overtimeCharge, type OvertimeInput } from './overtime';
import { at, expectEn16931, LIVE_ROOM, line } from '$fixtures/pricing';

const overtime = (overrides: Partial<OvertimeInput> & Pick<OvertimeInput, 'bookedEnd' | 'actualEnd'>) => {
	const o = overtimeCharge({ room: LIVE_ROOM, engineer: false, policy: DEMO_POLICY, ...overrides });
	expectEn16931(o);
	return o;
};

describe('overtime per started increment (our rule: each started 15 min at the hourly rate and surcharges)', () => {
	const bookedEnd = at('2027-03-02', '17:00'); // a Tuesday, before the evening window

	it('bills one increment for the first minute over: 45.00 × 15/60 = 11.25', () => {
		const o = overtime({ bookedEnd, actualEnd: at('2027-03-02', '17:01') });
		expect(o).toMatchObject({ overtimeMinutes: 1, increments: 1, billedMinutes: 15, total: 1125 });
		expect(line(o, 'overtime:room')).toMatchObject({
			label: 'Overtime, Live room (1 × 15 min)',
			quantity: '0.25',
			unitCode: 'HUR',
			unitAmount: 4500,
			amount: 1125
		});
	});

	it('bills exactly 15 min as one increment and 16 min as two', () => {
		expect(overtime({ bookedEnd, actualEnd: at('2027-03-02', '17:15') }).increments).toBe(1);
		const two = overtime({ bookedEnd, actualEnd: at('2027-03-02', '17:16') });
		expect(two.increments).toBe(2);
		expect(two.total).toBe(2250); // 45.00 × 30/60
	});

	it("adds the engineer's hourly rate pro rata: 35.00 × 15/60 = 8.75", () => {
		const o = overtime({ bookedEnd, actualEnd: at('2027-03-02', '17:10'), engineer: true });
		expect(line(o, 'overtime:engineer').amount).toBe(875);
		expect(o.total).toBe(1125 + 875);
	});

	it('carries the evening surcharge of the billed minutes, highest per minute', () => {
		// Booked end 17:50, actual 18:20 → 2 increments, billed 17:50–18:20; 20 of 30 min are evening.
		// Room 22.50 + 22.50 × 25 % × 20/30 = 3.75; engineer 17.50 + 17.50 × 25 % × 20/30 = 2.916… → 2.92.
		const o = overtime({ bookedEnd: at('2027-03-02', '17:50'), actualEnd: at('2027-03-02', '18:20'), engineer: true });
		expect(line(o, 'overtime-surcharge:evening:room')).toMatchObject({
			amount: 375,
			label: 'Evening surcharge on Live room overtime (25 %, 20 min)'
		});
		expect(line(o, 'overtime-surcharge:evening:engineer').amount).toBe(292);
		expect(o.total).toBe(2250 + 1750 + 375 + 292);
	});

	it('on Independence Day the +50 % applies to overtime too', () => {
		// 2027-12-06 booked end 20:00, actual 20:30: 22.50 + 50 % = 33.75.
		const o = overtime({ bookedEnd: at('2027-12-06', '20:00'), actualEnd: at('2027-12-06', '20:30') });
		expect(o.total).toBe(3375);
	});

	it('charges nothing when the session ends on time or early', () => {
		const o = overtime({ bookedEnd, actualEnd: at('2027-03-02', '16:30') });
		expect(o).toMatchObject({ lines: [], total: 0, increments: 0, billedMinutes: 0 });
	});

	it('never decreases as the session runs longer, and every amount is an integer (property)', () => {
		fc.assert(
			fc.property(fc.integer({ min: 0, max: 600 }), fc.integer({ min: 0, max: 120 }), fc.boolean(), (over, more, engineer) => {
				const base = at('2027-03-05', '16:00'); // a Friday; runs on into Saturday
				const end = (m: number) => new Date(base.getTime() + m * 60_000);
				const a = overtime({ bookedEnd: base, actualEnd: end(over), engineer });
				const b = overtime({ bookedEnd: base, actualEnd: end(over + more), engineer });
				expect(b.total).toBeGreaterThanOrEqual(a.total);
				expect(Number.isSafeInteger(a.total)).toBe(true);
			}),
			{ numRuns: 150 }
		);
	});
});

describe('overtime: the increment, and surcharges on the engineer', () => {
	it('refuses an increment that is not a positive whole number of minutes', () => {
		for (const overtimeIncrementMinutes of [0, -15, 7.5]) {
			expect(() =>
				overtimeCharge({
					bookedEnd: at('2027-03-02', '17:00'),
					actualEnd: at('2027-03-02', '17:20'),
					room: LIVE_ROOM,
					engineer: true,
					policy: { ...DEMO_POLICY, overtimeIncrementMinutes }
				})
			).toThrow('overtimeIncrementMinutes must be a positive integer');
		}
	});

	it('names the engineer’s evening surcharge on overtime as such: 20 min past 18:00 bills 30 min at +25 %', () => {
		const o = overtime({ bookedEnd: at('2027-03-02', '18:00'), actualEnd: at('2027-03-02', '18:20'), engineer: true });
		expect(o.lines.map((l) => l.label)).toContain('Evening surcharge on engineer overtime (25 %, 30 min)');
	});
});

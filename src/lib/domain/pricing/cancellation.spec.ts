import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEMO_POLICY } from '../demo';
import { refundForCancellation } from './cancellation';

const start = new Date('2027-03-10T08:00:00Z'); // 10:00 in Helsinki
const hoursBefore = (h: number) => new Date(start.getTime() - h * 3_600_000);
const refund = (paid: number, deposit: number, noticeHours: number) =>
	refundForCancellation({ paid, deposit, bookingStart: start, cancelledAt: hoursBefore(noticeHours), policy: DEMO_POLICY });

describe('refund on cancellation (demo ladder: ≥ 7 days all, 48 h–7 days half, < 48 h nothing)', () => {
	it('refunds the whole deposit with 7 days or more', () => {
		expect(refund(6200, 6200, 8 * 24)).toMatchObject({
			refund: 6200,
			refundBp: 10_000,
			noticeHours: 192,
			rungLabel: "7 days' notice or more: whole deposit refunded"
		});
		expect(refund(6200, 6200, 168).refund).toBe(6200); // exactly 7 days still counts
	});

	it('refunds half from 48 hours up to 7 days', () => {
		expect(refund(6200, 6200, 167.99).refund).toBe(3100);
		expect(refund(6200, 6200, 48)).toMatchObject({
			refund: 3100,
			rungLabel: "48 hours to 7 days' notice: half the deposit refunded"
		});
		// Half of 61.51 = 30.755 → 30.76 (half-up to cents).
		expect(refund(6151, 6151, 72).refund).toBe(3076);
	});

	it('refunds nothing of the deposit under 48 hours, or after the start', () => {
		expect(refund(6200, 6200, 47.99)).toMatchObject({
			refund: 0,
			retained: 6200,
			rungLabel: "Under 48 hours' notice: no refund of the deposit"
		});
		expect(refund(6200, 6200, -1)).toMatchObject({
			refund: 0,
			rungLabel: 'Cancelled after the start: no refund of the deposit'
		});
	});

	it('never refunds more than was paid', () => {
		// Deposit not (fully) paid yet: paid 30.00 of a 62.00 deposit, 10 days' notice.
		expect(refund(3000, 6200, 240).refund).toBe(3000);
		expect(refund(0, 6200, 240).refund).toBe(0);
	});

	it('refunds a balance paid in advance in full; the ladder applies to the deposit only', () => {
		// Paid 205.00 (deposit 62.00 + balance 143.00), cancelled 24 h before: keep 62.00.
		expect(refund(20500, 6200, 24)).toMatchObject({ refund: 14300, depositRefund: 0, balanceRefund: 14300, retained: 6200 });
		// Same at 3 days' notice: half the deposit (31.00) + the balance.
		expect(refund(20500, 6200, 72).refund).toBe(3100 + 14300);
	});

	it('never exceeds payments and never shrinks with more notice (property)', () => {
		fc.assert(
			fc.property(
				fc.integer({ min: 0, max: 10_000_000 }),
				fc.integer({ min: 0, max: 10_000_000 }),
				fc.integer({ min: -1000, max: 24 * 400 }),
				fc.integer({ min: 0, max: 500 }),
				(paid, deposit, notice, more) => {
					const a = refund(paid, deposit, notice);
					const b = refund(paid, deposit, notice + more);
					expect(a.refund).toBeGreaterThanOrEqual(0);
					expect(a.refund).toBeLessThanOrEqual(paid);
					expect(a.refund + a.retained).toBe(paid);
					expect(Number.isSafeInteger(a.refund)).toBe(true);
					expect(b.refund).toBeGreaterThanOrEqual(a.refund);
				}
			)
		);
	});
});

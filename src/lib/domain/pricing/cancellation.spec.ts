import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEMO_POLICY } from '../demo';
import { refundForCancellation, rungLabel } from './cancellation';

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

describe('a ladder as the owner sets it (any order, any rungs), and its words', () => {
	const cancelAt = (noticeHours: number, cancellation: { minNoticeHours: number; refundBp: number }[]) =>
		refundForCancellation({
			paid: 10_000,
			deposit: 10_000,
			bookingStart: start,
			cancelledAt: hoursBefore(noticeHours),
			policy: { cancellation }
		});

	it('takes the highest rung the notice reaches, whatever order the rungs are listed in', () => {
		const ascending = [
			{ minNoticeHours: 0, refundBp: 0 },
			{ minNoticeHours: 48, refundBp: 5_000 },
			{ minNoticeHours: 168, refundBp: 10_000 }
		];
		// 200 h reaches all three rungs; the highest (7 days) refunds everything.
		expect(cancelAt(200, ascending)).toMatchObject({ refund: 10_000, refundBp: 10_000 });
		expect(cancelAt(100, ascending)).toMatchObject({ refund: 5_000, refundBp: 5_000 });
		expect(cancelAt(10, ascending)).toMatchObject({ refund: 0, refundBp: 0 });
	});

	it('names the lowest rung when the notice reaches none, also when cancelling right at the start', () => {
		const noFloor = [
			{ minNoticeHours: 168, refundBp: 10_000 },
			{ minNoticeHours: 48, refundBp: 5_000 }
		];
		expect(cancelAt(10, noFloor)).toMatchObject({ refund: 0, rungLabel: "Under 48 hours' notice: no refund of the deposit" });
		// Zero notice is not "after the start".
		expect(cancelAt(0, noFloor).rungLabel).toBe("Under 48 hours' notice: no refund of the deposit");
		expect(cancelAt(-0.5, noFloor).rungLabel).toBe('Cancelled after the start: no refund of the deposit');
		expect(cancelAt(10, [])).toMatchObject({ refund: 0, rungLabel: 'No cancellation ladder: no refund of the deposit' });
	});

	it('says whole days from 3 days on and hours below, "1 hour" in the singular, and any other share as a percent', () => {
		expect(rungLabel({ minNoticeHours: 72, refundBp: 2_500 })).toBe("3 days' notice or more: 25 % of the deposit refunded");
		expect(rungLabel({ minNoticeHours: 48, refundBp: 7_550 })).toBe("48 hours' notice or more: 75.5 % of the deposit refunded");
		// Days only when the hours are whole days: 100 h stays 100 hours.
		expect(rungLabel({ minNoticeHours: 100, refundBp: 10_000 })).toBe("100 hours' notice or more: whole deposit refunded");
		expect(rungLabel({ minNoticeHours: 1, refundBp: 0 }, { minNoticeHours: 96, refundBp: 5_000 })).toBe(
			"1 hour to 4 days' notice: no refund of the deposit"
		);
		expect(rungLabel({ minNoticeHours: 0, refundBp: 0 }, { minNoticeHours: 1, refundBp: 5_000 })).toBe(
			"Under 1 hour' notice: no refund of the deposit"
		);
	});
});

import { describe, expect, it } from 'vitest';
import {
	AWAITING_DEPOSIT_STATUSES,
	awaitsDeposit,
	BOOKING_MOVES,
	BOOKING_STATUSES,
	OCCUPYING_STATUSES,
	canMove,
	closeRefusal,
	hasEnded,
	holdExpiry,
	holdGone,
	holdLapsed,
	holdLive,
	isBookingStatus,
	isCancellable,
	noShowPolicyMoment,
	noShowRefusal,
	statusesBefore
} from './lifecycle';
import { refundForCancellation } from './pricing';

const start = new Date('2027-03-02T08:00:00Z');

describe('closing a session', () => {
	it('is refused before the session starts, saying when it opens', () => {
		const twoWeeksAhead = new Date(start.getTime() - 14 * 86_400_000);
		const refusal = closeRefusal({ status: 'confirmed', startsAt: start }, twoWeeksAhead);
		expect(refusal).toMatchObject({ code: 'not_started', opensAt: start });
		expect(closeRefusal({ status: 'confirmed', startsAt: start }, new Date(start.getTime() - 1))?.code).toBe('not_started');
	});

	it('is allowed from the first minute of the session on', () => {
		expect(closeRefusal({ status: 'confirmed', startsAt: start }, start)).toBeNull();
		expect(closeRefusal({ status: 'confirmed', startsAt: start }, new Date(start.getTime() + 3 * 86_400_000))).toBeNull();
	});

	it('needs a confirmed booking, whatever the time', () => {
		const later = new Date(start.getTime() + 3_600_000);
		for (const status of ['held', 'pending', 'cancelled', 'expired', 'completed', 'no_show']) {
			expect(closeRefusal({ status, startsAt: start }, later)?.code).toBe('not_confirmed');
		}
	});
});

describe('recording that nobody came', () => {
	it('is refused before the start, saying when it opens, and allowed from the start on', () => {
		expect(noShowRefusal({ status: 'confirmed', startsAt: start }, new Date(start.getTime() - 1))).toMatchObject({
			code: 'not_started',
			opensAt: start
		});
		expect(noShowRefusal({ status: 'confirmed', startsAt: start }, start)).toBeNull();
		expect(noShowRefusal({ status: 'confirmed', startsAt: start }, new Date(start.getTime() + 30 * 86_400_000))).toBeNull();
	});

	it('needs a confirmed booking, whatever the time', () => {
		const later = new Date(start.getTime() + 3_600_000);
		for (const status of BOOKING_STATUSES.filter((s) => s !== 'confirmed')) {
			expect(noShowRefusal({ status, startsAt: start }, later)?.code, status).toBe('not_confirmed');
		}
	});

	it('is a move only a confirmed booking makes, and nothing follows it', () => {
		expect(statusesBefore('no_show')).toEqual(['confirmed']);
		for (const to of BOOKING_STATUSES) expect(canMove('no_show', to)).toBe(false);
	});

	it('keeps the slot taken: a no-show occupies its time like a completed session', () => {
		expect(OCCUPYING_STATUSES).toContain('no_show');
		expect(isCancellable('no_show')).toBe(false);
		expect(hasEnded('no_show')).toBe(false);
	});

	it('reads the cancellation ladder at zero notice, whenever it is recorded', () => {
		const policy = {
			cancellation: [
				{ minNoticeHours: 48, refundBp: 5000 },
				{ minNoticeHours: 0, refundBp: 2000 }
			]
		};
		const at = noShowPolicyMoment({ startsAt: start });
		expect(at).toEqual(start);
		// 20 % of a 100.00 deposit: the last rung, although it is recorded a day late.
		expect(refundForCancellation({ paid: 10_000, deposit: 10_000, bookingStart: start, cancelledAt: at, policy }).refund).toBe(
			2000
		);
	});
});

describe('the moves of a booking', () => {
	it('lets a hold be paid, wait for a delayed payment, lapse or be cancelled', () => {
		for (const to of ['pending', 'confirmed', 'cancelled', 'expired'] as const) expect(canMove('held', to)).toBe(true);
		expect(canMove('held', 'completed')).toBe(false);
	});

	it('completes only a confirmed booking, and nothing follows completed or cancelled', () => {
		expect(statusesBefore('completed')).toEqual(['confirmed']);
		for (const to of BOOKING_STATUSES) {
			expect(canMove('completed', to)).toBe(false);
			expect(canMove('cancelled', to)).toBe(false);
		}
	});

	it('brings an expired hold back only through a payment that still arrives', () => {
		expect(canMove('expired', 'confirmed')).toBe(true);
		expect(canMove('expired', 'pending')).toBe(true);
		expect(canMove('expired', 'held')).toBe(false);
		expect(canMove('expired', 'cancelled')).toBe(false);
	});

	it('cancels what is still ahead and wanted, nothing else', () => {
		expect(BOOKING_STATUSES.filter(isCancellable)).toEqual(['held', 'pending', 'confirmed']);
		expect(statusesBefore('cancelled')).toEqual(['held', 'pending', 'confirmed']);
		expect(BOOKING_STATUSES.filter(hasEnded)).toEqual(['cancelled', 'expired']);
	});

	it('knows its own words only', () => {
		expect(isBookingStatus('held')).toBe(true);
		expect(isBookingStatus('HELD')).toBe(false);
		expect(isBookingStatus(undefined)).toBe(false);
	});
});

describe('a hold running out', () => {
	const expiry = new Date('2027-03-02T08:30:00Z');
	const held = { status: 'held', holdExpiresAt: expiry };

	it('has lapsed from its expiry on, not a millisecond before', () => {
		expect(holdLapsed(held, new Date(expiry.getTime() - 1))).toBe(false);
		expect(holdLapsed(held, expiry)).toBe(true);
		expect(holdLapsed(held, expiry.toISOString())).toBe(true);
		expect(holdLive(held, new Date(expiry.getTime() - 1))).toBe(true);
		expect(holdLive(held, expiry)).toBe(false);
	});

	it('is about held bookings only, and a hold without an expiry never lapses', () => {
		expect(holdLapsed({ status: 'pending', holdExpiresAt: expiry }, expiry.getTime() + 1)).toBe(false);
		expect(holdLapsed({ status: 'held', holdExpiresAt: null }, expiry)).toBe(false);
		expect(holdGone({ status: 'expired', holdExpiresAt: null }, 0)).toBe(true);
	});

	it('ends the studio’s hold time after it was made', () => {
		expect(holdExpiry(new Date('2027-03-02T08:00:00Z'), 30).toISOString()).toBe('2027-03-02T08:30:00.000Z');
	});
});

describe('the rules written out whole', () => {
	it('lists every move of the life of a booking, and nothing else', () => {
		// The moves as the header rule states them: a hold is paid, waits for a delayed payment,
		// lapses or is cancelled; a pending payment lands, fails or is cancelled; a confirmed
		// booking is completed, a no-show or cancelled; an expired hold comes back only through a
		// payment.
		expect(BOOKING_MOVES).toEqual({
			held: ['pending', 'confirmed', 'cancelled', 'expired'],
			pending: ['confirmed', 'cancelled', 'expired'],
			confirmed: ['completed', 'no_show', 'cancelled'],
			expired: ['pending', 'confirmed'],
			completed: [],
			no_show: [],
			cancelled: []
		});
		expect(canMove('pending', 'confirmed')).toBe(true);
		expect(canMove('pending', 'expired')).toBe(true);
		expect(canMove('pending', 'held')).toBe(false);
	});

	it('counts as occupying the room what is held, pending, confirmed, completed or a no-show; as awaiting a deposit what is held or pending', () => {
		expect(OCCUPYING_STATUSES).toEqual(['held', 'pending', 'confirmed', 'completed', 'no_show']);
		expect(AWAITING_DEPOSIT_STATUSES).toEqual(['held', 'pending']);
		expect(BOOKING_STATUSES.filter(awaitsDeposit)).toEqual(['held', 'pending']);
	});

	it('reads hold times given as epoch milliseconds', () => {
		const expiry = Date.parse('2027-03-02T08:30:00Z');
		const held = { status: 'held', holdExpiresAt: expiry };
		expect(holdLapsed(held, expiry - 1)).toBe(false);
		expect(holdLapsed(held, expiry)).toBe(true);
		expect(holdLapsed({ status: 'held', holdExpiresAt: new Date(expiry).toISOString() }, expiry)).toBe(true);
	});

	it('calls a hold live or gone only for a held booking (or, gone, an expired one)', () => {
		const expiry = new Date('2027-03-02T08:30:00Z');
		const before = new Date(expiry.getTime() - 60_000);
		for (const status of ['pending', 'confirmed', 'completed', 'cancelled', 'expired']) {
			expect(holdLive({ status, holdExpiresAt: expiry }, before), status).toBe(false);
		}
		for (const status of ['held', 'pending', 'confirmed', 'completed', 'cancelled']) {
			expect(holdGone({ status, holdExpiresAt: expiry }, before), status).toBe(false);
		}
		expect(holdGone({ status: 'held', holdExpiresAt: expiry }, expiry)).toBe(true);
	});

	it('says why a session cannot be closed', () => {
		const startsAt = new Date('2027-03-02T08:00:00Z');
		expect(closeRefusal({ status: 'held', startsAt }, startsAt)).toEqual({
			code: 'not_confirmed',
			message: 'Only a confirmed booking (deposit paid) can be closed.'
		});
		expect(closeRefusal({ status: 'confirmed', startsAt }, new Date(startsAt.getTime() - 1))).toEqual({
			code: 'not_started',
			message: 'The session has not started yet: its end can be recorded once it has begun.',
			opensAt: startsAt
		});
	});
});

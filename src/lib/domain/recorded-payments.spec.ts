import { describe, expect, it } from 'vitest';
import {
	acceptsRecordedPayment,
	amountOwed,
	balanceOwed,
	isRecordedMethod,
	isReversed,
	methodLabel,
	recordedNet,
	recordRefusals,
	reversalOf
} from './recorded-payments';
import { BOOKING_STATUSES } from './lifecycle';

const base = { amount: 15000, paidOn: '2027-03-12', owed: 15000, today: '2027-03-12', bookedOn: '2027-02-01' };

describe('which bookings take a recorded payment', () => {
	it('confirmed and completed only', () => {
		expect(BOOKING_STATUSES.filter(acceptsRecordedPayment)).toEqual(['confirmed', 'completed']);
		expect(acceptsRecordedPayment('no_show')).toBe(false);
		expect(acceptsRecordedPayment('cancelled')).toBe(false);
		expect(acceptsRecordedPayment('nonsense')).toBe(false);
	});
});

describe('methods', () => {
	it('cash and bank transfer are recorded; a card goes through Checkout', () => {
		expect(isRecordedMethod('cash')).toBe(true);
		expect(isRecordedMethod('bank_transfer')).toBe(true);
		expect(isRecordedMethod('card')).toBe(false);
		expect(isRecordedMethod(undefined)).toBe(false);
		expect(methodLabel('cash')).toBe('Cash');
		expect(methodLabel('bank_transfer')).toBe('Bank transfer');
		expect(methodLabel('card')).toBe('Card');
		expect(methodLabel('cheque')).toBe('cheque');
	});
});

describe('checking a payment to record', () => {
	it('takes the whole amount owed, paid today', () => {
		expect(recordRefusals(base)).toEqual([]);
	});

	it('takes part of it, paid on the day the booking was made', () => {
		expect(recordRefusals({ ...base, amount: 1, paidOn: base.bookedOn })).toEqual([]);
	});

	it('refuses nothing, a negative amount, and a fraction of a minor unit', () => {
		for (const amount of [0, -100, 10.5, Number.NaN, Number.MAX_SAFE_INTEGER + 2]) {
			expect(recordRefusals({ ...base, amount })).toEqual([{ field: 'amount', code: 'not_positive', owed: 15000 }]);
		}
	});

	it('refuses one minor unit over what is owed, and says what is owed', () => {
		expect(recordRefusals({ ...base, amount: 15001 })).toEqual([{ field: 'amount', code: 'overpayment', owed: 15000 }]);
		expect(recordRefusals({ ...base, amount: 1, owed: 0 })).toEqual([{ field: 'amount', code: 'overpayment', owed: 0 }]);
	});

	it('refuses a day after today and a day before the booking was made', () => {
		expect(recordRefusals({ ...base, paidOn: '2027-03-13' })).toEqual([{ field: 'paidOn', code: 'future' }]);
		expect(recordRefusals({ ...base, paidOn: '2027-01-31' })).toEqual([{ field: 'paidOn', code: 'before_booking' }]);
	});

	it('gives every problem at once', () => {
		expect(recordRefusals({ ...base, amount: 20000, paidOn: '2028-01-01' }).map((r) => r.field)).toEqual(['amount', 'paidOn']);
	});
});

describe('reversing', () => {
	const original = { id: 'a', amount: 15000, reversesId: null };

	it('records minus the whole amount, once', () => {
		expect(reversalOf(original, [original])).toEqual({ ok: true, amount: -15000 });
		const reversal = { id: 'b', amount: -15000, reversesId: 'a' };
		expect(reversalOf(original, [original, reversal])).toEqual({ ok: false, code: 'already_reversed' });
		expect(isReversed(original, [original, reversal])).toBe(true);
		expect(isReversed(original, [original])).toBe(false);
	});

	it('does not reverse a reversal', () => {
		expect(reversalOf({ id: 'b', amount: -15000, reversesId: 'a' }, [])).toEqual({ ok: false, code: 'is_reversal' });
	});

	it('nets payments and their reversals', () => {
		expect(recordedNet([])).toBe(0);
		expect(recordedNet([{ amount: 15000 }, { amount: 5000 }, { amount: -15000 }])).toBe(5000);
	});
});

describe('what is still owed', () => {
	it('before the final invoice: the quote, less what Checkout brought in, less recorded entries', () => {
		expect(balanceOwed({ final: null, total: 50000, held: 15000, recorded: 0 })).toBe(35000);
		expect(balanceOwed({ final: null, total: 50000, held: 15000, recorded: 20000 })).toBe(15000);
		expect(balanceOwed({ final: null, total: 50000, held: 15000, recorded: 35000 })).toBe(0);
	});

	it('after it: the invoice, less its deposits, card balance payments and every recorded entry', () => {
		const final = { payable: 52000, deposits: 15000 };
		expect(balanceOwed({ final, cardBalance: 0, recorded: 0 })).toBe(37000);
		expect(balanceOwed({ final, cardBalance: 7000, recorded: 30000 })).toBe(0);
		expect(balanceOwed({ final, cardBalance: 0, recorded: 12000 })).toBe(25000);
	});

	it('tells an overpayment apart before it is held at 0', () => {
		expect(amountOwed({ final: { payable: 100, deposits: 0 }, cardBalance: 100, recorded: 30 })).toBe(-30);
		expect(amountOwed({ final: null, total: 100, held: 40, recorded: 0 })).toBe(60);
	});

	it('is never below 0', () => {
		expect(balanceOwed({ final: null, total: 100, held: 150, recorded: 0 })).toBe(0);
		expect(balanceOwed({ final: { payable: 100, deposits: 0 }, cardBalance: 100, recorded: 1 })).toBe(0);
	});
});

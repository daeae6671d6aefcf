import { describe, expect, it } from 'vitest';
import { BLOCK_TYPO_FACTOR, checkBlockRates, checkSurcharge, ofLevel, windowSpan } from './rateCardChecks';

// The demo studio's live room: 45.00 per hour, 160.00 the half day (4 h), 300.00 the full day (8 h).
const lengths = { halfDayMinutes: 240, fullDayMinutes: 480 };
const live = { hourly: 4500, halfDay: 16000, fullDay: 30000 };
const levels = (found: { field: string; level: string }[]) => found.map((f) => `${f.field}:${f.level}`);

describe('block rates', () => {
	it('find nothing to say about a sensible rate card', () => {
		expect(checkBlockRates(live, lengths, 'EUR')).toEqual([]);
		// The demo engineer: 35.00, 120.00, 230.00.
		expect(checkBlockRates({ hourly: 3500, halfDay: 12000, fullDay: 23000 }, lengths, 'EUR')).toEqual([]);
	});

	it('refuse a half day dearer than the full day, naming both amounts', () => {
		const found = checkBlockRates({ ...live, halfDay: 31000 }, lengths, 'EUR');
		expect(ofLevel(found, 'error')).toEqual([
			{
				field: 'halfDay',
				level: 'error',
				message: 'The half day (€310.00) costs more than the full day (€300.00): check both for a typo.'
			}
		]);
	});

	it('warn about a half day at the full day’s price', () => {
		expect(levels(checkBlockRates({ hourly: 4500, halfDay: 17000, fullDay: 17000 }, lengths, 'EUR'))).toEqual([
			'halfDay:warning'
		]);
	});

	it('refuse a block that costs its hours many times over (a slipped digit)', () => {
		// 1600.00 for a half day whose 4 hours cost 180.00: an extra zero.
		const found = checkBlockRates({ ...live, halfDay: 160000, fullDay: 300000 }, lengths, 'EUR');
		expect(levels(found)).toEqual(['halfDay:error', 'fullDay:error']);
		expect(found[0]!.message).toContain('€180.00');
		// An hourly rate missing a zero gives the same picture from the other side.
		expect(levels(checkBlockRates({ ...live, hourly: 450 }, lengths, 'EUR'))).toEqual(['halfDay:error', 'fullDay:error']);
	});

	it('warn, without refusing, about a block dearer than its hours but not many times over', () => {
		const found = checkBlockRates({ ...live, halfDay: 20000, fullDay: 38000 }, lengths, 'EUR');
		expect(levels(found)).toEqual(['halfDay:warning', 'fullDay:warning']);
		expect(found[0]!.message).toBe(
			'The half day (€200.00) costs more than its 4 h by the hour (€180.00), so it is never chosen: bookings are priced by the hour instead.'
		);
	});

	it('put the line between a warning and an error at the typo factor', () => {
		const asHours = 4500 * 4;
		const just = checkBlockRates({ hourly: 4500, halfDay: asHours * BLOCK_TYPO_FACTOR - 1, fullDay: 200000 }, lengths, 'EUR');
		expect(just.find((f) => f.field === 'halfDay')?.level).toBe('warning');
		const over = checkBlockRates({ hourly: 4500, halfDay: asHours * BLOCK_TYPO_FACTOR, fullDay: 200000 }, lengths, 'EUR');
		expect(over.find((f) => f.field === 'halfDay')?.level).toBe('error');
	});

	it('warn when two half days undercut the full day', () => {
		expect(levels(checkBlockRates({ hourly: 10000, halfDay: 10000, fullDay: 25000 }, lengths, 'EUR'))).toEqual([
			'fullDay:warning'
		]);
	});

	it('say nothing about blocks against a free hour (an hourly rate of zero)', () => {
		expect(checkBlockRates({ hourly: 0, halfDay: 10000, fullDay: 19000 }, lengths, 'EUR')).toEqual([]);
	});

	it('count in the currency’s own minor units', () => {
		// Yen have none: 5000 yen an hour, a half day of 200000 yen is 10 times its 4 hours.
		const found = checkBlockRates({ hourly: 5000, halfDay: 200000, fullDay: 400000 }, lengths, 'JPY');
		expect(found[0]).toMatchObject({ field: 'halfDay', level: 'error' });
		expect(found[0]!.message).toBe(
			'The half day (JP¥200,000) costs 10 times what its 4 h cost by the hour (JP¥20,000): check for a typo.'
		);
	});
});

describe('surcharges', () => {
	const evening = { percentBp: 2500, kind: 'window' as const, fromMinute: 18 * 60, toMinute: 23 * 60 };

	it('find nothing to say about the demo evening surcharge', () => {
		expect(checkSurcharge(evening)).toEqual([]);
		expect(checkSurcharge({ ...evening, percentBp: 10_000 })).toEqual([]);
	});

	it('warn about a surcharge above 100 %', () => {
		const found = checkSurcharge({ ...evening, percentBp: 25_000 });
		expect(found).toEqual([
			{
				field: 'percent',
				level: 'warning',
				message: '+250 % is above 100 %: it more than doubles the price of every minute it covers. Check that this is meant.'
			}
		]);
	});

	it('say that a window ending before its start runs past midnight, with the hours it covers', () => {
		const found = checkSurcharge({ ...evening, fromMinute: 22 * 60, toMinute: 2 * 60 });
		expect(found).toHaveLength(1);
		expect(found[0]).toMatchObject({ field: 'to', level: 'warning' });
		expect(found[0]!.message).toContain('runs past midnight: 22:00 to 02:00 the next morning, 4 h a night');
	});

	it('read 00:00 as the end of the day, not as a night', () => {
		expect(checkSurcharge({ ...evening, fromMinute: 18 * 60, toMinute: 0 })).toEqual([]);
	});

	it('ignore the window of a holiday surcharge', () => {
		expect(checkSurcharge({ percentBp: 5000, kind: 'holiday', fromMinute: 1200, toMinute: 60 })).toEqual([]);
	});

	it('measure windows in the day and across midnight', () => {
		expect(windowSpan(18 * 60, 23 * 60)).toEqual({ overnight: false, minutes: 300 });
		expect(windowSpan(22 * 60, 2 * 60)).toEqual({ overnight: true, minutes: 240 });
		expect(windowSpan(0, 1440)).toEqual({ overnight: false, minutes: 1440 });
	});
});

describe('the edges of each rule', () => {
	it('say nothing of blocks not offered (0) or priced exactly at their hours', () => {
		expect(checkBlockRates({ hourly: 4500, halfDay: 0, fullDay: 0 }, lengths, 'EUR')).toEqual([]);
		expect(checkBlockRates({ hourly: 0, halfDay: 0, fullDay: 30000 }, lengths, 'EUR')).toEqual([]);
		// 4 h and 8 h at 45.00 are 180.00 and 360.00: a block at that price is a tie, not dearer.
		expect(checkBlockRates({ hourly: 4500, halfDay: 18000, fullDay: 36000 }, lengths, 'EUR')).toEqual([]);
	});

	it('say why a half day at the full day’s price saves nobody anything', () => {
		expect(checkBlockRates({ hourly: 4500, halfDay: 17000, fullDay: 17000 }, lengths, 'EUR')).toEqual([
			{
				field: 'halfDay',
				level: 'warning',
				message: 'The half day costs as much as the full day (€170.00), so nobody is offered a half day’s saving.'.replace(
					'’',
					"'"
				)
			}
		]);
	});

	it('warn when two half days cost less than the full day, but not at exactly twice, nor when the full day is longer', () => {
		expect(checkBlockRates({ ...live, fullDay: 35000 }, lengths, 'EUR')).toEqual([
			{
				field: 'fullDay',
				level: 'warning',
				message: 'Two half days (€320.00) cost less than the full day (€350.00), so the full day is never chosen.'
			}
		]);
		expect(checkBlockRates({ ...live, halfDay: 15000, fullDay: 30000 }, lengths, 'EUR')).toEqual([]);
		// A 10-hour full day covers more than two 4-hour half days: it may cost more than both.
		const long = { halfDayMinutes: 240, fullDayMinutes: 600 };
		expect(checkBlockRates({ hourly: 4500, halfDay: 10000, fullDay: 25000 }, long, 'EUR')).toEqual([]);
	});

	it('give the full day one finding only, the one about its hours', () => {
		// 400.00 is over its 8 hours (360.00) and over two half days (320.00).
		expect(levels(checkBlockRates({ ...live, fullDay: 40000 }, lengths, 'EUR'))).toEqual(['fullDay:warning']);
	});
});

describe('window edges', () => {
	it('take equal ends as a whole day round', () => {
		expect(windowSpan(600, 600)).toEqual({ overnight: true, minutes: 1440 });
	});

	it('leave equal ends to the form’s own error', () => {
		expect(checkSurcharge({ percentBp: 5000, kind: 'window', fromMinute: 600, toMinute: 600 })).toEqual([]);
	});
});

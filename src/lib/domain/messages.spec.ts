import { describe, expect, it } from 'vitest';
import {
	HOUR_MS,
	normaliseReminderHours,
	planMessages,
	reminderDue,
	stillWanted,
	wantedMessages,
	type MessageBooking
} from './messages';
import { localParts, localToInstant } from './time';

const HELSINKI = 'Europe/Helsinki';
const at = (iso: string) => new Date(iso);

function booking(over: Partial<MessageBooking> = {}): MessageBooking {
	return {
		status: 'confirmed',
		startsAt: at('2027-03-10T08:00:00Z'),
		endsAt: at('2027-03-10T12:00:00Z'),
		actualEndsAt: null,
		balanceOwed: null,
		...over
	};
}

describe('the reminders a confirmed session wants', () => {
	it('are one per offset, each that many hours before the start, soonest first', () => {
		const now = at('2027-02-01T00:00:00Z');
		expect(wantedMessages(booking(), [168, 48], now)).toEqual([
			{ kind: 'reminder', key: 'reminder:168', dueAt: at('2027-03-03T08:00:00Z') },
			{ kind: 'reminder', key: 'reminder:48', dueAt: at('2027-03-08T08:00:00Z') }
		]);
	});

	it('leave out a reminder whose time has passed when the session is booked', () => {
		// Booked 24 hours ahead: no 7-day and no 48-hour reminder; a 2-hour one still comes.
		const now = at('2027-03-09T08:00:00Z');
		expect(wantedMessages(booking(), [168, 48, 2], now).map((m) => m.key)).toEqual(['reminder:2']);
		// Exactly at its due time is not ahead any more.
		expect(wantedMessages(booking(), [48], at('2027-03-08T08:00:00Z'))).toEqual([]);
		expect(wantedMessages(booking(), [48], at('2027-03-08T07:59:59.999Z')).map((m) => m.key)).toEqual(['reminder:48']);
	});

	it('keep a reminder already planned for the same instant when its time comes, not one planned for another', () => {
		const now = at('2027-03-08T08:00:05Z');
		const due = at('2027-03-08T08:00:00Z');
		expect(wantedMessages(booking(), [48], now, [{ key: 'reminder:48', dueAt: due }]).map((m) => m.key)).toEqual(['reminder:48']);
		expect(wantedMessages(booking(), [48], now, [{ key: 'reminder:48', dueAt: at('2027-03-01T08:00:00Z') }])).toEqual([]);
		// Once the session has begun no reminder is wanted at all.
		expect(wantedMessages(booking(), [48], at('2027-03-10T08:00:00Z'), [{ key: 'reminder:48', dueAt: due }])).toEqual([]);
	});

	it('are none for a hold, a pending deposit, or a cancelled, expired, no-show or completed session', () => {
		const now = at('2027-02-01T00:00:00Z');
		for (const status of ['held', 'pending', 'cancelled', 'expired', 'no_show', 'completed'] as const) {
			expect(wantedMessages(booking({ status }), [168, 48], now), status).toEqual([]);
		}
	});

	it('are 48 real hours before across a daylight-saving change in the studio’s zone', () => {
		// Finland's clocks go forward on Sunday 28 March 2027 at 03:00 (to 04:00). A session at
		// 10:00 on Monday the 29th: 48 hours before is 09:00 on Saturday the 27th by the wall clock.
		const start = localToInstant('2027-03-29', 10 * 60, HELSINKI).instant;
		const [m] = wantedMessages(
			booking({ startsAt: start, endsAt: new Date(start.getTime() + 4 * HOUR_MS) }),
			[48],
			at('2027-03-01T00:00:00Z')
		);
		expect(start.getTime() - m!.dueAt.getTime()).toBe(48 * HOUR_MS);
		const wall = localParts(m!.dueAt, HELSINKI);
		expect([wall.ymd, wall.minuteOfDay]).toEqual(['2027-03-27', 9 * 60]);
		// And back in October (clocks go back on the 31st): 11:00 on Friday the 29th for a Sunday 10:00 session.
		const autumn = localToInstant('2027-10-31', 10 * 60, HELSINKI).instant;
		const due = reminderDue(autumn, 48);
		expect(autumn.getTime() - due.getTime()).toBe(48 * HOUR_MS);
		const w = localParts(due, HELSINKI);
		expect([w.ymd, w.minuteOfDay]).toEqual(['2027-10-29', 11 * 60]);
	});

	it('take the studio’s offsets once each, whole hours from 1 to 720, and ignore the rest', () => {
		expect(normaliseReminderHours([48, 168, 48, 0, -2, 1.5, 721, 720, 1])).toEqual([720, 168, 48, 1]);
		expect(normaliseReminderHours([])).toEqual([]);
	});
});

describe('the balance request', () => {
	const closed = booking({ status: 'completed', actualEndsAt: at('2027-03-10T12:30:00Z'), balanceOwed: 12_000 });

	it('is due at the recorded end of a completed session with a balance owed', () => {
		expect(wantedMessages(closed, [168, 48], at('2027-03-10T13:00:00Z'))).toEqual([
			{ kind: 'balance_request', key: 'balance_request', dueAt: at('2027-03-10T12:30:00Z') }
		]);
		expect(wantedMessages({ ...closed, actualEndsAt: null }, [], at('2027-03-10T13:00:00Z'))[0]!.dueAt).toEqual(
			at('2027-03-10T12:00:00Z')
		);
	});

	it('is not wanted when nothing is owed, before the final invoice, or for any other status', () => {
		const now = at('2027-03-10T13:00:00Z');
		expect(wantedMessages({ ...closed, balanceOwed: 0 }, [], now)).toEqual([]);
		expect(wantedMessages({ ...closed, balanceOwed: null }, [], now)).toEqual([]);
		for (const status of ['confirmed', 'cancelled', 'no_show', 'expired'] as const) {
			expect(wantedMessages({ ...closed, status }, [], now).filter((m) => m.kind === 'balance_request')).toEqual([]);
		}
	});
});

describe('checking again at send time', () => {
	const due = at('2027-03-08T08:00:00Z');
	const msg = { kind: 'reminder' as const, key: 'reminder:48', dueAt: due };

	it('sends a reminder still wanted at its own time, not one moved, cancelled by status or dropped from the settings', () => {
		const now = at('2027-03-08T08:00:01Z');
		expect(stillWanted(msg, booking(), [48], now)).toBe(true);
		expect(stillWanted(msg, booking({ status: 'cancelled' }), [48], now)).toBe(false);
		expect(stillWanted(msg, booking({ startsAt: at('2027-03-11T08:00:00Z') }), [48], now)).toBe(false);
		expect(stillWanted(msg, booking(), [168], now)).toBe(false);
	});

	it('leaves receipts to their own writer', () => {
		expect(stillWanted({ kind: 'receipt', key: 'receipt:x', dueAt: due }, booking({ status: 'cancelled' }), [], due)).toBe(true);
	});
});

describe('the plan for a booking’s rows', () => {
	const row = (key: string, dueAt: string, extra: { sentAt?: Date; cancelledAt?: Date; kind?: 'reminder' | 'receipt' } = {}) => ({
		kind: extra.kind ?? ('reminder' as const),
		key,
		dueAt: at(dueAt),
		sentAt: extra.sentAt ?? null,
		cancelledAt: extra.cancelledAt ?? null
	});
	const wanted = [
		{ kind: 'reminder' as const, key: 'reminder:168', dueAt: at('2027-03-03T08:00:00Z') },
		{ kind: 'reminder' as const, key: 'reminder:48', dueAt: at('2027-03-08T08:00:00Z') }
	];

	it('adds what is missing, moves what moved, and leaves what matches', () => {
		const plan = planMessages(wanted, [row('reminder:168', '2027-03-03T08:00:00Z'), row('reminder:48', '2027-03-07T08:00:00Z')]);
		expect(plan).toEqual({ upsert: [wanted[1]], cancel: [] });
		expect(planMessages(wanted, [])).toEqual({ upsert: wanted, cancel: [] });
	});

	it('cancels unsent rows no longer wanted, never sent ones or receipts, and never sends a sent key again', () => {
		const plan = planMessages(
			[wanted[1]!],
			[
				row('reminder:168', '2027-03-03T08:00:00Z'),
				row('reminder:24', '2027-03-09T08:00:00Z', { sentAt: at('2027-03-09T08:00:01Z') }),
				row('receipt:p1', '2027-03-01T08:00:00Z', { kind: 'receipt' }),
				row('reminder:48', '2027-03-01T08:00:00Z', { sentAt: at('2027-03-01T08:00:00Z') })
			]
		);
		expect(plan).toEqual({ upsert: [], cancel: ['reminder:168'] });
	});

	it('brings back a cancelled key that is wanted again', () => {
		const plan = planMessages(wanted, [
			row('reminder:168', '2027-03-03T08:00:00Z', { cancelledAt: at('2027-02-01T00:00:00Z') }),
			row('reminder:48', '2027-03-08T08:00:00Z')
		]);
		expect(plan).toEqual({ upsert: [wanted[0]], cancel: [] });
	});
});

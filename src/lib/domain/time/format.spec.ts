import { describe, expect, it } from 'vitest';
import { TZDate } from '@date-fns/tz';
import { formatISO } from 'date-fns';
import {
	formatCalendarDate,
	formatDate,
	formatDateTime,
	formatDuration,
	formatEndTime,
	formatRange,
	formatTime,
	formatTimes,
	isoInZone,
	wallClock,
	wallDateTime
} from './format';

// Cross-checked against date-fns formatISO on @date-fns/tz's TZDate (the IANA database through
// ICU), around the 2027 EU changes (Directive 2000/84/EC: 01:00 UTC on 28 March and 31 October)
// and in zones with half-hour, negative and zero offsets.
describe('isoInZone', () => {
	const zones = ['Europe/Helsinki', 'America/New_York', 'Asia/Kolkata', 'Australia/Adelaide', 'UTC', 'Europe/London'];
	const instants: number[] = [];
	for (const day of ['2027-03-28', '2027-10-31', '2027-03-14', '2027-11-07', '2027-04-04']) {
		const start = Date.parse(`${day}T00:00:00Z`) - 6 * 3_600_000;
		for (let m = 0; m < 36 * 60; m += 30) instants.push(start + m * 60_000);
	}
	instants.push(
		Date.parse('2027-03-28T00:59:59.999Z'),
		Date.parse('2027-03-28T01:00:00.000Z'),
		Date.parse('2026-12-02T12:34:56.789Z')
	);

	it('writes what formatISO writes for a TZDate, across daylight-saving changes', () => {
		for (const zone of zones) {
			for (const ms of instants)
				expect(isoInZone(new Date(ms), zone), `${zone} ${new Date(ms).toISOString()}`).toBe(formatISO(new TZDate(ms, zone)));
		}
	});

	it('gives Helsinki summer time from 04:00 local on 28 March 2027', () => {
		expect(isoInZone(new Date('2027-03-28T00:59:00Z'), 'Europe/Helsinki')).toBe('2027-03-28T02:59:00+02:00');
		expect(isoInZone(new Date('2027-03-28T01:00:00Z'), 'Europe/Helsinki')).toBe('2027-03-28T04:00:00+03:00');
	});
});

describe('wallClock and wallDateTime', () => {
	it('agree with Intl (ICU) reading the same instants in the same zones', () => {
		const intl = (ms: number, timeZone: string) => {
			const parts = Object.fromEntries(
				new Intl.DateTimeFormat('en-GB', {
					timeZone,
					year: 'numeric',
					month: '2-digit',
					day: '2-digit',
					hour: '2-digit',
					minute: '2-digit',
					hourCycle: 'h23'
				})
					.formatToParts(ms)
					.map((p) => [p.type, p.value])
			);
			return `${parts.year}-${parts.month}-${parts.day}T${parts.hour}:${parts.minute}`;
		};
		for (const zone of ['Europe/Helsinki', 'America/New_York', 'Asia/Kolkata', 'UTC']) {
			for (const ms of [
				Date.parse('2027-03-28T00:59:59.999Z'),
				Date.parse('2027-03-28T01:00:00Z'),
				Date.parse('2027-10-31T00:30:00Z')
			]) {
				expect(wallDateTime(ms, zone), zone).toBe(intl(ms, zone));
			}
		}
	});

	it('gives the studio date and time of an instant, an ISO string read as an instant', () => {
		expect(wallClock('2027-10-31T00:30:00Z', 'Europe/Helsinki')).toEqual({ date: '2027-10-31', time: '03:30' });
		expect(wallClock(new Date('2027-10-31T01:30:00Z'), 'Europe/Helsinki')).toEqual({ date: '2027-10-31', time: '03:30' });
		expect(wallDateTime(new Date('2027-03-01T22:30:00Z'), 'Europe/Helsinki')).toBe('2027-03-02T00:30');
	});
});

describe('the end of a span of time', () => {
	// Helsinki is UTC+2 in winter: 22:00Z on 2 March 2027 is midnight between the 2nd and the 3rd.
	const zone = 'Europe/Helsinki';
	it('reads 24:00 when a span ends at the midnight after the day it began (ISO 8601 end of day)', () => {
		expect(formatEndTime('2027-03-02T18:00:00Z', '2027-03-02T22:00:00Z', zone)).toBe('24:00');
		expect(formatTimes('2027-03-02T18:00:00Z', '2027-03-02T22:00:00Z', zone)).toBe('20:00–24:00');
		expect(formatRange('2027-03-02T18:00:00Z', '2027-03-02T22:00:00Z', zone)).toBe('Tue, 2 Mar 2027, 20:00 – 24:00');
		expect(formatEndTime('2027-03-02T18:00:00Z', '2027-03-02T22:00:00Z', zone, 'fi-FI')).toBe('24.00');
	});

	it('keeps 00:00 for a start at midnight, an end a day later, and on a 12-hour clock', () => {
		expect(formatTimes('2027-03-02T22:00:00Z', '2027-03-03T02:00:00Z', zone)).toBe('00:00–04:00');
		expect(formatEndTime('2027-03-01T22:00:00Z', '2027-03-03T22:00:00Z', zone)).toBe('00:00');
		expect(formatEndTime('2027-03-02T18:00:00Z', '2027-03-02T22:00:00Z', zone, 'en-US')).toBe('12:00 AM');
		expect(formatEndTime('2027-03-02T18:00:00Z', '2027-03-02T21:30:00Z', zone)).toBe('23:30');
	});
});

describe('formatDuration', () => {
	it('writes hours and minutes, leaving out a zero part', () => {
		expect(formatDuration(45)).toBe('45 min');
		expect(formatDuration(120)).toBe('2 h');
		expect(formatDuration(150)).toBe('2 h 30 min');
		expect(formatDuration(0)).toBe('0 min');
		expect(formatDuration(72 * 60)).toBe('72 h');
	});
});

// Dates in words for pages and e-mails. Expected values from the Unicode CLDR data for British
// English (day before month, 24-hour clock; CLDR "en_GB" and "en" (US) gregorian patterns) and
// the IANA zones' offsets worked by hand: 2027-03-28T01:00Z is the first instant of Helsinki
// summer time, 04:00+03:00 (Directive 2000/84/EC), and 21:00 the evening before in New York
// (EDT, -04:00 since 14 March). Only the facts are pinned, not ICU's punctuation between them.
describe('formatDateTime, formatTime, formatDate and formatRange', () => {
	const change = '2027-03-28T01:00:00Z';

	it('write the studio’s wall clock in British English by default', () => {
		expect(formatDateTime(change, 'Europe/Helsinki')).toMatch(/^Sun,? 28 Mar 2027,? 04:00$/);
		expect(formatDateTime(new Date(change), 'America/New_York')).toMatch(/^Sat,? 27 Mar 2027,? 21:00$/);
		expect(formatTime(change, 'Europe/Helsinki')).toBe('04:00');
		expect(formatTime(new Date('2027-03-28T00:59:00Z'), 'Europe/Helsinki')).toBe('02:59');
		expect(formatDate(change, 'Europe/Helsinki')).toMatch(/^Sunday,? 28 March 2027$/);
		expect(formatDate(new Date(change), 'America/New_York')).toMatch(/^Saturday,? 27 March 2027$/);
	});

	it('follow the locale asked for (US English: month first, 12-hour clock)', () => {
		expect(formatDateTime(change, 'Europe/Helsinki', 'en-US')).toMatch(/^Sun,? Mar 28,? 2027,? 04:00\sAM$/);
		expect(formatTime(change, 'Asia/Kolkata', 'en-US')).toMatch(/^06:30\sAM$/);
		expect(formatDate(change, 'Europe/Helsinki', 'en-US')).toMatch(/^Sunday,? March 28,? 2027$/);
	});

	it('write a range as its start in full and its end as a time', () => {
		expect(formatRange(change, '2027-03-28T05:30:00Z', 'Europe/Helsinki')).toMatch(/^Sun,? 28 Mar 2027,? 04:00 – 08:30$/);
		expect(formatRange(change, new Date('2027-03-28T05:30:00Z'), 'America/New_York', 'en-US')).toMatch(
			/^Sat,? Mar 27,? 2027,? 09:00\sPM – 01:30\sAM$/
		);
	});
});

describe('formatCalendarDate', () => {
	it('writes the date given, in the locale asked for', () => {
		// 28 March 2027 is a Sunday (ISO 8601 week date 2027-W12-7).
		expect(formatCalendarDate('2027-03-28', { weekday: 'long', day: 'numeric', month: 'long' })).toMatch(/^Sunday,? 28 March$/);
		expect(formatCalendarDate('2027-01-01', { day: 'numeric', month: 'short', year: 'numeric' }, 'en-US')).toBe('Jan 1, 2027');
		expect(formatCalendarDate('2027-12-31', { day: 'numeric', month: 'long', year: 'numeric' })).toBe('31 December 2027');
	});
});

import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { TZDate } from '@date-fns/tz';
import { addDaysToYmd, isoWeekdayOf, localParts, localSegments, localToInstant } from './zonedTime';

const HEL = 'Europe/Helsinki';

describe('local wall time in Europe/Helsinki (IANA tz via @date-fns/tz; Directive 2000/84/EC)', () => {
	it('summer time starts 01:00 UTC on the last Sunday of March 2027: 03:00 jumps to 04:00', () => {
		// Art. 2: 2027-03-28 01:00 UTC. Helsinki is UTC+2 before, UTC+3 after.
		expect(localParts(new Date('2027-03-28T00:59:00Z'), HEL)).toMatchObject({ minuteOfDay: 2 * 60 + 59, offsetMinutes: 120 });
		expect(localParts(new Date('2027-03-28T01:00:00Z'), HEL)).toMatchObject({ minuteOfDay: 4 * 60, offsetMinutes: 180 });
		expect(localToInstant('2027-03-28', 3 * 60 + 30, HEL).kind).toBe('gap');
	});

	it('summer time ends 01:00 UTC on the last Sunday of October 2027: 04:00 falls back to 03:00', () => {
		// Art. 3: 2027-10-31 01:00 UTC. 03:30 happens twice; the first occurrence is UTC+3 (00:30 UTC).
		const r = localToInstant('2027-10-31', 3 * 60 + 30, HEL);
		expect(r.kind).toBe('ambiguous');
		expect(r.instant.toISOString()).toBe('2027-10-31T00:30:00.000Z');
	});

	it('has 23 real hours on 2027-03-28 and 25 on 2027-10-31', () => {
		const hours = (ymd: string) =>
			(localToInstant(addDaysToYmd(ymd, 1), 0, HEL).instant.getTime() - localToInstant(ymd, 0, HEL).instant.getTime()) /
			3_600_000;
		expect(hours('2027-03-28')).toBe(23);
		expect(hours('2027-10-31')).toBe(25);
		expect(hours('2027-03-02')).toBe(24);
	});

	it('splits at local midnight and at offset changes, counting real minutes', () => {
		const start = localToInstant('2027-10-30', 22 * 60, HEL).instant;
		const end = localToInstant('2027-10-31', 22 * 60, HEL).instant;
		const segments = localSegments(start, end, HEL);
		expect(segments.map((s) => [s.ymd, s.startMinuteOfDay, s.minutes])).toEqual([
			['2027-10-30', 22 * 60, 120], // Sat 22:00–24:00
			['2027-10-31', 0, 4 * 60], // Sun 00:00–04:00 summer time
			['2027-10-31', 3 * 60, 19 * 60] // Sun 03:00 (again) –22:00 winter time
		]);
		expect(segments.reduce((n, s) => n + s.minutes, 0)).toBe(25 * 60);
	});

	it('gives ISO weekdays (2027-03-02 is a Tuesday, 2027-12-06 a Monday, 2027-03-28 a Sunday)', () => {
		expect(isoWeekdayOf('2027-03-02')).toBe(2);
		expect(isoWeekdayOf('2027-12-06')).toBe(1);
		expect(isoWeekdayOf('2027-03-28')).toBe(7);
	});

	it('agrees with TZDate minute by minute around both 2027 changes (property)', () => {
		const around = fc.constantFrom('2027-03-28T01:00:00Z', '2027-10-31T01:00:00Z', '2027-06-15T12:00:00Z');
		fc.assert(
			fc.property(around, fc.integer({ min: -48 * 60, max: 48 * 60 }), (anchor, offset) => {
				const instant = new Date(new Date(anchor).getTime() + offset * 60_000);
				const reference = new TZDate(instant.getTime(), HEL);
				const parts = localParts(instant, HEL);
				const ymd = `${reference.getFullYear()}-${String(reference.getMonth() + 1).padStart(2, '0')}-${String(reference.getDate()).padStart(2, '0')}`;
				expect(parts.ymd).toBe(ymd);
				expect(parts.minuteOfDay).toBe(reference.getHours() * 60 + reference.getMinutes());
				expect(parts.isoWeekday).toBe(reference.getDay() === 0 ? 7 : reference.getDay());
				// Every existing wall time resolves back to an instant with that wall time.
				const back = localToInstant(parts.ymd, parts.minuteOfDay, HEL);
				expect(localParts(back.instant, HEL)).toMatchObject({ ymd: parts.ymd, minuteOfDay: parts.minuteOfDay });
			}),
			{ numRuns: 400 }
		);
	});

	it('handles zones off the whole hour (Asia/Kolkata +05:30)', () => {
		const r = localToInstant('2027-03-02', 9 * 60, 'Asia/Kolkata');
		expect(r.instant.toISOString()).toBe('2027-03-02T03:30:00.000Z');
		expect(() => localParts(new Date(), 'Nowhere/Else')).toThrow(RangeError);
	});
});

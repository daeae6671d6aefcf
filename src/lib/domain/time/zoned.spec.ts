import { TZDate } from '@date-fns/tz';
import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import { NonexistentLocalTimeError, TimeInputError } from './errors';
import fc from 'fast-check';
import { addDays, isoWeekday } from './dates';
import { addLocalDays, localDayBounds, localParts, localSegments, localToInstant, resolveWallTime, zonedWallTime } from './zoned';

const HELSINKI = 'Europe/Helsinki';
const HOUR = 3_600_000;

/** Independent oracle: Temporal (temporal-polyfill), not our code, turns a wall time into an instant. */
function temporalInstant(pdt: string, timeZone: string, disambiguation: 'earlier' | 'reject' = 'reject'): Date {
	return new Date(Temporal.PlainDateTime.from(pdt).toZonedDateTime(timeZone, { disambiguation }).epochMilliseconds);
}

describe('localDayBounds', () => {
	it('gives 23 h on 2027-03-28 and 25 h on 2027-10-31 in Europe/Helsinki', () => {
		// Directive 2000/84/EC art. 2–3: summer time from 01:00 UTC on the last Sunday of March to
		// 01:00 UTC on the last Sunday of October; IANA tz: Helsinki is UTC+2, +3 in summer.
		const spring = localDayBounds('2027-03-28', HELSINKI);
		expect(spring.start.toISOString()).toBe('2027-03-27T22:00:00.000Z');
		expect(spring.end.toISOString()).toBe('2027-03-28T21:00:00.000Z');
		expect((spring.end.getTime() - spring.start.getTime()) / HOUR).toBe(23);

		const autumn = localDayBounds('2027-10-31', HELSINKI);
		expect(autumn.start.toISOString()).toBe('2027-10-30T21:00:00.000Z');
		expect(autumn.end.toISOString()).toBe('2027-10-31T22:00:00.000Z');
		expect((autumn.end.getTime() - autumn.start.getTime()) / HOUR).toBe(25);
	});

	it('agrees with Temporal.ZonedDateTime#hoursInDay and @date-fns/tz around the changes', () => {
		for (const ymd of ['2027-01-15', '2027-03-27', '2027-03-28', '2027-03-29', '2027-10-30', '2027-10-31', '2027-11-01']) {
			const b = localDayBounds(ymd, HELSINKI);
			const zdt = Temporal.PlainDate.from(ymd).toZonedDateTime(HELSINKI); // Temporal: start of day
			expect(b.start.getTime()).toBe(zdt.epochMilliseconds);
			expect((b.end.getTime() - b.start.getTime()) / HOUR).toBe(zdt.hoursInDay);
			// @date-fns/tz reads the same instant back as local midnight of that date.
			const back = new TZDate(b.start.getTime(), HELSINKI);
			expect([back.getHours(), back.getMinutes()]).toEqual([0, 0]);
		}
	});

	it('gives 23 h / 25 h days in America/New_York too (US rule: second Sunday of March, first of November)', () => {
		// 15 U.S.C. §260a (Energy Policy Act 2005): 2027-03-14 and 2027-11-07.
		const a = localDayBounds('2027-03-14', 'America/New_York');
		const b = localDayBounds('2027-11-07', 'America/New_York');
		expect((a.end.getTime() - a.start.getTime()) / HOUR).toBe(23);
		expect((b.end.getTime() - b.start.getTime()) / HOUR).toBe(25);
	});
});

describe('zonedWallTime', () => {
	it('gives +02:00 in winter and +03:00 in summer', () => {
		// IANA tz Europe/Helsinki: EET +02:00, EEST +03:00.
		expect(zonedWallTime('2027-01-15', '09:00', HELSINKI).toISOString()).toBe('2027-01-15T07:00:00.000Z');
		expect(zonedWallTime('2027-07-15', '09:00', HELSINKI).toISOString()).toBe('2027-07-15T06:00:00.000Z');
	});

	it('refuses 03:30 on 2027-03-28 (inside the spring-forward gap) with a typed error', () => {
		// Directive 2000/84/EC: at 01:00 UTC Helsinki clocks go 03:00 -> 04:00, so 03:00–03:59 never happen.
		let caught: unknown;
		try {
			zonedWallTime('2027-03-28', '03:30', HELSINKI);
		} catch (e) {
			caught = e;
		}
		expect(caught).toBeInstanceOf(NonexistentLocalTimeError);
		expect(caught).toBeInstanceOf(TimeInputError);
		const err = caught as NonexistentLocalTimeError;
		expect(err.code).toBe('nonexistent-local-time');
		expect(err.message).toMatch(/does not exist in Europe\/Helsinki/);
		expect(err.transition.toISOString()).toBe('2027-03-28T01:00:00.000Z');
		// Temporal agrees the time does not exist ('reject' throws RangeError for gaps).
		expect(() => temporalInstant('2027-03-28T03:30', HELSINKI, 'reject')).toThrow(RangeError);
		expect(() => zonedWallTime('2027-03-28', '03:00', HELSINKI)).toThrow(NonexistentLocalTimeError);
	});

	it('accepts the minutes either side of the gap', () => {
		// 02:59 is still EET (+02:00); 04:00 is the first EEST minute (+03:00).
		expect(zonedWallTime('2027-03-28', '02:59', HELSINKI).toISOString()).toBe('2027-03-28T00:59:00.000Z');
		expect(zonedWallTime('2027-03-28', '04:00', HELSINKI).toISOString()).toBe('2027-03-28T01:00:00.000Z');
	});

	it('resolves the repeated 03:30 on 2027-10-31 to its first occurrence, 03:30+03:00 = 00:30Z', () => {
		// RFC 5545 §3.3.5: a local time that occurs twice means its first occurrence.
		expect(zonedWallTime('2027-10-31', '03:30', HELSINKI).toISOString()).toBe('2027-10-31T00:30:00.000Z');
		// Temporal's 'earlier' disambiguation is the same rule.
		expect(temporalInstant('2027-10-31T03:30', HELSINKI, 'earlier').toISOString()).toBe('2027-10-31T00:30:00.000Z');
		// (new TZDate(2027, 9, 31, 3, 30, zone) is not used for this: which occurrence it picks
		// depends on the HOST zone — +02:00 on a UTC host, +03:00 on an Asia/Kathmandu host.)
	});

	it('reports both occurrences and the gap through resolveWallTime', () => {
		const repeated = resolveWallTime('2027-10-31', '03:30', HELSINKI);
		expect(repeated.kind).toBe('repeated');
		if (repeated.kind === 'repeated') {
			// The two readings 1 h apart: +03:00 then +02:00 (IANA tz).
			expect(repeated.first.toISOString()).toBe('2027-10-31T00:30:00.000Z');
			expect(repeated.second.toISOString()).toBe('2027-10-31T01:30:00.000Z');
		}
		expect(resolveWallTime('2027-03-28', '03:30', HELSINKI).kind).toBe('skipped');
		expect(resolveWallTime('2027-03-28', '05:00', HELSINKI).kind).toBe('unique');
	});

	it('rejects malformed input with TimeInputError codes', () => {
		expect(() => zonedWallTime('2027-02-29', '10:00', HELSINKI)).toThrow(/calendar date/); // 2027 is not a leap year (Gregorian rule)
		expect(() => zonedWallTime('2027-01-15', '24:00', HELSINKI)).toThrow(TimeInputError);
		expect(() => zonedWallTime('2027-01-15', '9:00', HELSINKI)).toThrow(/HH:MM/);
		expect(() => zonedWallTime('2027-01-15', '09:00', 'Mars/Olympus')).toThrow(/Unknown time zone/);
	});
});

describe('addLocalDays', () => {
	it('keeps the wall time across a DST change, like Temporal ZonedDateTime#add({ days })', () => {
		// Temporal proposal: adding days is calendar (nominal) arithmetic in the zone.
		const now = Date.parse('2027-01-01T10:00:00Z'); // 12:00+02:00
		const z = Temporal.Instant.fromEpochMilliseconds(now).toZonedDateTimeISO(HELSINKI).add({ days: 180 });
		expect(addLocalDays(now, 180, HELSINKI)).toBe(z.epochMilliseconds);
		expect(new Date(addLocalDays(now, 180, HELSINKI)).toISOString()).toBe('2027-06-30T09:00:00.000Z'); // 12:00+03:00
	});
});

describe('local wall time in Europe/Helsinki (IANA tz via @date-fns/tz; Directive 2000/84/EC)', () => {
	it('summer time starts 01:00 UTC on the last Sunday of March 2027: 03:00 jumps to 04:00', () => {
		// Art. 2: 2027-03-28 01:00 UTC. Helsinki is UTC+2 before, UTC+3 after.
		expect(localParts(new Date('2027-03-28T00:59:00Z'), HELSINKI)).toMatchObject({
			minuteOfDay: 2 * 60 + 59,
			offsetMinutes: 120
		});
		expect(localParts(new Date('2027-03-28T01:00:00Z'), HELSINKI)).toMatchObject({ minuteOfDay: 4 * 60, offsetMinutes: 180 });
		expect(localToInstant('2027-03-28', 3 * 60 + 30, HELSINKI).kind).toBe('gap');
		// A skipped wall time, as a rule boundary, is the instant the clocks jumped (04:00+03:00).
		expect(localToInstant('2027-03-28', 3 * 60 + 30, HELSINKI).instant.toISOString()).toBe('2027-03-28T01:00:00.000Z');
		expect(localToInstant('2027-03-28', 3 * 60, HELSINKI).instant.toISOString()).toBe('2027-03-28T01:00:00.000Z');
	});

	it('summer time ends 01:00 UTC on the last Sunday of October 2027: 04:00 falls back to 03:00', () => {
		// Art. 3: 2027-10-31 01:00 UTC. 03:30 happens twice; the first occurrence is UTC+3 (00:30 UTC).
		const r = localToInstant('2027-10-31', 3 * 60 + 30, HELSINKI);
		expect(r.kind).toBe('ambiguous');
		expect(r.instant.toISOString()).toBe('2027-10-31T00:30:00.000Z');
	});

	it('has 23 real hours on 2027-03-28 and 25 on 2027-10-31', () => {
		const hours = (ymd: string) =>
			(localToInstant(addDays(ymd, 1), 0, HELSINKI).instant.getTime() - localToInstant(ymd, 0, HELSINKI).instant.getTime()) /
			3_600_000;
		expect(hours('2027-03-28')).toBe(23);
		expect(hours('2027-10-31')).toBe(25);
		expect(hours('2027-03-02')).toBe(24);
	});

	it('splits at local midnight and at offset changes, counting real minutes', () => {
		const start = localToInstant('2027-10-30', 22 * 60, HELSINKI).instant;
		const end = localToInstant('2027-10-31', 22 * 60, HELSINKI).instant;
		const segments = localSegments(start, end, HELSINKI);
		expect(segments.map((s) => [s.ymd, s.startMinuteOfDay, s.minutes])).toEqual([
			['2027-10-30', 22 * 60, 120], // Sat 22:00–24:00
			['2027-10-31', 0, 4 * 60], // Sun 00:00–04:00 summer time
			['2027-10-31', 3 * 60, 19 * 60] // Sun 03:00 (again) –22:00 winter time
		]);
		expect(segments.reduce((n, s) => n + s.minutes, 0)).toBe(25 * 60);
	});

	it('gives ISO weekdays (2027-03-02 is a Tuesday, 2027-12-06 a Monday, 2027-03-28 a Sunday)', () => {
		expect(isoWeekday('2027-03-02')).toBe(2);
		expect(isoWeekday('2027-12-06')).toBe(1);
		expect(isoWeekday('2027-03-28')).toBe(7);
	});

	it('agrees with TZDate minute by minute around both 2027 changes (property)', () => {
		const around = fc.constantFrom('2027-03-28T01:00:00Z', '2027-10-31T01:00:00Z', '2027-06-15T12:00:00Z');
		fc.assert(
			fc.property(around, fc.integer({ min: -48 * 60, max: 48 * 60 }), (anchor, offset) => {
				const instant = new Date(new Date(anchor).getTime() + offset * 60_000);
				const reference = new TZDate(instant.getTime(), HELSINKI);
				const parts = localParts(instant, HELSINKI);
				const ymd = `${reference.getFullYear()}-${String(reference.getMonth() + 1).padStart(2, '0')}-${String(reference.getDate()).padStart(2, '0')}`;
				expect(parts.ymd).toBe(ymd);
				expect(parts.minuteOfDay).toBe(reference.getHours() * 60 + reference.getMinutes());
				expect(parts.isoWeekday).toBe(reference.getDay() === 0 ? 7 : reference.getDay());
				// Every existing wall time resolves back to an instant with that wall time.
				const back = localToInstant(parts.ymd, parts.minuteOfDay, HELSINKI);
				expect(localParts(back.instant, HELSINKI)).toMatchObject({ ymd: parts.ymd, minuteOfDay: parts.minuteOfDay });
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

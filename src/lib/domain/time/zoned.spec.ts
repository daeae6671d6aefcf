import { TZDate } from '@date-fns/tz';
import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import { NonexistentLocalTimeError, TimeInputError } from './errors';
import fc from 'fast-check';
import { addDays, isoWeekday } from './dates';
import {
	addLocalDays,
	assertTimeZone,
	findTransition,
	localDateOf,
	localDayBounds,
	localParts,
	localSegments,
	localToInstant,
	offsetMsAt,
	resolveWallTime,
	zonedWallTime
} from './zoned';

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

describe('the edges of the wall-clock reader (expected values by hand from the IANA tz rules, checked with Temporal)', () => {
	it('reads instants before 1970 and between minutes: 1969-12-31T23:59:30.250Z', () => {
		const ms = Date.parse('1969-12-31T23:59:30.250Z');
		// UTC: a Wednesday (1 January 1970 was a Thursday), 23:59, 30.25 s into the minute.
		expect(localParts(ms, 'UTC')).toEqual({
			ymd: '1969-12-31',
			isoWeekday: 3,
			minuteOfDay: 1439,
			subMinuteMs: 30_250,
			offsetMinutes: 0
		});
		// Helsinki was on EET (+02:00) all year then: already Thursday 1 January, 01:59.
		expect(localParts(new Date(ms), HELSINKI)).toEqual({
			ymd: '1970-01-01',
			isoWeekday: 4,
			minuteOfDay: 119,
			subMinuteMs: 30_250,
			offsetMinutes: 120
		});
		const z = Temporal.Instant.fromEpochMilliseconds(ms).toZonedDateTimeISO(HELSINKI);
		expect([z.toPlainDate().toString(), z.dayOfWeek, z.hour * 60 + z.minute, z.offset]).toEqual(['1970-01-01', 4, 119, '+02:00']);
	});

	it('changes the offset on the millisecond of the autumn change, 01:00:00.000Z on 2027-10-31', () => {
		expect(localParts(new Date('2027-10-31T00:59:59.999Z'), HELSINKI)).toMatchObject({
			minuteOfDay: 239,
			subMinuteMs: 59_999,
			offsetMinutes: 180
		});
		expect(localParts(new Date('2027-10-31T01:00:00.000Z'), HELSINKI)).toMatchObject({
			minuteOfDay: 180,
			subMinuteMs: 0,
			offsetMinutes: 120
		});
		expect(offsetMsAt(HELSINKI, Date.parse('2027-10-31T00:59:59.999Z'))).toBe(3 * HOUR);
		expect(offsetMsAt(HELSINKI, Date.parse('2027-10-31T01:00:00.001Z'))).toBe(2 * HOUR);
	});

	it('finds the instant of a change to the millisecond', () => {
		const lo = Date.parse('2027-03-28T00:00:00Z');
		const hi = Date.parse('2027-03-28T02:00:00Z');
		expect(new Date(findTransition(HELSINKI, lo, hi)).toISOString()).toBe('2027-03-28T01:00:00.000Z');
		expect(new Date(findTransition(HELSINKI, lo, Date.parse('2027-03-28T01:00:00Z'))).toISOString()).toBe(
			'2027-03-28T01:00:00.000Z'
		);
	});

	it('resolves wall times with seconds either side of both changes', () => {
		expect(resolveWallTime('2027-03-28', '03:59:59', HELSINKI)).toEqual({
			kind: 'skipped',
			transition: new Date('2027-03-28T01:00:00Z')
		});
		expect(resolveWallTime('2027-03-28', '02:59:59', HELSINKI)).toEqual({
			kind: 'unique',
			instant: new Date('2027-03-28T00:59:59Z')
		});
		expect(resolveWallTime('2027-10-31', '03:59:59', HELSINKI)).toEqual({
			kind: 'repeated',
			first: new Date('2027-10-31T00:59:59Z'),
			second: new Date('2027-10-31T01:59:59Z')
		});
		expect(resolveWallTime('2027-10-31', '02:59:59', HELSINKI)).toEqual({
			kind: 'unique',
			instant: new Date('2027-10-30T23:59:59Z')
		});
		expect(temporalInstant('2027-10-31T03:59:59', HELSINKI, 'earlier').toISOString()).toBe('2027-10-31T00:59:59.000Z');
	});

	it('starts a day whose midnight is skipped when the clocks jump (Chile: 24:00 → 01:00 on 5 September 2027)', () => {
		// America/Santiago springs forward at local midnight: 2027-09-05 00:00 never happens.
		const r = localToInstant('2027-09-05', 0, 'America/Santiago');
		expect(r).toEqual({ kind: 'gap', instant: new Date('2027-09-05T04:00:00Z') });
		const later = Temporal.PlainDateTime.from('2027-09-05T00:00').toZonedDateTime('America/Santiago', {
			disambiguation: 'later'
		});
		expect(later.toString()).toBe('2027-09-05T01:00:00-03:00[America/Santiago]');
		expect(r.instant.getTime()).toBe(later.epochMilliseconds);
	});

	it('adds days onto a repeated wall time (first occurrence) and onto a skipped one (the jump), keeping milliseconds', () => {
		// 03:30:00.250+03:00 on 30 October, one day on: 03:30 on the 31st happens twice; the first is +03:00.
		expect(new Date(addLocalDays(Date.parse('2027-10-30T00:30:00.250Z'), 1, HELSINKI)).toISOString()).toBe(
			'2027-10-31T00:30:00.250Z'
		);
		// 03:30+02:00 on 27 March, one day on: 03:30 on the 28th does not exist; the day's clocks jumped at 01:00Z.
		expect(new Date(addLocalDays(Date.parse('2027-03-27T01:30:00Z'), 1, HELSINKI)).toISOString()).toBe(
			'2027-03-28T01:00:00.000Z'
		);
	});

	it('splits a night across the spring change and a half-hour change (Lord Howe Island, 4 April 2027)', () => {
		const spring = localSegments(new Date('2027-03-27T20:00:00Z'), new Date('2027-03-28T03:00:00Z'), HELSINKI);
		expect(spring.map((s) => [s.ymd, s.isoWeekday, s.startMinuteOfDay, s.minutes, new Date(s.startMs).toISOString()])).toEqual([
			['2027-03-27', 6, 22 * 60, 120, '2027-03-27T20:00:00.000Z'],
			['2027-03-28', 7, 0, 180, '2027-03-27T22:00:00.000Z'],
			['2027-03-28', 7, 4 * 60, 120, '2027-03-28T01:00:00.000Z']
		]);
		// Australia/Lord_Howe: +11:00 until 02:00 local, then +10:30 (01:30 again).
		const lordHowe = localSegments(new Date('2027-04-03T13:00:00Z'), new Date('2027-04-03T17:00:00Z'), 'Australia/Lord_Howe');
		expect(lordHowe.map((s) => [s.ymd, s.startMinuteOfDay, s.minutes])).toEqual([
			['2027-04-04', 0, 120],
			['2027-04-04', 90, 120]
		]);
		expect(localSegments(new Date('2027-03-27T20:00:00Z'), new Date('2027-03-27T20:00:00Z'), HELSINKI)).toEqual([]);
	});

	it('ends a segment at a change that falls on local midnight (Chile, 5 September 2027), and at midnight from mid-minute', () => {
		// America/Santiago: 24:00 on the 4th is 01:00 on the 5th (-04:00 → -03:00 at 04:00Z).
		const chile = localSegments(new Date('2027-09-05T02:00:00Z'), new Date('2027-09-05T05:00:00Z'), 'America/Santiago');
		expect(chile.map((s) => [s.ymd, s.startMinuteOfDay, s.minutes, new Date(s.startMs).toISOString()])).toEqual([
			['2027-09-04', 22 * 60, 120, '2027-09-05T02:00:00.000Z'],
			['2027-09-05', 60, 60, '2027-09-05T04:00:00.000Z']
		]);
		// From 23:59:30 Helsinki time the first segment lasts 30 s, to local midnight (22:00Z).
		const late = localSegments(new Date('2027-01-15T21:59:30Z'), new Date('2027-01-15T22:01:30Z'), HELSINKI);
		expect(late.map((s) => [s.ymd, new Date(s.startMs).toISOString()])).toEqual([
			['2027-01-15', '2027-01-15T21:59:30.000Z'],
			['2027-01-16', '2027-01-15T22:00:00.000Z']
		]);
	});

	it('finds both occurrences of a repeated time west of Greenwich (New York, 7 November 2027, 15 U.S.C. §260a)', () => {
		// 02:00 EDT falls back to 01:00 EST: 01:30 is 05:30Z (-04:00) and again 06:30Z (-05:00).
		expect(resolveWallTime('2027-11-07', '01:30', 'America/New_York')).toEqual({
			kind: 'repeated',
			first: new Date('2027-11-07T05:30:00Z'),
			second: new Date('2027-11-07T06:30:00Z')
		});
		expect(temporalInstant('2027-11-07T01:30', 'America/New_York', 'earlier').toISOString()).toBe('2027-11-07T05:30:00.000Z');
	});

	it('says a plain wall time is unique, and reads an ISO string as an instant', () => {
		expect(localToInstant('2027-01-15', 600, HELSINKI)).toEqual({ kind: 'unique', instant: new Date('2027-01-15T08:00:00Z') });
		// 22:30Z on 30 October is 01:30+03:00 (summer time) on the 31st in Helsinki.
		expect(localDateOf('2027-10-30T22:30:00Z', HELSINKI)).toBe('2027-10-31');
	});

	it('refuses an empty or missing zone name with its code', () => {
		for (const zone of ['', undefined as unknown as string]) {
			try {
				assertTimeZone(zone);
				expect.unreachable();
			} catch (e) {
				expect(e).toBeInstanceOf(TimeInputError);
				expect((e as TimeInputError).code).toBe('invalid-time-zone');
				expect((e as TimeInputError).message).toBe(`Unknown time zone: ${JSON.stringify(zone)}`);
			}
		}
	});
});

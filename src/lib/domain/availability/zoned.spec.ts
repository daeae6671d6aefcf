import { TZDate } from '@date-fns/tz';
import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import { NonexistentLocalTimeError, TimeInputError } from './errors';
import { HELSINKI } from '$fixtures/availability';
import {
	addLocalDays,
	ceilToLocalGrid,
	floorToLocalGrid,
	isOnLocalGrid,
	localDayBounds,
	parseBookingInstant,
	resolveWallTime,
	zonedWallTime
} from './zoned';

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

describe('parseBookingInstant', () => {
	it('takes an explicit offset or Z as the instant (RFC 3339 §5.6)', () => {
		expect(parseBookingInstant('2027-03-28T10:00:00+03:00', HELSINKI).toISOString()).toBe('2027-03-28T07:00:00.000Z');
		expect(parseBookingInstant('2027-03-28T07:00:00Z', HELSINKI).toISOString()).toBe('2027-03-28T07:00:00.000Z');
		expect(parseBookingInstant('2027-03-28T07:00Z', HELSINKI).toISOString()).toBe('2027-03-28T07:00:00.000Z');
		expect(parseBookingInstant('2027-03-28T07:00:00.250-05:30', HELSINKI).toISOString()).toBe('2027-03-28T12:30:00.250Z');
		// The offset wins even for a wall time that does not exist in the studio's zone.
		expect(parseBookingInstant('2027-03-28T03:30:00+02:00', HELSINKI).toISOString()).toBe('2027-03-28T01:30:00.000Z');
	});

	it('reads a local YYYY-MM-DDTHH:MM in the studio zone, with the gap and overlap rules', () => {
		// IANA tz: 10:00 on 2027-03-28 is already EEST (+03:00).
		expect(parseBookingInstant('2027-03-28T10:00', HELSINKI).toISOString()).toBe('2027-03-28T07:00:00.000Z');
		// RFC 5545 §3.3.5: repeated time -> first occurrence.
		expect(parseBookingInstant('2027-10-31T03:30', HELSINKI).toISOString()).toBe('2027-10-31T00:30:00.000Z');
		// Directive 2000/84/EC gap -> refused.
		expect(() => parseBookingInstant('2027-03-28T03:30', HELSINKI)).toThrow(NonexistentLocalTimeError);
	});

	it('errors clearly on anything else', () => {
		const bad = ['', '2027-03-28', '2027-03-28 10:00', '28.03.2027 10:00', '2027-03-28T10:00+0300', 'tomorrow'];
		for (const s of bad) {
			expect(() => parseBookingInstant(s, HELSINKI)).toThrow(/Not a date and time/);
		}
		expect(() => parseBookingInstant('2027-02-30T10:00:00Z', HELSINKI)).toThrow(/calendar date/);
		expect(() => parseBookingInstant('2027-03-28T25:00:00Z', HELSINKI)).toThrow(TimeInputError);
		expect(() => parseBookingInstant('2027-03-28T10:00:00+24:00', HELSINKI)).toThrow(/UTC offset/);
		expect(() => parseBookingInstant('2027-06-30T23:59:60Z', HELSINKI)).toThrow(TimeInputError); // leap seconds are not bookable
	});
});

describe('local grid', () => {
	it('matches the local wall clock, not UTC, where the offset is not whole hours', () => {
		// IANA tz: Asia/Kolkata is +05:30 all year; a 60-min grid is at :30 UTC there.
		expect(isOnLocalGrid(Date.parse('2027-01-15T04:30:00Z'), 'Asia/Kolkata', 60)).toBe(true); // 10:00 IST
		expect(isOnLocalGrid(Date.parse('2027-01-15T05:00:00Z'), 'Asia/Kolkata', 60)).toBe(false); // 10:30 IST
		// Asia/Kathmandu is +05:45: 30-min lines fall at :15 and :45 UTC.
		expect(isOnLocalGrid(Date.parse('2027-01-15T04:15:00Z'), 'Asia/Kathmandu', 30)).toBe(true);
		expect(ceilToLocalGrid(Date.parse('2027-01-15T04:16:00Z'), 'Asia/Kathmandu', 30)).toBe(Date.parse('2027-01-15T04:45:00Z'));
		expect(floorToLocalGrid(Date.parse('2027-01-15T04:14:00Z'), 'Asia/Kathmandu', 30)).toBe(Date.parse('2027-01-15T03:45:00Z'));
	});

	it('rounds across the Helsinki spring gap', () => {
		// 02:50+02:00 rounds up to 04:00+03:00 (03:00 does not exist; Directive 2000/84/EC).
		expect(new Date(ceilToLocalGrid(Date.parse('2027-03-28T00:50:00Z'), HELSINKI, 30)).toISOString()).toBe(
			'2027-03-28T01:00:00.000Z'
		);
		// 04:10+03:00 rounds down to 04:00+03:00.
		expect(new Date(floorToLocalGrid(Date.parse('2027-03-28T01:10:00Z'), HELSINKI, 30)).toISOString()).toBe(
			'2027-03-28T01:00:00.000Z'
		);
	});

	it('rounds across Lord Howe Island’s 30-minute change with a 60-minute grid', () => {
		// IANA tz Australia/Lord_Howe: +10:30, +11:00 in summer; 2027-10-03 02:00 -> 02:30.
		// From 01:50 the next whole local hour is 03:00+11:00 (02:00 is skipped, 02:30 is off-grid).
		const from = temporalInstant('2027-10-03T01:50', 'Australia/Lord_Howe').getTime();
		const want = temporalInstant('2027-10-03T03:00', 'Australia/Lord_Howe').getTime();
		expect(ceilToLocalGrid(from, 'Australia/Lord_Howe', 60)).toBe(want);
		// And back down from 02:40+11:00 the last whole hour is 01:00+10:30.
		const from2 = temporalInstant('2027-10-03T02:40', 'Australia/Lord_Howe').getTime();
		expect(floorToLocalGrid(from2, 'Australia/Lord_Howe', 60)).toBe(
			temporalInstant('2027-10-03T01:00', 'Australia/Lord_Howe').getTime()
		);
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

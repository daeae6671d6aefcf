import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import { ceilToLocalGrid, floorToLocalGrid, isOnLocalGrid } from './grid';

const HELSINKI = 'Europe/Helsinki';

/** Independent oracle: Temporal (temporal-polyfill), not our code, turns a wall time into an instant. */
function temporalInstant(pdt: string, timeZone: string): Date {
	return new Date(Temporal.PlainDateTime.from(pdt).toZonedDateTime(timeZone, { disambiguation: 'reject' }).epochMilliseconds);
}

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

describe('a grid that does not divide the day', () => {
	it('restarts at local midnight: with 100-minute steps the last line of the day is 23:20, the next 00:00', () => {
		// 14 × 100 min = 23:20; a 15th step would be 01:00 the next day, but the grid starts again at midnight.
		const at2350 = temporalInstant('2027-01-15T23:50', HELSINKI).getTime();
		expect(new Date(ceilToLocalGrid(at2350, HELSINKI, 100)).toISOString()).toBe(
			temporalInstant('2027-01-16T00:00', HELSINKI).toISOString()
		);
		expect(new Date(floorToLocalGrid(at2350, HELSINKI, 100)).toISOString()).toBe(
			temporalInstant('2027-01-15T23:20', HELSINKI).toISOString()
		);
		expect(isOnLocalGrid(temporalInstant('2027-01-16T01:40', HELSINKI).getTime(), HELSINKI, 100)).toBe(true);
	});
});

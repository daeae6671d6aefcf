import { describe, expect, it } from 'vitest';
import { TZDate } from '@date-fns/tz';
import { formatISO } from 'date-fns';
import { isoInZone } from './time';

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

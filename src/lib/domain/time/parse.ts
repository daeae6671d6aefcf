/**
 * The one reader of a booking time as a form or the JSON API sends it (a booking's start and end,
 * the recorded end of a session).
 */
import { mustParseYmd, naiveWallMs, parseClock } from './dates';
import { TimeInputError } from './errors';
import { assertTimeZone, zonedWallTime } from './zoned';

const MINUTE_MS = 60_000;

// RFC 3339 §5.6 date-time (the ISO 8601 profile used on the wire), seconds and up to 3 fraction digits optional.
const WITH_OFFSET_RE = /^(\d{4}-\d{2}-\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?(Z|[+-](\d{2}):(\d{2}))$/;
// A local date-time with no offset, as an <input type="datetime-local"> sends it.
const LOCAL_RE = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2}(?::\d{2})?)$/;

/**
 * Parses a booking time from a form or API body.
 * - `2027-03-28T10:00:00+03:00`, `2027-03-28T07:00Z`: ISO 8601 / RFC 3339 with an offset; the
 *   offset fixes the instant, whatever the zone.
 * - `2027-03-28T10:00`: local wall time in `timeZone`, with the gap refused and a repeated time
 *   taken as its first occurrence (see zonedWallTime).
 * Anything else throws TimeInputError with a message fit to show next to the field.
 */
export function parseBookingInstant(s: string, timeZone: string): Date {
	assertTimeZone(timeZone);
	if (typeof s !== 'string') {
		throw new TimeInputError('invalid-format', 'A date and time is required');
	}
	const withOffset = WITH_OFFSET_RE.exec(s);
	if (withOffset) {
		const [, ymd = '', hh = '', mm = '', ss, frac, zone = '', oh, om] = withOffset;
		const d = mustParseYmd(ymd);
		const c = parseClock(`${hh}:${mm}${ss === undefined ? '' : `:${ss}`}`);
		let offsetMs = 0;
		if (zone !== 'Z') {
			const offH = Number(oh);
			const offM = Number(om);
			if (offH > 23 || offM > 59) {
				throw new TimeInputError('invalid-offset', `Not a UTC offset: ${zone} in ${JSON.stringify(s)}`);
			}
			offsetMs = (zone.startsWith('-') ? -1 : 1) * (offH * 60 + offM) * MINUTE_MS;
		}
		const millisecond = frac === undefined ? 0 : Number(frac.padEnd(3, '0'));
		return new Date(naiveWallMs(d, c.hour * 60 + c.minute) + c.second * 1000 + millisecond - offsetMs);
	}
	const local = LOCAL_RE.exec(s);
	if (local) {
		const [, ymd = '', time = ''] = local;
		return zonedWallTime(ymd, time, timeZone);
	}
	throw new TimeInputError(
		'invalid-format',
		`Not a date and time: ${JSON.stringify(s)}; expected e.g. 2027-03-28T10:00:00+03:00, 2027-03-28T07:00:00Z or a local 2027-03-28T10:00`
	);
}

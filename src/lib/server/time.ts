// Instants shown as ISO 8601 with the studio's offset (e.g. 2027-03-28T10:00:00+03:00), the
// format date-fns' formatISO gives a TZDate ("Z" for a zero offset; seconds kept, milliseconds
// dropped). Written out by hand from the zone's offset, which offsetMsAt remembers: the
// availability endpoint formats every free and busy boundary of a month, and building a TZDate
// for each was a large part of its time (measured with --cpu-prof under `npm run bench`).
import { offsetMsAt } from '$lib/domain/availability/zoned';

const pad = (n: number, width = 2) => String(n).padStart(width, '0');

export function isoInZone(instant: Date, timeZone: string): string {
	const ms = instant.getTime();
	const offset = offsetMsAt(timeZone, ms - (ms % 60_000));
	const local = new Date(ms + offset);
	const date = `${pad(local.getUTCFullYear(), 4)}-${pad(local.getUTCMonth() + 1)}-${pad(local.getUTCDate())}`;
	const time = `${pad(local.getUTCHours())}:${pad(local.getUTCMinutes())}:${pad(local.getUTCSeconds())}`;
	if (offset === 0) return `${date}T${time}Z`;
	const minutes = Math.abs(offset) / 60_000;
	return `${date}T${time}${offset < 0 ? '-' : '+'}${pad(Math.floor(minutes / 60))}:${pad(minutes % 60)}`;
}

/** The local date (YYYY-MM-DD) of an instant in a zone; an ISO string is read as an instant. */
export function localYmd(instant: Date | string, timeZone: string): string {
	return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(
		typeof instant === 'string' ? new Date(instant) : instant
	);
}

// Instants shown as ISO 8601 with the studio's offset (e.g. 2027-03-28T10:00:00+03:00).
import { TZDate } from '@date-fns/tz';
import { formatISO } from 'date-fns';

export function isoInZone(instant: Date, timeZone: string): string {
	return formatISO(new TZDate(instant.getTime(), timeZone));
}

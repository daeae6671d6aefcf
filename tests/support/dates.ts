// Picking days for tests: in the studio's zone (Europe/Helsinki), relative to today, so the
// tests keep working as the calendar moves on.
import { TZDate } from '@date-fns/tz';
import { isPublicHoliday } from '../../src/lib/domain/holidays';

export const TZ = 'Europe/Helsinki';

export function ymdInZone(d: Date, tz = TZ): string {
	return new Intl.DateTimeFormat('en-CA', { timeZone: tz, year: 'numeric', month: '2-digit', day: '2-digit' }).format(d);
}

/** The local date `days` after today, moved forward to a Monday–Friday that is not a Finnish public holiday. */
export function weekdayAhead(days: number): string {
	let t = Date.now() + days * 86_400_000;
	for (;;) {
		const ymd = ymdInZone(new Date(t));
		const dow = new TZDate(t, TZ).getDay();
		if (dow !== 0 && dow !== 6 && !isPublicHoliday('FI', ymd)) return ymd;
		t += 86_400_000;
	}
}

/** The first local date after `fromDays` whose length is not 24 hours (a daylight-saving change). */
export function nextDstChange(fromDays = 2): { ymd: string; hours: number } {
	for (let i = fromDays; i < 400; i++) {
		const ymd = ymdInZone(new Date(Date.now() + i * 86_400_000));
		const [y, m, d] = ymd.split('-').map(Number) as [number, number, number];
		const start = new TZDate(y, m - 1, d, TZ).getTime();
		const end = new TZDate(y, m - 1, d + 1, TZ).getTime();
		const hours = (end - start) / 3_600_000;
		if (hours !== 24) return { ymd, hours };
	}
	throw new Error('no daylight-saving change within 400 days');
}

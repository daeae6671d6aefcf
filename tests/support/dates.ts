// Picking days and times for tests, in the studio's zone (Europe/Helsinki). Tests book relative to
// today (the app refuses the past and anything past its horizon), so every choice here is made by
// what the test needs (a working weekday, so many full days of notice), never by "today + n" read
// as a number of 24-hour steps: days are counted on the studio's calendar, so a run at 23:30, on a
// Sunday night, on New Year's Eve or on the evening before a clock change picks the same kind of
// day as a run at noon. `npm run test:clock` runs the suite at such times.
import { addDays, isoWeekday, localDateOf, zonedWallTime } from '../../src/lib/domain/time';
import { isPublicHoliday } from '../../src/lib/domain/holidays';

export { addDays, isoWeekday };

export const TZ = 'Europe/Helsinki';
const HOUR = 3_600_000;
const DAY = 24 * HOUR;

/** The local calendar date of an instant in the studio's zone (or another). */
export function ymdInZone(d: Date | number, tz = TZ): string {
	return localDateOf(d, tz);
}

/** Today's date in the studio. */
export function studioToday(now = Date.now()): string {
	return ymdInZone(now);
}

/** Monday to Friday and not a Finnish public holiday: no weekend or holiday surcharge. */
export function isWorkday(ymd: string): boolean {
	return isoWeekday(ymd) <= 5 && !isPublicHoliday('FI', ymd);
}

/** The first working weekday on or after `ymd`. */
export function workdayFrom(ymd: string): string {
	let d = ymd;
	while (!isWorkday(d)) d = addDays(d, 1);
	return d;
}

/** The studio date `days` calendar days after today, moved forward to a working weekday. */
export function weekdayAhead(days: number, now = Date.now()): string {
	return workdayFrom(addDays(studioToday(now), days));
}

/** The instant (ms) at which the studio's clock reads `hhmm` on `ymd`. */
export function studioInstant(ymd: string, hhmm: string): number {
	return zonedWallTime(ymd, hhmm, TZ).getTime();
}

/** A studio wall time as an ISO 8601 instant (in UTC). */
export function studioIso(ymd: string, hhmm: string): string {
	return new Date(studioInstant(ymd, hhmm)).toISOString();
}

/**
 * Whole days of notice that cancelling at `now` gives for a start (floor of the hours / 24), as the
 * cancellation page counts them.
 */
export function noticeDays(startMs: number, now = Date.now()): number {
	return Math.floor((startMs - now) / DAY);
}

/**
 * Working weekdays whose `hhmm` start gives between `minHours` and `maxHours` hours of notice
 * from now, each at least `marginHours` inside those bounds, so that a slow test cannot cross a
 * bound while it runs. Nearest first; `count` of them.
 */
export function workdaysWithNotice(
	hhmm: string,
	opts: { minHours: number; maxHours?: number; marginHours?: number; count?: number; now?: number }
): string[] {
	const now = opts.now ?? Date.now();
	const margin = opts.marginHours ?? 2;
	const max = opts.maxHours ?? Infinity;
	const found: string[] = [];
	for (let d = studioToday(now); found.length < (opts.count ?? 5); d = addDays(d, 1)) {
		const notice = (studioInstant(d, hhmm) - now) / HOUR;
		if (notice > max - margin) break;
		if (notice >= opts.minHours + margin && isWorkday(d)) found.push(d);
	}
	return found;
}

/** The first studio date from `fromDays` days ahead whose length is not 24 hours (a daylight-saving change). */
export function nextDstChange(fromDays = 2, now = Date.now()): { ymd: string; hours: number } {
	const today = studioToday(now);
	for (let i = fromDays; i < 400; i++) {
		const ymd = addDays(today, i);
		const hours = (studioInstant(addDays(ymd, 1), '00:00') - studioInstant(ymd, '00:00')) / HOUR;
		if (hours !== 24) return { ymd, hours };
	}
	throw new Error('no daylight-saving change within 400 days');
}

/**
 * `count` different working weekdays, the first on or after `fromDays` calendar days ahead: a
 * file's own days, one per test, so two tests never share a day whatever weekday or holiday
 * today's date puts them on (the app books at most `horizonDays`, 180 in the demo, ahead).
 */
export function workdaysAhead(fromDays: number, count: number, now = Date.now(), horizonDays = 180): string[] {
	const days: string[] = [];
	for (let d = weekdayAhead(fromDays, now); days.length < count; d = workdayFrom(addDays(d, 1))) days.push(d);
	const last = days.at(-1)!;
	if (last > addDays(studioToday(now), horizonDays - 1)) throw new Error(`the days ${days[0]}…${last} reach past the horizon`);
	return days;
}

/**
 * Checks of a requested booking time against the studio's policy, as field errors for the API's
 * `{ error, message, fields }` shape. Deliberately small: free/busy, turnaround and blackout days
 * belong to the availability module. All wall-clock rules use the studio's IANA time zone.
 */
import type { StudioPolicy } from '../types';
import { formatDuration } from './labels';
import { addDaysToYmd, isoWeekdayOf, localParts, localToInstant, parseYmd, type ResolvedLocalTime } from './zonedTime';

export type BookingTimeField = 'start' | 'end';

export type BookingTimeCode =
	| 'invalid_time'
	| 'nonexistent_local_time'
	| 'end_not_after_start'
	| 'under_minimum'
	| 'off_grid'
	| 'outside_opening_hours'
	| 'under_minimum_notice'
	| 'past_horizon'
	| 'too_long'
	| 'out_of_range';

/**
 * The longest booking taken in one go, in real minutes. The opening-hours check below walks the
 * calendar day by day, so a length without a cap would let one request burn the CPU for a minute
 * (and past 366 days the block pricing refuses outright). Three days covers a lock-out weekend even
 * with round-the-clock hours.
 */
export const MAX_BOOKING_MINUTES = 72 * 60;

export interface BookingTimeIssue {
	field: BookingTimeField;
	code: BookingTimeCode;
	message: string;
}

type TimePolicy = Pick<
	StudioPolicy,
	'timeZone' | 'minBookingMinutes' | 'incrementMinutes' | 'minNoticeMinutes' | 'horizonDays' | 'openingHours'
>;

/** Opening intervals (instants) of the local dates `fromYmd`..`toYmd`, touching ones merged. */
function openingSpans(policy: TimePolicy, fromYmd: string, toYmd: string): [number, number][] {
	const spans: [number, number][] = [];
	for (let ymd = fromYmd; ymd <= toYmd; ymd = addDaysToYmd(ymd, 1)) {
		const weekday = isoWeekdayOf(ymd);
		for (const hours of policy.openingHours) {
			if (hours.weekday !== weekday || hours.closeMinute <= hours.openMinute) continue;
			spans.push([
				localToInstant(ymd, hours.openMinute, policy.timeZone).instant.getTime(),
				localToInstant(ymd, hours.closeMinute, policy.timeZone).instant.getTime()
			]);
		}
	}
	spans.sort((a, b) => a[0] - b[0]);
	const merged: [number, number][] = [];
	for (const span of spans) {
		const last = merged[merged.length - 1];
		if (last && span[0] <= last[1]) last[1] = Math.max(last[1], span[1]);
		else merged.push([...span]);
	}
	return merged;
}

/**
 * Everything wrong with [start, end) as a booking made at `now`; an empty list when it may be
 * booked (subject to availability).
 */
export function validateBookingTimes(start: Date, end: Date, policy: TimePolicy, now: Date): BookingTimeIssue[] {
	const issues: BookingTimeIssue[] = [];
	const add = (field: BookingTimeField, code: BookingTimeCode, message: string) => issues.push({ field, code, message });

	if (Number.isNaN(start.getTime())) add('start', 'invalid_time', 'The start is not a valid time.');
	if (Number.isNaN(end.getTime())) add('end', 'invalid_time', 'The end is not a valid time.');
	if (issues.length > 0) return issues;

	const minutes = (end.getTime() - start.getTime()) / 60_000;
	// Cheap bounds first, before anything walks the calendar: a start far outside the bookable
	// range or a booking longer than the cap gets its answer from arithmetic alone.
	const DAY = 86_400_000;
	if (start.getTime() > now.getTime() + (policy.horizonDays + 2) * DAY) {
		add('start', 'out_of_range', `Bookings open up to ${policy.horizonDays} days ahead.`);
	} else if (start.getTime() < now.getTime() - 366 * DAY) {
		add('start', 'out_of_range', 'That date passed long ago.');
	}
	if (minutes <= 0) {
		add('end', 'end_not_after_start', 'The end must be after the start.');
	} else if (minutes < policy.minBookingMinutes) {
		add('end', 'under_minimum', `A booking lasts at least ${formatDuration(policy.minBookingMinutes)}.`);
	} else if (minutes > MAX_BOOKING_MINUTES) {
		add('end', 'too_long', `A booking lasts at most ${formatDuration(MAX_BOOKING_MINUTES)}.`);
	}
	if (isUnboundedTime(issues)) return issues;

	const startLocal = localParts(start, policy.timeZone);
	const endLocal = localParts(end, policy.timeZone);
	const grid = policy.incrementMinutes;
	for (const [field, local] of [
		['start', startLocal],
		['end', endLocal]
	] as const) {
		if (local.subMinuteMs !== 0 || local.minuteOfDay % grid !== 0) {
			add(field, 'off_grid', `Times go in steps of ${formatDuration(grid)} from midnight.`);
		}
	}
	if (minutes > 0) {
		const spans = openingSpans(policy, addDaysToYmd(startLocal.ymd, -1), endLocal.ymd);
		const inside = spans.some(([open, close]) => open <= start.getTime() && end.getTime() <= close);
		if (!inside) {
			add('start', 'outside_opening_hours', 'The studio is not open for the whole of this time.');
		}
	}
	if (start.getTime() - now.getTime() < policy.minNoticeMinutes * 60_000) {
		add('start', 'under_minimum_notice', `Bookings need at least ${formatDuration(policy.minNoticeMinutes)} notice.`);
	}
	const lastDay = addDaysToYmd(localParts(now, policy.timeZone).ymd, policy.horizonDays);
	if (startLocal.ymd > lastDay) {
		add('start', 'past_horizon', `Bookings open up to ${policy.horizonDays} days ahead.`);
	}
	return issues;
}

/** True when the issues say the time is too far out or too long to look at day by day. */
export function isUnboundedTime(issues: readonly BookingTimeIssue[]): boolean {
	return issues.some((i) => i.code === 'out_of_range' || i.code === 'too_long');
}

/** The first message per field, for the API's `fields` object. */
export function toFieldErrors(issues: readonly BookingTimeIssue[]): Partial<Record<BookingTimeField, string>> {
	const fields: Partial<Record<BookingTimeField, string>> = {};
	for (const issue of issues) fields[issue.field] ??= issue.message;
	return fields;
}

export type ParsedTime =
	| { ok: true; instant: Date; ambiguous: boolean }
	| { ok: false; code: 'invalid_time' | 'nonexistent_local_time'; message: string };

const TIME_PATTERN = /^(\d{4}-\d{2}-\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?(Z|[+-]\d{2}:?\d{2})?$/;

/**
 * Reads an ISO 8601 date-time either with an offset ('2027-03-28T10:00:00+03:00', '…Z': an
 * instant) or without one ('2027-03-28T10:00': a wall time in the studio's zone). A local wall
 * time in a spring-forward gap does not exist and is refused; one repeated at fall-back means its
 * first occurrence (RFC 5545 §3.3.5) and is flagged `ambiguous`.
 */
export function parseLocalOrOffset(text: string, timeZone: string): ParsedTime {
	const invalid = {
		ok: false,
		code: 'invalid_time',
		message: 'Use an ISO 8601 date and time, e.g. 2027-03-28T10:00+02:00.'
	} as const;
	const match = TIME_PATTERN.exec(text.trim());
	if (!match) return invalid;
	const [, ymd = '', hh = '', mm = '', ss = '0', ms = '0', offset] = match;
	const hours = Number(hh);
	const minutes = Number(mm);
	const seconds = Number(ss);
	if (hours > 23 || minutes > 59 || seconds > 59) return invalid;
	try {
		parseYmd(ymd);
	} catch {
		return invalid;
	}
	const extraMs = seconds * 1000 + Number(ms.padEnd(3, '0'));
	if (offset !== undefined) {
		const sign = offset === 'Z' ? 0 : offset.startsWith('-') ? -1 : 1;
		const digits = offset.replace(/[^0-9]/g, '');
		const offsetMinutes = sign * (Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2, 4)));
		if (Math.abs(offsetMinutes) > 18 * 60) return invalid;
		const wall = parseYmd(ymd) + (hours * 60 + minutes) * 60_000 + extraMs;
		return { ok: true, instant: new Date(wall - offsetMinutes * 60_000), ambiguous: false };
	}
	const resolved: ResolvedLocalTime = localToInstant(ymd, hours * 60 + minutes, timeZone);
	if (resolved.kind === 'gap') {
		return {
			ok: false,
			code: 'nonexistent_local_time',
			message: `${ymd} ${hh}:${mm} does not exist in ${timeZone}: the clocks skip it.`
		};
	}
	return {
		ok: true,
		instant: new Date(resolved.instant.getTime() + extraMs),
		ambiguous: resolved.kind === 'ambiguous'
	};
}

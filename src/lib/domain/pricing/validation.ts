/**
 * Checks of a requested booking time against the studio's policy, as field errors for the API's
 * `{ error, message, fields }` shape. Deliberately small: free/busy, turnaround and blackout days
 * belong to the availability module. All wall-clock rules use the studio's IANA time zone.
 */
import type { StudioPolicy } from '../types';
import { isOnGrid, isWithinOpeningHours } from '../availability';
import { addDays, formatDuration, localDateOf } from '../time';

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

	// The grid and the opening hours are availability's rules: what it offers, this accepts.
	for (const [field, instant] of [
		['start', start],
		['end', end]
	] as const) {
		if (!isOnGrid(instant, policy)) {
			add(field, 'off_grid', `Times go in steps of ${formatDuration(policy.incrementMinutes)} from midnight.`);
		}
	}
	if (minutes > 0 && !isWithinOpeningHours(start, end, policy)) {
		add('start', 'outside_opening_hours', 'The studio is not open for the whole of this time.');
	}
	if (start.getTime() - now.getTime() < policy.minNoticeMinutes * 60_000) {
		add('start', 'under_minimum_notice', `Bookings need at least ${formatDuration(policy.minNoticeMinutes)} notice.`);
	}
	const lastDay = addDays(localDateOf(now, policy.timeZone), policy.horizonDays);
	if (localDateOf(start, policy.timeZone) > lastDay) {
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

/**
 * Typed errors of the time engine, so an API route can map them to a 422 with a field name
 * instead of parsing messages. Each is a RangeError: the value given lies outside what a date,
 * a time of day or a time zone can be.
 */

export type TimeInputErrorCode =
	'invalid-format' | 'invalid-date' | 'invalid-time' | 'invalid-offset' | 'invalid-time-zone' | 'nonexistent-local-time';

/** A date, time or zone given to us (by a user or a caller) that we cannot turn into an instant. */
export class TimeInputError extends RangeError {
	readonly code: TimeInputErrorCode;

	constructor(code: TimeInputErrorCode, message: string) {
		super(message);
		this.name = 'TimeInputError';
		this.code = code;
	}
}

/**
 * A local wall time that never happens: it falls in the spring-forward gap of the zone
 * (in Europe/Helsinki on 2027-03-28 the clocks go from 03:00 straight to 04:00, Directive
 * 2000/84/EC art. 2, IANA tz database). We refuse it rather than silently shifting it, because a
 * booking at a time that does not exist is almost always a typing mistake.
 */
export class NonexistentLocalTimeError extends TimeInputError {
	readonly date: string;
	readonly time: string;
	readonly timeZone: string;
	/** The instant the clocks jumped: the first real instant after the gap. */
	readonly transition: Date;

	constructor(date: string, time: string, timeZone: string, transition: Date) {
		super(
			'nonexistent-local-time',
			`${date} ${time} does not exist in ${timeZone}: the clocks skip that time when summer time begins`
		);
		this.name = 'NonexistentLocalTimeError';
		this.date = date;
		this.time = time;
		this.timeZone = timeZone;
		this.transition = transition;
	}
}

// What every text and date field accepts, for the API's schemas, the forms and query parameters
// alike: checked where the request comes in, so nothing the database cannot store gets that far.
import { z } from 'zod';
import { parseYmd } from '$lib/domain/time';

/**
 * True when the text holds a C0 control character (U+0000–U+001F) or DEL (U+007F). PostgreSQL's
 * text types cannot hold U+0000 at all (SQLSTATE 22021); the other controls are never typed into
 * a form and only hide what a text says. Tab, line feed and carriage return are allowed where the
 * text may run over several lines (notes, descriptions).
 */
export function hasControlChars(text: string, multiline = false): boolean {
	for (let i = 0; i < text.length; i++) {
		const c = text.charCodeAt(i);
		if (c === 0x7f) return true;
		if (c > 0x1f) continue;
		if (multiline && (c === 0x09 || c === 0x0a || c === 0x0d)) continue;
		return true;
	}
	return false;
}

export const CONTROL_CHARS_MESSAGE = 'Remove the control characters (such as NUL) from this text.';

/** A string on one line with no control characters; `params` as for z.string(). */
export function lineText(params?: Parameters<typeof z.string>[0]) {
	return z.string(params).refine((s) => !hasControlChars(s), { error: CONTROL_CHARS_MESSAGE });
}

/** A string that may hold tabs and line breaks but no other control characters. */
export function multilineText(params?: Parameters<typeof z.string>[0]) {
	return z.string(params).refine((s) => !hasControlChars(s, true), { error: CONTROL_CHARS_MESSAGE });
}

/**
 * The years the studio's calendar covers. Bookings, plans, blackouts and filters outside them
 * mean nothing to a studio, and near the ends of what dates can be (years 1 and 9999) the
 * arithmetic around a day (its local midnights, a window either side) leaves the range
 * PostgreSQL stores (SQLSTATE 22008).
 */
export const MIN_YEAR = 2000;
export const MAX_YEAR = 2100;

/** 'YYYY-MM-DD' naming a real day of the Gregorian calendar (ISO 8601) between MIN_YEAR and MAX_YEAR. */
export function isStudioDate(text: string): boolean {
	const d = parseYmd(text);
	return !!d && d.year >= MIN_YEAR && d.year <= MAX_YEAR;
}

export const DATE_MESSAGE = 'Use a date such as 2027-03-28.';
/** The problem with a date as typed, or null when it is one the studio's calendar takes. */
export function dateProblem(text: string): string | null {
	if (!/^\d{4}-\d{2}-\d{2}$/.test(text)) return DATE_MESSAGE;
	if (isStudioDate(text)) return null;
	return parseYmd(text) ? `Choose a date between ${MIN_YEAR} and ${MAX_YEAR}.` : `There is no ${text} on the calendar.`;
}

/** A date field: 'YYYY-MM-DD', a real day, within the calendar's years. */
export function dateText() {
	return z.string({ error: DATE_MESSAGE }).superRefine((text, ctx) => {
		const problem = dateProblem(text);
		if (problem) ctx.addIssue({ code: 'custom', message: problem });
	});
}

// Form fields shared by the owner's forms: money typed as decimal text in the studio's currency and
// percents, both checked by the exact parsers of $lib/domain/money (never a float), and clock times.
import { z } from 'zod';
import { minorUnits, parseMoney, parsePercentToBasisPoints, type ParsedDecimal } from '$lib/domain/money';

/** 'HH:MM' from 00:00 to 24:00 (24:00 is midnight at the end of the day). */
export const CLOCK_RE = /^(?:([01]\d|2[0-3]):([0-5]\d)|24:00)$/;

function moneyProblem(parsed: ParsedDecimal, currency: string): string | null {
	if (parsed.ok) return null;
	switch (parsed.reason) {
		case 'empty':
			return 'Enter an amount, e.g. 45.00.';
		case 'negative':
			return 'A rate cannot be negative.';
		case 'precision':
			return `Use at most ${minorUnits(currency)} decimals.`;
		case 'too-large':
			return 'That amount is too large.';
		default:
			return 'Write the amount with digits and a point, e.g. 45.50.';
	}
}

/** Decimal text of an amount in the studio currency (validated, kept as typed). */
export function moneyText(currency: string) {
	return z
		.string({ error: 'Enter an amount, e.g. 45.00.' })
		.trim()
		.max(24, { error: 'That amount is too long.' })
		.superRefine((text, ctx) => {
			const problem = moneyProblem(parseMoney(text, currency), currency);
			if (problem) ctx.addIssue({ code: 'custom', message: problem });
		});
}

/** A percent as typed, at most two decimals, between 0 and `max`. */
export function percentText(max: number, what: string) {
	return z
		.string({ error: `Enter the ${what}.` })
		.trim()
		.max(12, { error: 'That percent is too long.' })
		.superRefine((text, ctx) => {
			const parsed = parsePercentToBasisPoints(text);
			if (!parsed.ok) {
				const message =
					parsed.reason === 'empty'
						? `Enter the ${what}.`
						: parsed.reason === 'negative'
							? 'A percent cannot be negative.'
							: parsed.reason === 'precision'
								? 'Use at most two decimals, e.g. 25.5.'
								: 'Write the percent with digits and a point, e.g. 25.5.';
				ctx.addIssue({ code: 'custom', message });
			} else if (parsed.value > max * 100) {
				ctx.addIssue({ code: 'custom', message: `The ${what} is at most ${max} %.` });
			}
		});
}

/** The value of a parse the schema already accepted; throws if called on unchecked input. */
export function exact(parsed: ParsedDecimal): number {
	if (!parsed.ok) throw new RangeError(`unvalidated amount (${parsed.reason})`);
	return parsed.value;
}

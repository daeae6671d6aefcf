// The rate-card sanity checks (src/lib/domain/pricing/rateCardChecks.ts) on what the owner types:
// the forms' schemas refuse the errors field by field, and the pages show the warnings as the
// owner types, without blocking a save. Shared by the server and the browser.
import { parseMoney, parsePercentToBasisPoints } from '$lib/domain/money';
import {
	checkBlockRates,
	checkSurcharge,
	type BlockLengths,
	type Finding,
	type RateField,
	type SurchargeField
} from '$lib/domain/pricing/rateCardChecks';
import { CLOCK_RE } from './fields';
import { clockMinutes } from '$lib/domain/time';

/** The findings on three typed rates; none while any of them does not parse (the field says why). */
export function blockRateFindings(
	texts: Record<RateField, string>,
	lengths: BlockLengths,
	currency: string
): Finding<RateField>[] {
	const hourly = parseMoney(texts.hourly ?? '', currency);
	const halfDay = parseMoney(texts.halfDay ?? '', currency);
	const fullDay = parseMoney(texts.fullDay ?? '', currency);
	if (!hourly.ok || !halfDay.ok || !fullDay.ok) return [];
	return checkBlockRates({ hourly: hourly.value, halfDay: halfDay.value, fullDay: fullDay.value }, lengths, currency);
}

/** The findings on a surcharge as typed; a part that does not parse is left to its field's error. */
export function surchargeFindings(f: { kind: string; percent: string; from: string; to: string }): Finding<SurchargeField>[] {
	const percent = parsePercentToBasisPoints(f.percent ?? '');
	const clocks = CLOCK_RE.test(f.from ?? '') && CLOCK_RE.test(f.to ?? '');
	return checkSurcharge({
		kind: f.kind === 'holiday' ? 'holiday' : 'window',
		percentBp: percent.ok ? percent.value : 0,
		fromMinute: clocks ? clockMinutes(f.from) : 0,
		toMinute: clocks ? clockMinutes(f.to) : 1440
	});
}

/** Adds each error finding to the schema's issues, on the form field it concerns. */
export function refuseErrors<F extends string>(
	found: Finding<F>[],
	ctx: { addIssue(issue: { code: 'custom'; path: string[]; message: string }): void },
	fieldName: (field: F) => string = (field) => field
): void {
	for (const f of found) {
		if (f.level === 'error') ctx.addIssue({ code: 'custom', path: [fieldName(f.field)], message: f.message });
	}
}

/** The warning messages per form field, for the page to show beside each field. */
export function warningsByField<F extends string>(
	found: Finding<F>[],
	fieldName: (field: F) => string = (field) => field
): Record<string, string[]> {
	const out: Record<string, string[]> = {};
	for (const f of found) if (f.level === 'warning') (out[fieldName(f.field)] ??= []).push(f.message);
	return out;
}

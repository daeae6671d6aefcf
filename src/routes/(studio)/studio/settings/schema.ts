// Rates & policy: the forms' schemas (superforms with zod 4) and the exact conversions between
// what the owner types and what the studio row stores. Money is typed as decimal text in the
// studio's currency and stored as integer minor units; percents are stored as basis points. Both
// are read by string arithmetic (parseMoney, parsePercentToBasisPoints), never through a float.
import { z } from 'zod';
import { parseMoney, parsePercentToBasisPoints, toDecimalString, basisPointsToPercent } from '$lib/domain/money';
import { CLOCK_RE, exact, moneyText, percentText } from '$lib/schemas/fields';
import { clockLabel, clockMinutes } from '$lib/domain/time';
import { blockRateFindings, refuseErrors } from '$lib/schemas/rate-card';
import type { BlockLengths, RateField } from '$lib/domain/pricing/rateCardChecks';
import { lineText } from '$lib/schemas/input';
import type { CancellationRung, OpeningHours } from '$lib/domain/types';
// Types only: erased before the browser bundle is made.
import type { PolicyValues, SurchargeValues } from '$lib/server/settings';

/** The parts of the Rates & policy form (PolicySections.svelte); the set-up shows a few per step. */
export type PolicySection = 'engineer' | 'vat' | 'deposit' | 'ladder' | 'rules' | 'hours' | 'holidays';

export const WEEKDAY_NAMES = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const;
/** Rows offered for the cancellation ladder; blank rows are left out. */
export const LADDER_ROWS = 4;

function minutes(what: string, min: number, max: number) {
	return z
		.number({ error: `Enter the ${what} in whole minutes.` })
		.int({ error: `Enter the ${what} in whole minutes.` })
		.min(min, { error: `The ${what} is at least ${min} minutes.` })
		.max(max, { error: `The ${what} is at most ${max} minutes.` });
}

function wholeNumber(what: string, unit: string, min: number, max: number) {
	return z
		.number({ error: `Enter the ${what} in whole ${unit}.` })
		.int({ error: `Enter the ${what} in whole ${unit}.` })
		.min(min, { error: `The ${what} is at least ${min} ${unit}.` })
		.max(max, { error: `The ${what} is at most ${max} ${unit}.` });
}

const ENGINEER_FIELDS = { hourly: 'engineerHourly', halfDay: 'engineerHalfDay', fullDay: 'engineerFullDay' } as const;
/** The form field of an engineer rate the checks speak of. */
export const engineerField = (field: RateField) => ENGINEER_FIELDS[field];

/** The engineer's three rates as the rate-card checks read them. */
export function engineerRates(v: Pick<SettingsForm, 'engineerHourly' | 'engineerHalfDay' | 'engineerFullDay'>) {
	return { hourly: v.engineerHourly, halfDay: v.engineerHalfDay, fullDay: v.engineerFullDay };
}

function buildSettingsSchema(currency: string, blocks: BlockLengths) {
	return z
		.object({
			engineerHourly: moneyText(currency),
			engineerHalfDay: moneyText(currency),
			engineerFullDay: moneyText(currency),
			vatPercent: percentText(100, 'VAT rate'),
			pricesIncludeVat: z.boolean().default(false),
			minBookingMinutes: minutes('minimum booking', 15, 1440),
			incrementMinutes: minutes('booking increment', 5, 240),
			turnaroundMinutes: minutes('turnaround', 0, 480),
			minNoticeHours: wholeNumber('minimum notice', 'hours', 0, 24 * 60),
			horizonDays: wholeNumber('booking horizon', 'days', 1, 730),
			holdMinutes: minutes('hold', 5, 24 * 60),
			overtimeIncrementMinutes: minutes('overtime increment', 1, 120),
			depositPercent: percentText(100, 'deposit'),
			depositMinimum: moneyText(currency),
			openDays: z.array(z.number().int().min(1).max(7)).max(7).default([]),
			opens: z.array(z.string().trim().max(5)).length(7, { error: 'Give opening times for all seven days.' }),
			closes: z.array(z.string().trim().max(5)).length(7, { error: 'Give closing times for all seven days.' }),
			noticeHours: z.array(z.string().trim().max(6)).length(LADDER_ROWS),
			refundPercents: z.array(z.string().trim().max(8)).length(LADDER_ROWS),
			closedOnPublicHolidays: z.boolean().default(false)
		})
		.superRefine((v, ctx) => {
			// A half day dearer than the full day, or a block many times its hours: a typo, refused.
			refuseErrors(blockRateFindings(engineerRates(v), blocks, currency), ctx, engineerField);
			if (v.incrementMinutes > 0 && v.minBookingMinutes % v.incrementMinutes !== 0) {
				ctx.addIssue({
					code: 'custom',
					path: ['minBookingMinutes'],
					message: `The minimum booking must be a whole number of ${v.incrementMinutes}-minute increments.`
				});
			}
			for (let i = 0; i < 7; i++) {
				if (!v.openDays.includes(i + 1)) continue;
				for (const key of ['opens', 'closes'] as const) {
					if (!CLOCK_RE.test(v[key][i] ?? '')) {
						ctx.addIssue({ code: 'custom', path: [key, i], message: 'Use a time such as 09:00 (24:00 is midnight).' });
					}
				}
			}
			const seen = new Map<number, number>();
			for (let i = 0; i < LADDER_ROWS; i++) {
				const hours = v.noticeHours[i] ?? '';
				const refund = v.refundPercents[i] ?? '';
				if (hours === '' && refund === '') continue;
				if (!/^\d{1,5}$/.test(hours)) {
					ctx.addIssue({ code: 'custom', path: ['noticeHours', i], message: 'Enter the notice in whole hours, e.g. 48.' });
				} else if (seen.has(Number(hours))) {
					ctx.addIssue({ code: 'custom', path: ['noticeHours', i], message: 'Each rung needs its own notice.' });
				} else seen.set(Number(hours), i);
				const parsed = parsePercentToBasisPoints(refund);
				if (!parsed.ok || parsed.value > 10_000) {
					ctx.addIssue({ code: 'custom', path: ['refundPercents', i], message: 'Enter a refund from 0 to 100 %.' });
				}
			}
			if (seen.size === 0) {
				ctx.addIssue({ code: 'custom', path: ['noticeHours', 0], message: 'Give at least one rung, e.g. 0 hours: 0 %.' });
			}
		});
}

const schemas = new Map<string, ReturnType<typeof buildSettingsSchema>>();
/** One schema object per currency and block lengths, so the validation adapters' caches stay small. */
export function settingsSchema(currency: string, blocks: BlockLengths) {
	const key = `${currency}:${blocks.halfDayMinutes}:${blocks.fullDayMinutes}`;
	let schema = schemas.get(key);
	if (!schema) schemas.set(key, (schema = buildSettingsSchema(currency, blocks)));
	return schema;
}

export type SettingsForm = z.infer<ReturnType<typeof buildSettingsSchema>>;

export function settingsFormFrom(s: PolicyValues, currency: string): SettingsForm {
	const byDay = new Map(s.openingHours.map((h) => [h.weekday, h]));
	const ladder = [...s.cancellation].sort((a, b) => b.minNoticeHours - a.minNoticeHours).slice(0, LADDER_ROWS);
	const pad = (list: string[]) => [...list, ...Array<string>(LADDER_ROWS - list.length).fill('')];
	return {
		engineerHourly: toDecimalString(s.engineerHourly, currency),
		engineerHalfDay: toDecimalString(s.engineerHalfDay, currency),
		engineerFullDay: toDecimalString(s.engineerFullDay, currency),
		vatPercent: basisPointsToPercent(s.vatRateBp),
		pricesIncludeVat: s.pricesIncludeVat,
		minBookingMinutes: s.minBookingMinutes,
		incrementMinutes: s.incrementMinutes,
		turnaroundMinutes: s.turnaroundMinutes,
		// The row keeps minutes; the owner thinks of notice in hours.
		minNoticeHours: Math.floor(s.minNoticeMinutes / 60),
		horizonDays: s.horizonDays,
		holdMinutes: s.holdMinutes,
		overtimeIncrementMinutes: s.overtimeIncrementMinutes,
		depositPercent: basisPointsToPercent(s.depositBp),
		depositMinimum: toDecimalString(s.depositMinimum, currency),
		openDays: [...byDay.keys()].sort((a, b) => a - b),
		opens: [1, 2, 3, 4, 5, 6, 7].map((d) => clockLabel(byDay.get(d)?.openMinute ?? 9 * 60)),
		closes: [1, 2, 3, 4, 5, 6, 7].map((d) => {
			const h = byDay.get(d);
			return clockLabel(h ? h.closeMinute : 17 * 60);
		}),
		noticeHours: pad(ladder.map((r) => String(r.minNoticeHours))),
		refundPercents: pad(ladder.map((r) => basisPointsToPercent(r.refundBp))),
		closedOnPublicHolidays: s.closedOnPublicHolidays
	};
}

/** A validated form as the studio row stores it. Call only with data the schema accepted. */
export function policyValuesFrom(f: SettingsForm, currency: string): PolicyValues {
	const openingHours: OpeningHours[] = [];
	for (let d = 1; d <= 7; d++) {
		if (!f.openDays.includes(d)) continue;
		const open = clockMinutes(f.opens[d - 1]!);
		let close = clockMinutes(f.closes[d - 1]!);
		// A closing time at or before the opening time is on the next morning.
		if (close <= open) close += 1440;
		openingHours.push({ weekday: d, openMinute: open, closeMinute: Math.min(close, open + 1440) });
	}
	const cancellation: CancellationRung[] = [];
	for (let i = 0; i < LADDER_ROWS; i++) {
		const hours = f.noticeHours[i] ?? '';
		if (hours === '' && (f.refundPercents[i] ?? '') === '') continue;
		cancellation.push({ minNoticeHours: Number(hours), refundBp: exact(parsePercentToBasisPoints(f.refundPercents[i]!)) });
	}
	cancellation.sort((a, b) => b.minNoticeHours - a.minNoticeHours);
	return {
		vatRateBp: exact(parsePercentToBasisPoints(f.vatPercent)),
		pricesIncludeVat: f.pricesIncludeVat,
		minBookingMinutes: f.minBookingMinutes,
		incrementMinutes: f.incrementMinutes,
		turnaroundMinutes: f.turnaroundMinutes,
		minNoticeMinutes: f.minNoticeHours * 60,
		horizonDays: f.horizonDays,
		holdMinutes: f.holdMinutes,
		depositBp: exact(parsePercentToBasisPoints(f.depositPercent)),
		depositMinimum: exact(parseMoney(f.depositMinimum, currency)),
		overtimeIncrementMinutes: f.overtimeIncrementMinutes,
		engineerHourly: exact(parseMoney(f.engineerHourly, currency)),
		engineerHalfDay: exact(parseMoney(f.engineerHalfDay, currency)),
		engineerFullDay: exact(parseMoney(f.engineerFullDay, currency)),
		closedOnPublicHolidays: f.closedOnPublicHolidays,
		openingHours,
		cancellation
	};
}

// ---------------------------------------------------------------------------------------------
// Surcharge rules: one small form per rule, and one to add a rule.

export const SURCHARGE_KINDS = ['window', 'holiday'] as const;

export const surchargeSchema = z
	.object({
		id: z
			.string()
			.regex(/^(?:[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})?$/i, { error: 'Unknown surcharge.' })
			.default(''),
		label: lineText({ error: 'Name the surcharge, e.g. Evening.' })
			.trim()
			.min(1, { error: 'Name the surcharge, e.g. Evening.' })
			.max(80, { error: 'Keep the name under 80 characters.' }),
		kind: z.enum(SURCHARGE_KINDS, { error: 'Choose a time window or public holidays.' }).default('window'),
		percent: percentText(500, 'surcharge'),
		weekdays: z.array(z.number().int().min(1).max(7)).max(7).default([]),
		from: z.string().trim().max(5).default('00:00'),
		to: z.string().trim().max(5).default('24:00'),
		active: z.boolean().default(false)
	})
	.superRefine((v, ctx) => {
		if (v.kind !== 'window') return;
		if (v.weekdays.length === 0) ctx.addIssue({ code: 'custom', path: ['weekdays'], message: 'Tick at least one day.' });
		for (const key of ['from', 'to'] as const) {
			if (!CLOCK_RE.test(v[key]))
				ctx.addIssue({ code: 'custom', path: [key], message: 'Use a time such as 18:00 (24:00 is midnight).' });
		}
		if (CLOCK_RE.test(v.from) && CLOCK_RE.test(v.to) && clockMinutes(v.from) === clockMinutes(v.to)) {
			ctx.addIssue({ code: 'custom', path: ['to'], message: 'The window needs a length: use 00:00 to 24:00 for the whole day.' });
		}
	});

export type SurchargeForm = z.infer<typeof surchargeSchema>;

export function surchargeFormFrom(r: SurchargeValues & { id: string }): SurchargeForm {
	return {
		id: r.id,
		label: r.label,
		kind: r.kind,
		percent: basisPointsToPercent(r.percentBp),
		weekdays: [...r.weekdays].sort((a, b) => a - b),
		from: clockLabel(r.fromMinute),
		to: clockLabel(r.toMinute),
		active: r.active
	};
}

export function surchargeValuesFrom(f: SurchargeForm): SurchargeValues {
	const window = f.kind === 'window';
	return {
		label: f.label,
		kind: f.kind,
		percentBp: exact(parsePercentToBasisPoints(f.percent)),
		weekdays: window ? [...new Set(f.weekdays)].sort((a, b) => a - b) : [],
		fromMinute: window ? clockMinutes(f.from) : 0,
		toMinute: window ? clockMinutes(f.to) : 1440,
		active: f.active
	};
}

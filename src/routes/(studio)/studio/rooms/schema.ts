// Rooms & gear: the forms' schemas and the exact conversions between what the owner types and
// what the database stores (money as integer minor units of the studio's currency).
import { z } from 'zod';
import { parseMoney, toDecimalString } from '$lib/domain/money';
import { exact, moneyText } from '$lib/schemas/fields';
import { blockRateFindings, refuseErrors } from '$lib/schemas/rate-card';
import type { BlockLengths } from '$lib/domain/pricing/rateCardChecks';
import { isStudioDate, lineText, multilineText } from '$lib/schemas/input';
import { daysFrom } from '$lib/domain/time';
// Types only: erased before the browser bundle is made.
import type { GearValues, RoomValues } from '$lib/server/inventory';

const UUID_OR_EMPTY = /^(?:[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})?$/i;

/** Categories offered in the gear list; others may be typed. */
export const GEAR_CATEGORIES = [
	'microphone',
	'preamp',
	'compressor',
	'equaliser',
	'instrument',
	'amplifier',
	'monitoring',
	'cable',
	'other'
];

/** The safety notes studios put on the usual suspects; the owner may add any of them to a piece of gear. */
export const USUAL_CAUTIONS = [
	{
		label: 'Phantom power',
		text: 'Needs 48 V phantom power (IEC 61938): switch phantom off and mute the channel before patching; keep it away from ribbon microphones.'
	},
	{
		label: 'Ribbon',
		text: 'Ribbon element: never send phantom power to it and keep it out of strong air blasts (kick drum ports, plosives).'
	},
	{ label: 'Valve / mains', text: 'Valve unit: let it cool before moving; never remove the mains safety earth.' },
	{ label: 'Heavy', text: 'Heavy: moved only by two people, with a dolly where there is one.' },
	{ label: 'Hearing', text: 'Start cue mixes quiet and raise them slowly: long sessions near 85 dB(A) put hearing at risk.' }
] as const;

function buildRoomSchema(currency: string, blocks: BlockLengths) {
	return (
		z
			.object({
				/** Empty for a room being added (the studio's set-up adds its rooms). */
				id: z.string().regex(UUID_OR_EMPTY, { error: 'Unknown room.' }).default(''),
				name: lineText({ error: 'Name the room.' })
					.trim()
					.min(1, { error: 'Name the room.' })
					.max(80, { error: 'Keep the name under 80 characters.' }),
				description: multilineText().trim().max(1000, { error: 'Keep the description under 1000 characters.' }).default(''),
				hourly: moneyText(currency),
				halfDay: moneyText(currency),
				fullDay: moneyText(currency),
				active: z.boolean().default(false)
			})
			// A half day dearer than the full day, or a block many times its hours: a typo, refused.
			.superRefine((v, ctx) => refuseErrors(blockRateFindings(v, blocks, currency), ctx))
	);
}

function buildGearSchema(currency: string) {
	return z.object({
		id: z.string().regex(UUID_OR_EMPTY, { error: 'Unknown gear.' }).default(''),
		name: lineText({ error: 'Describe the piece by type.' })
			.trim()
			.min(2, { error: 'Describe the piece by type, e.g. small-diaphragm condenser, cardioid.' })
			.max(120, { error: 'Keep the name under 120 characters.' }),
		category: lineText({ error: 'Choose a category.' })
			.trim()
			.toLowerCase()
			.min(1, { error: 'Choose a category.' })
			.max(40, { error: 'Keep the category under 40 characters.' }),
		description: multilineText().trim().max(1000, { error: 'Keep the description under 1000 characters.' }).default(''),
		homeRoom: z.string().regex(UUID_OR_EMPTY, { error: 'Choose one of the rooms.' }).default(''),
		hireFee: moneyText(currency),
		hireable: z.boolean().default(false),
		notes: multilineText().trim().max(2000, { error: 'Keep notes under 2000 characters.' }).default(''),
		caution: multilineText().trim().max(1000, { error: 'Keep the caution under 1000 characters.' }).default('')
	});
}

const roomSchemas = new Map<string, ReturnType<typeof buildRoomSchema>>();
const gearSchemas = new Map<string, ReturnType<typeof buildGearSchema>>();

/** One schema object per currency (and block lengths), so the validation adapters' caches stay small. */
export function roomSchema(currency: string, blocks: BlockLengths) {
	const key = `${currency}:${blocks.halfDayMinutes}:${blocks.fullDayMinutes}`;
	let s = roomSchemas.get(key);
	if (!s) roomSchemas.set(key, (s = buildRoomSchema(currency, blocks)));
	return s;
}
export function gearSchema(currency: string) {
	let s = gearSchemas.get(currency);
	if (!s) gearSchemas.set(currency, (s = buildGearSchema(currency)));
	return s;
}

export type RoomForm = z.infer<ReturnType<typeof buildRoomSchema>>;
export type GearForm = z.infer<ReturnType<typeof buildGearSchema>>;

export function roomFormFrom(r: RoomValues & { id: string }, currency: string): RoomForm {
	return {
		id: r.id,
		name: r.name,
		description: r.description,
		hourly: toDecimalString(r.hourly, currency),
		halfDay: toDecimalString(r.halfDay, currency),
		fullDay: toDecimalString(r.fullDay, currency),
		active: r.active
	};
}

export function roomValuesFrom(f: RoomForm, currency: string): RoomValues {
	return {
		name: f.name,
		description: f.description,
		hourly: exact(parseMoney(f.hourly, currency)),
		halfDay: exact(parseMoney(f.halfDay, currency)),
		fullDay: exact(parseMoney(f.fullDay, currency)),
		active: f.active
	};
}

/** A room about to be added: bookable, rates still to fill in. */
export const NEW_ROOM: RoomForm = { id: '', name: '', description: '', hourly: '', halfDay: '', fullDay: '', active: true };

export const NEW_GEAR: Omit<GearForm, 'hireFee'> = {
	id: '',
	name: '',
	category: 'microphone',
	description: '',
	homeRoom: '',
	hireable: false,
	notes: '',
	caution: ''
};

export function gearFormFrom(g: GearValues & { id: string }, currency: string): GearForm {
	return {
		id: g.id,
		name: g.name,
		category: g.category,
		description: g.description,
		homeRoom: g.homeRoomId ?? '',
		hireFee: toDecimalString(g.hireFee, currency),
		hireable: g.hireable,
		notes: g.notes,
		caution: g.caution
	};
}

export function gearValuesFrom(f: GearForm, currency: string): GearValues {
	return {
		name: f.name,
		category: f.category,
		description: f.description,
		homeRoomId: f.homeRoom || null,
		hireFee: exact(parseMoney(f.hireFee, currency)),
		hireable: f.hireable,
		notes: f.notes,
		caution: f.caution
	};
}

// ---------------------------------------------------------------------------------------------
// Blackout days

// A real day within the calendar's years (a blackout in year 1 or 9999 means nothing to a studio).
const realDate = isStudioDate;

export const blackoutSchema = z
	.object({
		startsOn: z.string().trim().refine(realDate, { error: 'Choose the first closed day.' }),
		endsOn: z.string().trim().default(''),
		reason: lineText().trim().max(200, { error: 'Keep the reason under 200 characters.' }).default(''),
		confirm: z.string().optional()
	})
	.superRefine((v, ctx) => {
		if (v.endsOn && !realDate(v.endsOn))
			ctx.addIssue({ code: 'custom', path: ['endsOn'], message: 'Choose the last closed day, or leave it empty for one day.' });
		else if (v.endsOn && realDate(v.startsOn) && v.endsOn < v.startsOn) {
			ctx.addIssue({ code: 'custom', path: ['endsOn'], message: 'The last day is before the first.' });
		} else if (v.endsOn && realDate(v.startsOn) && daysFrom(v.startsOn, v.endsOn) > 366) {
			ctx.addIssue({ code: 'custom', path: ['endsOn'], message: 'Block out at most a year at a time.' });
		}
	});

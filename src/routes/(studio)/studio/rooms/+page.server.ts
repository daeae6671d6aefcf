import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { requireRole } from '$lib/server/guard';
import { staffActor } from '$lib/server/actor';
import { listRooms, staffStudio } from '$lib/server/studio';
import { localDateOf } from '$lib/domain/time';
import * as inventory from '$lib/server/inventory';
import * as blackouts from '$lib/server/blackouts';
import { zodFieldErrors } from '$lib/server/bookings';
import {
	NEW_GEAR,
	blackoutSchema,
	gearFormFrom,
	gearSchema,
	gearValuesFrom,
	roomFormFrom,
	roomSchema,
	type GearForm,
	type RoomForm
} from './schema';
import { formText, readFormData } from '$lib/server/api';
import { roomAction } from './room-action';
import type { Actions, PageServerLoad } from './$types';

type Note = { kind: 'saved' | 'error'; text: string };

const NEW_GEAR_ID = 'gear-new';

function emptyGear(currency: string) {
	return superValidate<GearForm, Note>({ ...NEW_GEAR, hireFee: '0' }, zod4(gearSchema(currency)), {
		id: NEW_GEAR_ID,
		errors: false
	});
}

export const load: PageServerLoad = async ({ locals }) => {
	requireRole(locals, 'owner');
	const studio = await staffStudio(locals);
	const [rooms, gear] = await Promise.all([listRooms(studio.id, { includeInactive: true }), inventory.listGear(studio.id)]);
	const currency = studio.currency;
	const blocks = { halfDayMinutes: studio.halfDayMinutes, fullDayMinutes: studio.fullDayMinutes };
	const upcoming = await blackouts.listUpcoming(studio.id, localDateOf(new Date(), studio.timeZone));
	const [roomForms, gearForms, newGear] = await Promise.all([
		Promise.all(
			rooms.map((r) =>
				superValidate<RoomForm, Note>(roomFormFrom(r, currency), zod4(roomSchema(currency, blocks)), {
					id: `room-${r.id}`,
					errors: false
				})
			)
		),
		Promise.all(
			gear.map((g) =>
				superValidate<GearForm, Note>(gearFormFrom(g, currency), zod4(gearSchema(currency)), {
					id: `gear-${g.id}`,
					errors: false
				})
			)
		),
		emptyGear(currency)
	]);
	return {
		currency,
		blocks,
		halfDayHours: studio.halfDayMinutes / 60,
		fullDayHours: studio.fullDayMinutes / 60,
		rooms: rooms.map((r) => ({ id: r.id, name: r.name, slug: r.slug, active: r.active })),
		roomForms,
		gear: gear.map((g) => ({ id: g.id, active: g.active, hireFee: g.hireFee })),
		gearForms,
		newGear,
		blackouts: upcoming.map((b) => ({ id: b.id, startsOn: b.startsOn, endsOn: b.endsOn, reason: b.reason }))
	};
};

type Clash = Awaited<ReturnType<typeof blackouts.confirmedBookingsOn>>[number];
interface BlackoutResult {
	values: { startsOn: string; endsOn: string; reason: string };
	errors: Record<string, string[]>;
	clashes: (Omit<Clash, 'startsAt' | 'endsAt'> & { startsAt: string; endsAt: string })[];
	saved: boolean;
	needsConfirm: boolean;
}
function blackoutResult(r: Partial<BlackoutResult> & Pick<BlackoutResult, 'values'>): BlackoutResult {
	return { errors: {}, clashes: [], saved: false, needsConfirm: false, ...r };
}

const activeSchema = z.object({ id: z.uuid(), active: z.enum(['true', 'false']) });

export const actions: Actions = {
	room: (event) => roomAction(event),

	gear: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const { currency } = await staffStudio(locals);
		const form = await superValidate<GearForm, Note>(request, zod4(gearSchema(currency)));
		if (!form.valid) return message(form, { kind: 'error', text: 'Not saved: check the marked fields.' }, { status: 422 });
		const actor = staffActor(locals, getClientAddress());
		const values = gearValuesFrom(form.data, currency);
		if (form.data.id) {
			const outcome = await inventory.updateGear(actor, form.data.id, values);
			if (outcome === 'missing')
				return message(form, { kind: 'error', text: 'That gear or its room is not here any more.' }, { status: 404 });
			return message(form, { kind: 'saved', text: 'Saved.' });
		}
		const added = await inventory.addGear(actor, values);
		if (!added) return message(form, { kind: 'error', text: 'Choose one of the rooms.' }, { status: 422 });
		// The new piece shows in the list; the add form starts empty again.
		form.data = { ...NEW_GEAR, hireFee: '0' };
		return message(form, { kind: 'saved', text: `${added.name} added to the gear list.` });
	},

	gearActive: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const parsed = activeSchema.safeParse(Object.fromEntries((await readFormData(request)) ?? []));
		if (!parsed.success) return fail(422, { gearActive: { kind: 'error' as const, text: 'Unknown gear.' } });
		const actor = staffActor(locals, getClientAddress());
		const row = await inventory.setGearActive(actor, parsed.data.id, parsed.data.active === 'true');
		if (!row) return fail(404, { gearActive: { kind: 'error' as const, text: 'That gear is not here any more.' } });
		return {
			gearActive: {
				kind: 'saved' as const,
				text: row.active ? `${row.name} is back in the gear list.` : `${row.name} is retired.`
			}
		};
	},

	blackout: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const raw = Object.fromEntries((await readFormData(request)) ?? []);
		const values = { startsOn: formText(raw.startsOn), endsOn: formText(raw.endsOn), reason: formText(raw.reason) };
		const parsed = blackoutSchema.safeParse(raw);
		if (!parsed.success) return fail(422, { blackout: blackoutResult({ values, errors: zodFieldErrors(parsed.error) }) });
		const { startsOn, reason, confirm } = parsed.data;
		const endsOn = parsed.data.endsOn || startsOn;
		const studio = await staffStudio(locals);
		const clashes = (await blackouts.confirmedBookingsOn(studio.id, startsOn, endsOn, studio.timeZone)).map((b) => ({
			...b,
			startsAt: b.startsAt.toISOString(),
			endsAt: b.endsAt.toISOString()
		}));
		// Confirmed bookings are never cancelled here: the owner sees them and decides first.
		if (clashes.length && confirm !== 'yes') {
			return fail(409, { blackout: blackoutResult({ values, clashes, needsConfirm: true }) });
		}
		await blackouts.addBlackout(staffActor(locals, getClientAddress()), { startsOn, endsOn, reason });
		return { blackout: blackoutResult({ saved: true, values: { startsOn: '', endsOn: '', reason: '' }, clashes }) };
	},

	removeBlackout: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const parsed = z.object({ id: z.uuid() }).safeParse(Object.fromEntries((await readFormData(request)) ?? []));
		if (!parsed.success) return fail(422, { removed: { error: 'Unknown blackout.' } });
		const row = await blackouts.removeBlackout(staffActor(locals, getClientAddress()), parsed.data.id);
		if (!row) return fail(404, { removed: { error: 'That blackout was already removed.' } });
		return { removed: { saved: `The blackout from ${row.startsOn} is removed; those days are open again.` } };
	}
};

// Saving a room's rate card, or adding a room: one action shared by Rooms & gear and the studio's
// set-up, which both show the rate card form (RoomRates.svelte).
import type { RequestEvent } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireRole } from '$lib/server/guard';
import { staffActor } from '$lib/server/actor';
import { staffStudio } from '$lib/server/studio';
import * as inventory from '$lib/server/inventory';
import { blockRateFindings } from '$lib/schemas/rate-card';
import { NEW_ROOM, roomSchema, roomValuesFrom, type RoomForm } from './schema';

type Note = { kind: 'saved' | 'error'; text: string };

export async function roomAction({
	request,
	locals,
	getClientAddress
}: Pick<RequestEvent, 'request' | 'locals' | 'getClientAddress'>) {
	requireRole(locals, 'owner');
	const { currency, halfDayMinutes, fullDayMinutes } = await staffStudio(locals);
	const blocks = { halfDayMinutes, fullDayMinutes };
	const form = await superValidate<RoomForm, Note>(request, zod4(roomSchema(currency, blocks)));
	if (!form.valid) return message(form, { kind: 'error', text: 'Not saved: check the marked fields.' }, { status: 422 });
	const actor = staffActor(locals, getClientAddress());
	const odd = blockRateFindings(form.data, blocks, currency).length ? ' Some rates look odd: see the notes beside them.' : '';
	if (!form.data.id) {
		await inventory.addRoom(actor, roomValuesFrom(form.data, currency));
		// The new room shows in the list; the add form starts empty again.
		const name = form.data.name;
		form.data = { ...NEW_ROOM };
		return message(form, { kind: 'saved', text: `${name} added.${odd}` });
	}
	const found = await inventory.updateRoom(actor, form.data.id, roomValuesFrom(form.data, currency));
	if (!found) return message(form, { kind: 'error', text: 'That room is not here any more.' }, { status: 404 });
	return message(form, { kind: 'saved', text: `${form.data.name} saved. New quotes use this rate card.${odd}` });
}

import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import * as people from '$lib/server/people';
import { requireRole } from '$lib/server/guard';
import { ROLES } from '$lib/roles';
import { lineText } from '$lib/schemas/input';
import { readFormData } from '$lib/server/api';
import { staffActor } from '$lib/server/actor';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const owner = requireRole(locals, 'owner');
	const actor = staffActor(locals, null);
	const everyone = await people.list(actor.studioId);
	return { people: everyone.map((p) => ({ ...p, createdAt: p.createdAt.toISOString() })), me: owner.id };
};

const roleSchema = z.object({ userId: lineText().min(1).max(64), role: z.enum(ROLES) });

export const actions: Actions = {
	setRole: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const form = await readFormData(request);
		const parsed = roleSchema.safeParse(form ? Object.fromEntries(form) : {});
		if (!parsed.success) return fail(422, { error: 'Choose one of the four roles.' });
		const { userId, role } = parsed.data;
		const changed = await people.setRole(staffActor(locals, getClientAddress()), userId, role);
		if (!changed.ok) return fail(changed.status, { error: changed.message });
		return { saved: `${changed.email} is now ${role}.` };
	}
};

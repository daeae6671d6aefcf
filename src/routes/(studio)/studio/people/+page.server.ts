import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import * as people from '$lib/server/people';
import * as invitations from '$lib/server/invitations';
import { requireRole } from '$lib/server/guard';
import { ROLES } from '$lib/roles';
import { lineText } from '$lib/schemas/input';
import { readFormData } from '$lib/server/api';
import { staffActor } from '$lib/server/actor';
import { STAFF_ROLES } from '$lib/server/db/schema';
import { INVITATION_DAYS } from '$lib/server/mail/invitation';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const owner = requireRole(locals, 'owner');
	const actor = staffActor(locals, null);
	const [everyone, waiting] = await Promise.all([people.list(actor.studioId), invitations.pending(actor.studioId)]);
	return {
		people: everyone.map((p) => ({ ...p, createdAt: p.createdAt.toISOString() })),
		invitations: waiting.map((i) => ({ ...i, expiresAt: i.expiresAt.toISOString() })),
		invitationDays: INVITATION_DAYS,
		invitationLimit: invitations.PENDING_INVITATION_LIMIT,
		me: owner.id
	};
};

const roleSchema = z.object({ userId: lineText().min(1).max(64), role: z.enum(ROLES) });
const personSchema = z.object({ userId: lineText().min(1).max(64) });
const inviteSchema = z.object({
	email: z.email({ error: 'Enter a valid e-mail address.' }).trim().toLowerCase().max(254),
	role: z.enum(STAFF_ROLES, { error: 'Choose engineer, accountant or owner.' })
});
const invitationSchema = z.object({ invitationId: z.uuid({ error: 'No such invitation.' }) });

async function fields(request: Request) {
	const form = await readFormData(request);
	return form ? Object.fromEntries(form) : {};
}

export const actions: Actions = {
	setRole: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const parsed = roleSchema.safeParse(await fields(request));
		if (!parsed.success) return fail(422, { error: 'Choose one of the four roles.' });
		const { userId, role } = parsed.data;
		const changed = await people.setRole(staffActor(locals, getClientAddress()), userId, role);
		if (!changed.ok) return fail(changed.status, { error: changed.message });
		return { saved: `${changed.email} is now ${role}.` };
	},
	/** Takes someone out of the team; their past sessions stay theirs. */
	remove: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const parsed = personSchema.safeParse(await fields(request));
		if (!parsed.success) return fail(422, { error: 'Choose someone in the team.' });
		const changed = await people.setRole(staffActor(locals, getClientAddress()), parsed.data.userId, 'artist');
		if (!changed.ok) return fail(changed.status, { error: changed.message });
		return { saved: `${changed.email} is no longer in the team.` };
	},
	invite: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const raw = await fields(request);
		const parsed = inviteSchema.safeParse(raw);
		const values = {
			email: typeof raw.email === 'string' ? raw.email.slice(0, 254) : '',
			role: typeof raw.role === 'string' ? raw.role : ''
		};
		if (!parsed.success) return fail(422, { inviteError: parsed.error.issues[0]?.message ?? 'Check the form.', values });
		const made = await invitations.invite(staffActor(locals, getClientAddress()), request.headers, parsed.data);
		if (!made.ok) return fail(made.status, { inviteError: made.message, values });
		return { saved: `Invitation sent to ${made.email}.` };
	},
	revoke: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const parsed = invitationSchema.safeParse(await fields(request));
		if (!parsed.success) return fail(422, { error: 'No such invitation.' });
		const done = await invitations.revoke(staffActor(locals, getClientAddress()), request.headers, parsed.data.invitationId);
		if (!done.ok) return fail(done.status, { error: done.message });
		return { saved: `The invitation to ${done.email} is withdrawn: its link no longer works.` };
	},
	resend: async ({ request, locals, getClientAddress }) => {
		requireRole(locals, 'owner');
		const parsed = invitationSchema.safeParse(await fields(request));
		if (!parsed.success) return fail(422, { error: 'No such invitation.' });
		const done = await invitations.resend(staffActor(locals, getClientAddress()), request.headers, parsed.data.invitationId);
		if (!done.ok) return fail(done.status, { error: done.message });
		return { saved: `Invitation sent again to ${done.email}.` };
	}
};

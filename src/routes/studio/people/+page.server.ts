import { fail } from '@sveltejs/kit';
import { asc, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import { db } from '$lib/server/db';
import { user } from '$lib/server/db/schema';
import { requireRole } from '$lib/server/guard';
import { audit } from '$lib/server/audit';
import { ROLES } from '$lib/roles';
import { lineText } from '$lib/schemas/input';
import { readFormData } from '$lib/server/api';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireRole(locals, 'owner');
	const people = await db
		.select({ id: user.id, name: user.name, email: user.email, role: user.role, createdAt: user.createdAt })
		.from(user)
		.orderBy(asc(user.role), asc(user.name));
	return { people: people.map((p) => ({ ...p, createdAt: p.createdAt.toISOString() })), me: locals.user?.id };
};

const roleSchema = z.object({ userId: lineText().min(1).max(64), role: z.enum(ROLES) });

export const actions: Actions = {
	setRole: async ({ request, locals, getClientAddress }) => {
		const owner = requireRole(locals, 'owner');
		const form = await readFormData(request);
		const parsed = roleSchema.safeParse(form ? Object.fromEntries(form) : {});
		if (!parsed.success) return fail(422, { error: 'Choose one of the four roles.' });
		const { userId, role } = parsed.data;
		if (userId === owner.id && role !== 'owner') {
			const [{ n } = { n: 0 }] = await db
				.select({ n: sql<number>`count(*)::int` })
				.from(user)
				.where(eq(user.role, 'owner'));
			if (n <= 1) return fail(409, { error: 'You are the only owner: make someone else owner first.' });
		}
		const [updated] = await db
			.update(user)
			.set({ role })
			.where(eq(user.id, userId))
			.returning({ id: user.id, email: user.email });
		if (!updated) return fail(404, { error: 'No such person.' });
		await audit({
			actorId: owner.id,
			action: 'user.role_changed',
			entity: 'user',
			entityId: userId,
			data: { role },
			ip: getClientAddress()
		});
		return { saved: `${updated.email} is now ${role}.` };
	}
};

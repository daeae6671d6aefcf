// The studio's people and their roles, as the owner keeps them. Sign-up always makes an artist;
// only the owner gives other roles, and the last owner cannot give theirs away.
import { asc, eq, sql } from 'drizzle-orm';
import { db } from './db';
import { user } from './db/schema';
import { audit } from './audit';
import type { SessionUser } from './auth';
import type { Role } from '$lib/roles';

/** Everyone with an account, by role and name; for the owner only (null for anyone else). */
export async function list(actor: SessionUser) {
	if (actor.role !== 'owner') return null;
	return db
		.select({ id: user.id, name: user.name, email: user.email, role: user.role, createdAt: user.createdAt })
		.from(user)
		.orderBy(asc(user.role), asc(user.name));
}

export type RoleChange = { ok: true; email: string } | { ok: false; status: 403 | 404 | 409; message: string };

/** The owner gives someone a role; recorded in the audit log. */
export async function setRole(actor: SessionUser, userId: string, role: Role, ip: string | null = null): Promise<RoleChange> {
	if (actor.role !== 'owner') return { ok: false, status: 403, message: 'Only the owner gives roles.' };
	if (userId === actor.id && role !== 'owner') {
		const [{ n } = { n: 0 }] = await db
			.select({ n: sql<number>`count(*)::int` })
			.from(user)
			.where(eq(user.role, 'owner'));
		if (n <= 1) return { ok: false, status: 409, message: 'You are the only owner: make someone else owner first.' };
	}
	const [updated] = await db.update(user).set({ role }).where(eq(user.id, userId)).returning({ id: user.id, email: user.email });
	if (!updated) return { ok: false, status: 404, message: 'No such person.' };
	await audit({ actorId: actor.id, action: 'user.role_changed', entity: 'user', entityId: userId, data: { role }, ip });
	return { ok: true, email: updated.email };
}

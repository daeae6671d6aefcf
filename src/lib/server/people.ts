// A studio's people as its owner keeps them: its team (owners, engineers, accountants) and the
// artists who have booked there. Signing up gives no role; an owner gives a role in their own
// studio, or takes someone out of the team (their past sessions stay theirs). A studio always
// keeps at least one owner.
import { and, eq, exists, or, sql } from 'drizzle-orm';
import { db } from './db';
import { booking, member, organization, user } from './db/schema';
import { audit } from './audit';
import type { Actor } from './actor';
import { roleIn } from './team';
import type { Role } from '$lib/roles';

export interface StudioPerson {
	id: string;
	name: string;
	email: string;
	role: Role;
	createdAt: Date;
}

/** The studio's team and the artists who have booked there, by role and name. */
export async function list(studioId: string): Promise<StudioPerson[]> {
	const team = await db
		.select({ id: user.id, name: user.name, email: user.email, role: member.role, createdAt: user.createdAt })
		.from(member)
		.innerJoin(user, eq(user.id, member.userId))
		.where(eq(member.organizationId, studioId));
	const inTeam = new Set(team.map((p) => p.id));
	const artists = await db
		.selectDistinct({ id: user.id, name: user.name, email: user.email, createdAt: user.createdAt })
		.from(booking)
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(eq(booking.studioId, studioId));
	const order: Role[] = ['owner', 'engineer', 'accountant', 'artist'];
	return [
		...team.map((p) => ({ ...p, role: p.role as Role })),
		...artists.filter((a) => !inTeam.has(a.id)).map((a) => ({ ...a, role: 'artist' as const }))
	].sort((x, y) => order.indexOf(x.role) - order.indexOf(y.role) || x.name.localeCompare(y.name));
}

/** One person of the studio's people (in its team, or an artist who has booked there), or null. */
async function personAt(studioId: string, userId: string): Promise<{ email: string } | null> {
	const [row] = await db
		.select({ email: user.email })
		.from(user)
		.where(
			and(
				eq(user.id, userId),
				or(
					exists(
						db
							.select({ one: sql`1` })
							.from(member)
							.where(and(eq(member.organizationId, studioId), eq(member.userId, userId)))
					),
					exists(
						db
							.select({ one: sql`1` })
							.from(booking)
							.where(and(eq(booking.studioId, studioId), eq(booking.artistId, userId)))
					)
				)
			)
		);
	return row ?? null;
}

export type RoleChange = { ok: true; email: string } | { ok: false; status: 403 | 404 | 409; message: string };

/**
 * An owner gives someone of their studio's people a role there ('artist' takes them out of the
 * team); recorded in the audit log.
 */
export async function setRole(actor: Actor, userId: string, role: Role): Promise<RoleChange> {
	if ((await roleIn(actor.studioId, actor.user.id)) !== 'owner') {
		return { ok: false, status: 403, message: 'Only an owner gives roles.' };
	}
	const person = await personAt(actor.studioId, userId);
	if (!person) return { ok: false, status: 404, message: 'No such person at this studio.' };
	const outcome = await db.transaction(async (tx) => {
		// One change to a studio's team at a time, so two owners stepping down at once cannot
		// leave it with none.
		await tx.select({ id: organization.id }).from(organization).where(eq(organization.id, actor.studioId)).for('update');
		const [current] = await tx
			.select({ role: member.role })
			.from(member)
			.where(and(eq(member.organizationId, actor.studioId), eq(member.userId, userId)));
		const from = (current?.role ?? 'artist') as Role;
		if (from === role) return { from, changed: false } as const;
		if (from === 'owner') {
			const [{ n } = { n: 0 }] = await tx
				.select({ n: sql<number>`count(*)::int` })
				.from(member)
				.where(and(eq(member.organizationId, actor.studioId), eq(member.role, 'owner')));
			if (n <= 1) return 'last-owner' as const;
		}
		if (role === 'artist') {
			await tx.delete(member).where(and(eq(member.organizationId, actor.studioId), eq(member.userId, userId)));
		} else {
			await tx
				.insert(member)
				.values({ id: crypto.randomUUID(), organizationId: actor.studioId, userId, role })
				.onConflictDoUpdate({ target: [member.organizationId, member.userId], set: { role } });
		}
		return { from, changed: true } as const;
	});
	if (outcome === 'last-owner') {
		return {
			ok: false,
			status: 409,
			message:
				userId === actor.user.id
					? 'You are the only owner: make someone else owner first.'
					: 'This is the only owner: make someone else owner first.'
		};
	}
	if (!outcome.changed) return { ok: true, email: person.email };
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'member.role_changed',
		entity: 'user',
		entityId: userId,
		data: { from: outcome.from, to: role },
		ip: actor.ip
	});
	return { ok: true, email: person.email };
}

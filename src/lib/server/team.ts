// A studio's team: who works there and as what. Roles belong to a studio (better-auth's
// organization members): one person can be the engineer of one studio and an artist at another.
// Anyone signed in without a membership is an artist.
import { and, asc, eq } from 'drizzle-orm';
import { db } from './db';
import { member, organization, session, STAFF_ROLES, type StaffRole } from './db/schema';

export interface Membership {
	studioId: string;
	slug: string;
	name: string;
	role: StaffRole;
}

const isStaffRole = (r: string): r is StaffRole => (STAFF_ROLES as readonly string[]).includes(r);

/** Every studio a person works at, the one they joined first first. */
export async function membershipsOf(userId: string): Promise<Membership[]> {
	const rows = await db
		.select({ studioId: organization.id, slug: organization.slug, name: organization.name, role: member.role })
		.from(member)
		.innerJoin(organization, eq(organization.id, member.organizationId))
		.where(eq(member.userId, userId))
		.orderBy(asc(member.createdAt), asc(organization.slug));
	return rows.flatMap((r) => (isStaffRole(r.role) ? [{ ...r, role: r.role }] : []));
}

/** The studio a staff member works in now: the chosen one if they are still in its team, else their first. */
export function currentMembership(memberships: readonly Membership[], chosen: string | null | undefined): Membership | null {
	return memberships.find((m) => m.studioId === chosen) ?? memberships[0] ?? null;
}

/** A person's role in a studio's team, or null when they are not in it. */
export async function roleIn(studioId: string, userId: string): Promise<StaffRole | null> {
	const [row] = await db
		.select({ role: member.role })
		.from(member)
		.where(and(eq(member.organizationId, studioId), eq(member.userId, userId)));
	return row && isStaffRole(row.role) ? row.role : null;
}

/**
 * Makes a studio the one a signed-in session works in (the organization plugin's active
 * organization, kept on the session row). The caller has checked the person is in its team.
 */
export async function setActiveStudio(sessionId: string, studioId: string): Promise<void> {
	await db.update(session).set({ activeOrganizationId: studioId }).where(eq(session.id, sessionId));
}

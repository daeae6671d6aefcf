// Invitations into a studio's team, by e-mail. better-auth's organization plugin keeps them (the
// `invitation` table) and makes the member when one is accepted; its HTTP routes are closed, so
// these verbs check our rules first (the owner alone invites, someone already in the team or
// already invited is a conflict, at most PENDING_INVITATION_LIMIT wait at once, only the address
// invited may accept, a link works once) and then call auth.api with the request's session.
import { and, desc, eq, gt, sql } from 'drizzle-orm';
import { APIError } from 'better-auth/api';
import { db } from './db';
import { invitation, member, organization, user, STAFF_ROLES, type StaffRole } from './db/schema';
import { auth, PENDING_INVITATION_LIMIT } from './auth';
import { audit } from './audit';
import type { Actor } from './actor';
import { roleIn } from './team';

export { PENDING_INVITATION_LIMIT } from './auth';

export interface PendingInvitation {
	id: string;
	email: string;
	role: StaffRole;
	expiresAt: Date;
	expired: boolean;
}

export type Refusal = { ok: false; status: 400 | 403 | 404 | 409 | 410 | 429; message: string };
export type Outcome<T = object> = ({ ok: true } & T) | Refusal;

const isStaffRole = (r: string | null): r is StaffRole => r !== null && (STAFF_ROLES as readonly string[]).includes(r);

const onlyOwners: Refusal = { ok: false, status: 403, message: 'Only an owner invites people into the team.' };

/** The invitations of a studio still waiting for an answer (expired ones too, so they can be sent again), newest first. */
export async function pending(studioId: string, now = new Date()): Promise<PendingInvitation[]> {
	const rows = await db
		.select({ id: invitation.id, email: invitation.email, role: invitation.role, expiresAt: invitation.expiresAt })
		.from(invitation)
		.where(and(eq(invitation.organizationId, studioId), eq(invitation.status, 'pending')))
		.orderBy(desc(invitation.createdAt));
	return rows.flatMap((r) => (isStaffRole(r.role) ? [{ ...r, role: r.role, expired: r.expiresAt <= now }] : []));
}

/** Whether someone with this e-mail address is in the studio's team. */
async function inTeam(studioId: string, email: string): Promise<boolean> {
	const [row] = await db
		.select({ id: member.id })
		.from(member)
		.innerJoin(user, eq(user.id, member.userId))
		.where(and(eq(member.organizationId, studioId), sql`lower(${user.email}) = ${email}`));
	return !!row;
}

/** better-auth's refusal as ours; anything else is not a refusal and goes on up. */
function refusal(e: unknown): Refusal {
	if (!(e instanceof APIError)) throw e;
	const status = e.statusCode === 403 ? 403 : e.statusCode === 404 ? 404 : 400;
	return { ok: false, status, message: e.message || 'The invitation could not be changed.' };
}

/** An owner invites an e-mail address into their studio's team with a role; the e-mail goes out through the outbox. */
export async function invite(
	actor: Actor,
	headers: Headers,
	input: { email: string; role: StaffRole }
): Promise<Outcome<{ id: string; email: string }>> {
	if ((await roleIn(actor.studioId, actor.user.id)) !== 'owner') return onlyOwners;
	const email = input.email.trim().toLowerCase();
	if (await inTeam(actor.studioId, email)) {
		return { ok: false, status: 409, message: `${email} is already in the team: change their role in the list instead.` };
	}
	const now = new Date();
	const waiting = await db
		.select({ email: invitation.email })
		.from(invitation)
		.where(and(eq(invitation.organizationId, actor.studioId), eq(invitation.status, 'pending'), gt(invitation.expiresAt, now)));
	if (waiting.some((w) => w.email.toLowerCase() === email)) {
		return { ok: false, status: 409, message: `${email} is already invited: send that invitation again from the list below.` };
	}
	if (waiting.length >= PENDING_INVITATION_LIMIT) {
		return {
			ok: false,
			status: 429,
			message: `${PENDING_INVITATION_LIMIT} invitations are already waiting for an answer: withdraw some before inviting more.`
		};
	}
	try {
		const made = await auth.api.createInvitation({
			headers,
			body: { email, role: input.role, organizationId: actor.studioId }
		});
		await audit({
			studioId: actor.studioId,
			actorId: actor.user.id,
			action: 'invitation.created',
			entity: 'invitation',
			entityId: made.id,
			data: { email, role: input.role },
			ip: actor.ip
		});
		return { ok: true, id: made.id, email };
	} catch (e) {
		return refusal(e);
	}
}

/** One pending invitation of the actor's studio, or a refusal. */
async function ownPending(actor: Actor, id: string) {
	if ((await roleIn(actor.studioId, actor.user.id)) !== 'owner') return onlyOwners;
	const [row] = await db
		.select()
		.from(invitation)
		.where(and(eq(invitation.id, id), eq(invitation.organizationId, actor.studioId)));
	if (!row) return { ok: false, status: 404, message: 'No such invitation at this studio.' } satisfies Refusal;
	if (row.status !== 'pending') {
		return { ok: false, status: 409, message: `That invitation was ${answered(row.status)} already.` } satisfies Refusal;
	}
	return { ok: true as const, row };
}

/** An owner withdraws a pending invitation: its link stops working. */
export async function revoke(actor: Actor, headers: Headers, id: string): Promise<Outcome<{ email: string }>> {
	const found = await ownPending(actor, id);
	if (!found.ok) return found;
	try {
		await auth.api.cancelInvitation({ headers, body: { invitationId: id } });
	} catch (e) {
		return refusal(e);
	}
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'invitation.revoked',
		entity: 'invitation',
		entityId: id,
		ip: actor.ip
	});
	return { ok: true, email: found.row.email };
}

/**
 * An owner sends a pending invitation again, with a fresh expiry. A lapsed one is withdrawn and
 * replaced by a new one (a new link), since its old link has stopped working.
 */
export async function resend(actor: Actor, headers: Headers, id: string): Promise<Outcome<{ email: string }>> {
	const found = await ownPending(actor, id);
	if (!found.ok) return found;
	const { row } = found;
	if (!isStaffRole(row.role)) return { ok: false, status: 409, message: 'That invitation names no role: withdraw it.' };
	try {
		if (row.expiresAt <= new Date()) {
			await auth.api.cancelInvitation({ headers, body: { invitationId: id } });
			const again = await invite(actor, headers, { email: row.email, role: row.role });
			return again.ok ? { ok: true, email: again.email } : again;
		}
		await auth.api.createInvitation({
			headers,
			body: { email: row.email, role: row.role, organizationId: actor.studioId, resend: true }
		});
	} catch (e) {
		return refusal(e);
	}
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'invitation.resent',
		entity: 'invitation',
		entityId: id,
		ip: actor.ip
	});
	return { ok: true, email: row.email };
}

function answered(status: string): string {
	if (status === 'accepted') return 'accepted';
	if (status === 'canceled') return 'withdrawn';
	if (status === 'rejected') return 'declined';
	return status;
}

export type InvitationState = 'open' | 'expired' | 'accepted' | 'withdrawn' | 'declined';

export interface InvitationView {
	id: string;
	email: string;
	role: StaffRole;
	studioId: string;
	studioName: string;
	expiresAt: Date;
	state: InvitationState;
}

/** What the acceptance page shows of an invitation (anyone holding its link sees it), or null. */
export async function view(id: string, now = new Date()): Promise<InvitationView | null> {
	const [row] = await db
		.select({
			id: invitation.id,
			email: invitation.email,
			role: invitation.role,
			status: invitation.status,
			expiresAt: invitation.expiresAt,
			studioId: organization.id,
			studioName: organization.name
		})
		.from(invitation)
		.innerJoin(organization, eq(organization.id, invitation.organizationId))
		.where(eq(invitation.id, id));
	if (!row || !isStaffRole(row.role)) return null;
	const state: InvitationState =
		row.status === 'accepted'
			? 'accepted'
			: row.status === 'canceled'
				? 'withdrawn'
				: row.status === 'rejected'
					? 'declined'
					: row.expiresAt <= now
						? 'expired'
						: 'open';
	return { ...row, role: row.role, state };
}

/** Why an invitation in this state can no longer be accepted. */
export function closedMessage(state: Exclude<InvitationState, 'open'>): string {
	switch (state) {
		case 'accepted':
			return 'This invitation has been used already: its link works once. If that was not you, ask the studio for a new one.';
		case 'withdrawn':
			return 'The studio has withdrawn this invitation. Ask them for a new one if you still expect to join.';
		case 'declined':
			return 'This invitation was declined. Ask the studio for a new one if you changed your mind.';
		case 'expired':
			return 'This invitation has expired. Ask the studio to send it again.';
	}
}

/**
 * The signed-in person accepts an invitation addressed to their e-mail: better-auth makes them a
 * member with its role and makes the studio their session's active one.
 */
export async function accept(
	who: { id: string; email: string },
	headers: Headers,
	id: string,
	ip: string | null
): Promise<Outcome<{ role: StaffRole; studioId: string }>> {
	const found = await view(id);
	if (!found) return { ok: false, status: 404, message: 'There is no such invitation.' };
	if (found.state !== 'open') return { ok: false, status: 410, message: closedMessage(found.state) };
	if (found.email.toLowerCase() !== who.email.toLowerCase()) {
		return {
			ok: false,
			status: 403,
			// Names nothing of the studio or of the person invited: the link is not this person's.
			message: `This invitation was sent to another e-mail address than ${who.email}. Sign out, then open the link again and sign in (or create an account) with the address it was sent to.`
		};
	}
	if (await roleIn(found.studioId, who.id)) {
		return { ok: false, status: 409, message: `You are in ${found.studioName}'s team already.` };
	}
	try {
		await auth.api.acceptInvitation({ headers, body: { invitationId: id } });
	} catch (e) {
		// Accepted a moment ago by another tab, or withdrawn meanwhile: say what holds now.
		const now = await view(id);
		if (now && now.state !== 'open') return { ok: false, status: 410, message: closedMessage(now.state) };
		return refusal(e);
	}
	await audit({
		studioId: found.studioId,
		actorId: who.id,
		action: 'invitation.accepted',
		entity: 'invitation',
		entityId: id,
		data: { role: found.role },
		ip
	});
	return { ok: true, role: found.role, studioId: found.studioId };
}

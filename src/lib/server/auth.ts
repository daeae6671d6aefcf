import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { sveltekitCookies } from 'better-auth/svelte-kit';
import { organization as organizationPlugin } from 'better-auth/plugins/organization';
import { createAccessControl } from 'better-auth/plugins/access';
import { getRequestEvent } from '$app/server';
import { building } from '$app/environment';
import { env } from '$env/dynamic/private';
import { db } from './db';
import { user, session, account, verification, organization, member, invitation } from './db/schema';
import { isRole, type Role } from '$lib/roles';
import { INVITATION_DAYS } from './mail/invitation';
import { queueInvitation } from './mail';
import { redactText, safeLogArgs } from '$lib/domain/log-redaction';

export type { Role } from '$lib/roles';

export const MIN_PASSWORD_LENGTH = 10;

/**
 * The one header better-auth reads a client's address from. hooks.server.ts sets it on every
 * request from adapter-node's getClientAddress(), replacing whatever the client sent, so neither
 * this header nor X-Forwarded-For can be forged to dodge a limit.
 */
export const CLIENT_ADDRESS_HEADER = 'x-slateroom-client-address';

/**
 * What a studio's team may do through better-auth's organization plugin, by role. The owner runs
 * the team (invites, removes, gives roles, changes the studio); an engineer and an accountant
 * change nothing about it. Their work (the day plan, the accounts) is guarded by our own zones
 * and `requireRole`, not by these statements.
 */
export const teamAccess = createAccessControl({
	organization: ['update', 'delete'],
	member: ['create', 'update', 'delete'],
	invitation: ['create', 'cancel']
} as const);

export const teamRoles = {
	owner: teamAccess.newRole({
		organization: ['update', 'delete'],
		member: ['create', 'update', 'delete'],
		invitation: ['create', 'cancel']
	}),
	engineer: teamAccess.newRole({ organization: [], member: [], invitation: [] }),
	accountant: teamAccess.newRole({ organization: [], member: [], invitation: [] })
};

/** At most this many invitations of a studio wait for an answer at once. */
export const PENDING_INVITATION_LIMIT = 50;

const origin = env.ORIGIN ?? env.BETTER_AUTH_URL ?? 'http://127.0.0.1:3000';

export const auth = betterAuth({
	baseURL: env.BETTER_AUTH_URL ?? origin,
	// The build imports this module to analyse routes; it never signs anything with this placeholder.
	secret: env.BETTER_AUTH_SECRET ?? (building ? 'build-time-placeholder-secret-not-used' : undefined),
	trustedOrigins: [origin],
	database: drizzleAdapter(db, {
		provider: 'pg',
		schema: { user, session, account, verification, organization, member, invitation }
	}),
	emailAndPassword: {
		enabled: true,
		minPasswordLength: MIN_PASSWORD_LENGTH,
		maxPasswordLength: 128,
		autoSignIn: true
	},
	// A person has no role of their own: roles belong to a studio's team (src/lib/server/team.ts),
	// so nothing in a sign-up body can give one (OWASP ASVS 15.3.3, no mass assignment).
	session: {
		expiresIn: 60 * 60 * 24 * 14,
		updateAge: 60 * 60 * 24
	},
	// Only get-session and sign-out are open over HTTP (hooks.server.ts); signing in and up are
	// limited by src/lib/server/rate-limit.ts, since auth.api calls skip better-auth's limiter.
	rateLimit: {
		enabled: true,
		window: 60,
		max: 100
	},
	advanced: {
		ipAddress: { ipAddressHeaders: [CLIENT_ADDRESS_HEADER] },
		useSecureCookies: origin.startsWith('https://'),
		database: { generateId: () => crypto.randomUUID() }
	},
	telemetry: { enabled: false },
	// better-auth logs a failed session lookup with the error whole, and a failed query's error
	// lists its parameters: the session token. Its messages pass through the same redaction as
	// ours (src/lib/domain/log-redaction.ts), and debug output stays off.
	logger: {
		level: 'warn',
		disableColors: true,
		log: (level, message, ...args) => {
			const line = [`[auth] ${redactText(message)}`, ...safeLogArgs(args)].join(' ');
			if (level === 'error') console.error(line);
			else if (level === 'warn') console.warn(line);
			else console.info(line);
		}
	},
	plugins: [
		// A studio is an organization; its team are the members, with our three roles. Its HTTP
		// routes stay closed (hooks.server.ts): our pages check first and then call auth.api.
		organizationPlugin({
			ac: teamAccess,
			roles: teamRoles,
			creatorRole: 'owner',
			invitationExpiresIn: INVITATION_DAYS * 24 * 60 * 60,
			invitationLimit: PENDING_INVITATION_LIMIT,
			// Invitation ids are random UUIDs (122 random bits) that only the invitation e-mail
			// carries, and accounts have no e-mail verification: holding the link, signed in with the
			// address it was sent to, is the proof of that address.
			requireEmailVerificationOnInvitation: false,
			sendInvitationEmail: async ({ invitation: sent, organization: studio, inviter }) => {
				const role = sent.role;
				if (!isRole(role) || role === 'artist') return;
				await queueInvitation({
					id: sent.id,
					email: sent.email,
					role,
					studioId: studio.id,
					studioName: studio.name,
					inviterName: inviter.user.name,
					expiresAt: new Date(sent.expiresAt)
				});
			}
		}),
		// sveltekitCookies must be the last plugin: it copies better-auth's cookies onto SvelteKit's.
		sveltekitCookies(getRequestEvent)
	]
});

export interface SessionUser {
	id: string;
	name: string;
	email: string;
	role: Role;
}

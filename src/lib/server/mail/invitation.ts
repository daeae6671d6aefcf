// The e-mail that invites someone into a studio's team: which studio, as what, the link that
// accepts it and until when it works. Queued in the outbox like every other message, from the
// studio's name and address; a resent invitation (a new expiry) is a new message.
import { enqueueMail, flushSoon } from './outbox';
import { publicOrigin } from './transport';
import { db } from '../db';
import { getStudio } from '../studio';
import { formatDateTime } from '$lib/domain/time';
import { ROLE_LABELS, type Role } from '$lib/roles';

/** How long an invitation's link works. */
export const INVITATION_DAYS = 7;

export interface InvitationFacts {
	id: string;
	email: string;
	role: Role;
	studioName: string;
	inviterName: string;
	expiresAt: Date;
	timeZone: string;
	locale: string;
	/** The acceptance page, e.g. https://studio.example/invitations/<id>. */
	url: string;
}

const article = (word: string) => (/^[aeiou]/i.test(word) ? 'an' : 'a');

export function composeInvitation(f: InvitationFacts): { subject: string; text: string } {
	const role = ROLE_LABELS[f.role].toLowerCase();
	const until = formatDateTime(f.expiresAt, f.timeZone, f.locale);
	return {
		subject: `${f.studioName}: join the team as ${article(role)} ${role}`,
		text: [
			`Hello,`,
			``,
			`${f.inviterName} invites you to join ${f.studioName}'s team on Slateroom as ${article(role)} ${role}.`,
			``,
			`Open this link to accept:`,
			f.url,
			``,
			`Sign in or create an account with this e-mail address (${f.email}) when the page asks.`,
			`The link works once, for ${INVITATION_DAYS} days: until ${until} (${f.timeZone.replace('_', ' ')} time).`,
			``,
			`If you did not expect this, ignore it: nothing happens unless you accept.`,
			``,
			`${f.studioName}`
		].join('\n')
	};
}

/** Queues an invitation's e-mail; called by better-auth's organization plugin once it has written the invitation. */
export async function queueInvitation(input: {
	id: string;
	email: string;
	role: Role;
	studioId: string;
	studioName: string;
	inviterName: string;
	expiresAt: Date;
}): Promise<void> {
	const studio = await getStudio(input.studioId);
	const mail = composeInvitation({
		...input,
		timeZone: studio.timeZone,
		locale: studio.locale,
		url: `${publicOrigin()}/invitations/${input.id}`
	});
	await db.transaction((tx) =>
		enqueueMail(tx, {
			studioId: input.studioId,
			// Each sending of an invitation has its own expiry, so a resend is a message of its own.
			dedupeKey: `invitation:${input.id}:${input.expiresAt.getTime()}`,
			to: input.email,
			subject: mail.subject,
			text: mail.text
		})
	);
	flushSoon();
}

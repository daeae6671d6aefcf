// The e-mail that invites someone into a studio's team: which studio, as what, the link that
// accepts it and until when it works (mail/index.ts queues it in the outbox).
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

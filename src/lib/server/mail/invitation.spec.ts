import { describe, expect, it } from 'vitest';
import { Temporal } from 'temporal-polyfill';
import { composeInvitation, INVITATION_DAYS, type InvitationFacts } from './invitation';

// The expiry as a wall time in the studio's zone, from the IANA database through Temporal (an
// outside reference, independent of the app's own zone code).
const helsinki = (wall: string) => new Date(Temporal.ZonedDateTime.from(`${wall}[Europe/Helsinki]`).epochMilliseconds);

const facts = (over: Partial<InvitationFacts> = {}): InvitationFacts => ({
	id: '0b7e4c1a-9d2f-4e8b-a1c3-5f6d7e8f9a0b',
	email: 'new.engineer@example.test',
	role: 'engineer',
	studioName: 'Hollow Pine Studio',
	inviterName: 'Maija Owner',
	expiresAt: helsinki('2027-03-28T18:30'),
	timeZone: 'Europe/Helsinki',
	locale: 'en-GB',
	url: 'https://studio.example.test/invitations/0b7e4c1a-9d2f-4e8b-a1c3-5f6d7e8f9a0b',
	...over
});

describe('the invitation e-mail', () => {
	it('names the studio, the role, the link and when it stops working, in the studio’s zone', () => {
		const mail = composeInvitation(facts());
		expect(mail.subject).toBe('Hollow Pine Studio: join the team as an engineer');
		expect(mail.text).toContain("Maija Owner invites you to join Hollow Pine Studio's team on Slateroom as an engineer.");
		expect(mail.text).toContain('\nhttps://studio.example.test/invitations/0b7e4c1a-9d2f-4e8b-a1c3-5f6d7e8f9a0b\n');
		expect(mail.text).toContain('(new.engineer@example.test)');
		// 2027-03-28 is the EU spring change (Directive 2000/84/EC): 18:30 in Helsinki is 15:30 UTC.
		expect(mail.text).toContain(`for ${INVITATION_DAYS} days: until Sun, 28 Mar 2027, 18:30 (Europe/Helsinki time)`);
	});

	it('says "a" or "an" as the role needs', () => {
		expect(composeInvitation(facts({ role: 'accountant' })).subject).toBe('Hollow Pine Studio: join the team as an accountant');
		expect(composeInvitation(facts({ role: 'owner' })).subject).toBe('Hollow Pine Studio: join the team as an owner');
	});
});

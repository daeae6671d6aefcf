// A studio's team over real HTTP: an owner invites by e-mail (the message through the outbox to
// the mail catcher), the invited person signs up with that address and accepts once, becomes an
// engineer of that studio and sees its day plan; refusals for a used, withdrawn, expired or
// misaddressed link, a non-owner, someone already in the team and a full list of invitations;
// the last owner stays; a removed engineer loses the plan at once and keeps their past sessions;
// a person in two teams switches between them and into no other. Two studios of this file's own
// (a copy of the demo studio's settings), so nothing here touches the demo team.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { Client } from '../support/http';
import { APP_URL, DEMO } from '../support/env';
import { studioIdOf, testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { invitationIdIn, joinTeam, mailTo, makeStudio as makeStudioIn, userIdOf, type TestStudio } from '../support/team';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

const PASSWORD = 'team-spec-password';
const run = crypto.randomUUID().slice(0, 8);
const address = (who: string) => `${who}-${run}@team.slateroom.test`;

// A far-future day no other spec books: this file's sessions clash with nothing.
const DAY = '2033-06-14';
const at = (hhmm: string) => new Date(`${DAY}T${hhmm}:00+03:00`);

type Studio = TestStudio;
const makeStudio = (name: string) => makeStudioIn(db, name);
const join = (studioId: string, userId: string, role: t.StaffRole) => joinTeam(db, studioId, userId, role);
const userId = (email: string) => userIdOf(db, email);

/** A confirmed session in a studio's room on this file's day, with an engineer. */
async function session(studio: Studio, artistId: string, engineerId: string, start: string, end: string) {
	const id = crypto.randomUUID();
	await db.insert(t.booking).values({
		id,
		studioId: studio.id,
		reference: `T-${id.slice(0, 8)}`,
		roomId: studio.room,
		artistId,
		engineerId,
		startsAt: at(start),
		endsAt: at(end),
		busyUntil: at(end),
		status: 'confirmed',
		// The shape a priced booking keeps (its pages read the lines and VAT back).
		quote: {
			currency: 'EUR',
			lines: [],
			net: 1000,
			vat: [],
			vatTotal: 0,
			gross: 1000,
			rounding: 0,
			total: 1000,
			deposit: 0,
			balance: 1000
		},
		currency: 'EUR',
		total: 1000,
		deposit: 0
	});
	return id;
}

async function signUp(who: string) {
	return new Client().signUp(`Team spec ${who}`, address(who), PASSWORD);
}

async function invite(owner: Client, email: string, role = 'engineer') {
	return owner.form('/studio/people?/invite', { email, role });
}

/** Invites an address and returns the invitation id from the e-mail the catcher received. */
async function inviteAndRead(owner: Client, email: string, role = 'engineer') {
	const before = (await mailTo(email)).length;
	const res = await invite(owner, email, role);
	expect(res.status).toBe(200);
	const mail = await waitFor(async () => (await mailTo(email))[before], `the invitation e-mail to ${email}`);
	const id = invitationIdIn(mail.text);
	expect(id).toBeDefined();
	return { id: id!, mail };
}

let a: Studio;
let b: Studio;
let ownerA: Client;
let ownerAId: string;

beforeAll(async () => {
	a = await makeStudio(`Team Spec Barn ${run}`);
	b = await makeStudio(`Team Spec Loft ${run}`);
	ownerA = await signUp('owner-a');
	ownerAId = await userId(address('owner-a'));
	await join(a.id, ownerAId, 'owner');
});

describe('an invitation by e-mail', () => {
	let invitationId: string;
	const engineerEmail = address('engineer');

	it('is e-mailed with the studio, the role, the link and its expiry', async () => {
		const { id, mail } = await inviteAndRead(ownerA, engineerEmail);
		invitationId = id;
		expect(mail.subject).toBe(`${a.name}: join the team as an engineer`);
		expect(mail.from[0]!.name).toBe(a.name);
		expect(mail.text).toContain(`${APP_URL}/invitations/${id}`);
		expect(mail.text).toContain(`join ${a.name}'s team on Slateroom as an engineer`);
		expect(mail.text).toMatch(/works once, for 7 days: until .+\d{2}:\d{2}/);
		const [row] = await db.select().from(t.invitation).where(eq(t.invitation.id, id));
		expect(row).toMatchObject({ organizationId: a.id, email: engineerEmail, role: 'engineer', status: 'pending' });
		const days = (row!.expiresAt.getTime() - row!.createdAt.getTime()) / 86_400_000;
		expect(days).toBeCloseTo(7, 3);
		// The owner's page lists it, with its expiry.
		const page = await (await ownerA.fetch('/studio/people')).text();
		expect(page).toContain(engineerEmail);
		expect(page).toContain('Link works until');
	});

	it('shows a visitor the studio and the role, and the way to sign in or up and come back', async () => {
		const res = await new Client().fetch(`/invitations/${invitationId}`);
		expect(res.status).toBe(200);
		const html = await res.text();
		expect(html).toContain(`Join ${a.name}`);
		expect(html).toContain('an engineer');
		expect(html).toContain(`/sign-up?next=${encodeURIComponent(`/invitations/${invitationId}`)}`);
		expect(html).toContain(`/sign-in?next=${encodeURIComponent(`/invitations/${invitationId}`)}`);
	});

	it('refuses someone signed in with another address (403), names neither the studio nor the invited address, and changes nothing', async () => {
		const artist = await new Client().signIn(DEMO.artist);
		const page = await artist.fetch(`/invitations/${invitationId}`);
		expect(page.status).toBe(403);
		const text = await page.text();
		expect(text).toContain(`sent to another e-mail address than ${DEMO.artist}`);
		expect(text).not.toContain(engineerEmail);
		expect(text).not.toContain(a.name);
		const res = await artist.form(`/invitations/${invitationId}?/accept`, {});
		expect(res.status).toBe(403);
		const refused = await res.text();
		expect(refused).toContain(`sent to another e-mail address than ${DEMO.artist}`);
		expect(refused).not.toContain(engineerEmail);
		const [row] = await db.select({ status: t.invitation.status }).from(t.invitation).where(eq(t.invitation.id, invitationId));
		expect(row!.status).toBe('pending');
	});

	it('is accepted by the invited address after signing up: an engineer of that studio who sees its day plan', async () => {
		const engineer = new Client();
		// Sign-up follows the invitation's own page back, as its link does.
		const up = await engineer.fetch(`/sign-up?next=${encodeURIComponent(`/invitations/${invitationId}`)}`);
		expect(up.status).toBe(200);
		const signedUp = await engineer.form('/sign-up', {
			name: 'Team spec engineer',
			email: engineerEmail,
			password: PASSWORD,
			next: `/invitations/${invitationId}`
		});
		expect(signedUp.status).toBe(303);
		expect(signedUp.headers.get('location')).toBe(`/invitations/${invitationId}`);
		expect(await (await engineer.fetch(`/invitations/${invitationId}`)).text()).toContain(`Accept and join ${a.name}`);

		const accepted = await engineer.form(`/invitations/${invitationId}?/accept`, {});
		expect(accepted.status).toBe(303);
		expect(accepted.headers.get('location')).toBe('/plan');

		const me = await userId(engineerEmail);
		const members = await db
			.select({ role: t.member.role })
			.from(t.member)
			.where(and(eq(t.member.organizationId, a.id), eq(t.member.userId, me)));
		expect(members).toEqual([{ role: 'engineer' }]);
		const sessions = await db.select({ active: t.session.activeOrganizationId }).from(t.session).where(eq(t.session.userId, me));
		expect(sessions.map((s) => s.active)).toContain(a.id);

		const plan = await engineer.fetch(`/plan?date=${DAY}`);
		expect(plan.status).toBe(200);
		const html = await plan.text();
		expect(html).toContain(`Day plan · ${a.name}`);
		expect(html).toContain(`${a.name} room`);
	});

	it('works once: a second use says so, for anyone, and makes nothing', async () => {
		const again = await new Client().signIn(engineerEmail, PASSWORD);
		const res = await again.form(`/invitations/${invitationId}?/accept`, {});
		expect(res.status).toBe(410);
		expect(await res.text()).toContain('has been used already');
		const page = await (await new Client().fetch(`/invitations/${invitationId}`)).text();
		expect(page).toContain('has been used already');
		const rows = await db
			.select()
			.from(t.member)
			.where(and(eq(t.member.organizationId, a.id), eq(t.member.userId, await userId(engineerEmail))));
		expect(rows).toHaveLength(1);
	});

	it('is refused for someone already in the team (409)', async () => {
		const res = await invite(ownerA, engineerEmail.toUpperCase());
		expect(res.status).toBe(409);
		expect(await res.text()).toContain('is already in the team');
	});

	it('is refused for an address already invited (409) until it is withdrawn', async () => {
		const email = address('twice');
		const { id } = await inviteAndRead(ownerA, email, 'accountant');
		const twice = await invite(ownerA, email);
		expect(twice.status).toBe(409);
		expect(await twice.text()).toContain('is already invited');
		const withdrawn = await ownerA.form('/studio/people?/revoke', { invitationId: id });
		expect(withdrawn.status).toBe(200);
		const invited = await signUp('twice');
		const res = await invited.form(`/invitations/${id}?/accept`, {});
		expect(res.status).toBe(410);
		expect(await res.text()).toContain('withdrawn this invitation');
	});

	it('can be sent again with a fresh expiry, in a second e-mail', async () => {
		const email = address('again');
		const { id } = await inviteAndRead(ownerA, email);
		await db
			.update(t.invitation)
			.set({ expiresAt: new Date(Date.now() + 3_600_000) })
			.where(eq(t.invitation.id, id));
		const res = await ownerA.form('/studio/people?/resend', { invitationId: id });
		expect(res.status).toBe(200);
		await waitFor(async () => (await mailTo(email)).length >= 2 || undefined, 'the second invitation e-mail');
		const [row] = await db.select().from(t.invitation).where(eq(t.invitation.id, id));
		expect(row!.expiresAt.getTime()).toBeGreaterThan(Date.now() + 6 * 86_400_000);
		expect(row!.status).toBe('pending');
	});

	it('is refused once expired, with a clear message and no member made', async () => {
		const email = address('late');
		const { id } = await inviteAndRead(ownerA, email);
		await db
			.update(t.invitation)
			.set({ expiresAt: new Date(Date.now() - 60_000) })
			.where(eq(t.invitation.id, id));
		const late = await signUp('late');
		const page = await late.fetch(`/invitations/${id}`);
		expect(page.status).toBe(200);
		expect(await page.text()).toContain('This invitation has expired');
		const res = await late.form(`/invitations/${id}?/accept`, {});
		expect(res.status).toBe(410);
		expect(await res.text()).toContain('This invitation has expired');
		expect(
			await db
				.select()
				.from(t.member)
				.where(eq(t.member.userId, await userId(email)))
		).toEqual([]);
	});

	it('answers an unknown invitation with 404 and a malformed id with 404', async () => {
		expect((await new Client().fetch(`/invitations/${crypto.randomUUID()}`)).status).toBe(404);
		expect((await new Client().fetch('/invitations/not-an-id')).status).toBe(404);
	});

	it('is only for owners: an engineer or accountant cannot invite (403)', async () => {
		const engineer = await new Client().signIn(engineerEmail, PASSWORD);
		const res = await invite(engineer, address('by-engineer'));
		expect(res.status).toBe(403);
		const demoAccountant = await new Client().signIn(DEMO.accountant);
		expect((await invite(demoAccountant, address('by-accountant'))).status).toBe(403);
		expect(
			await db
				.select()
				.from(t.invitation)
				.where(eq(t.invitation.email, address('by-engineer')))
		).toEqual([]);
	});

	it("keeps better-auth's organization routes closed over HTTP", async () => {
		const engineer = await new Client().signIn(engineerEmail, PASSWORD);
		for (const [method, path] of [
			['POST', '/api/auth/organization/invite-member'],
			['POST', '/api/auth/organization/accept-invitation'],
			['POST', '/api/auth/organization/set-active'],
			['POST', '/api/auth/organization/update-member-role'],
			['GET', '/api/auth/organization/list-invitations']
		] as const) {
			const res = await engineer.json(
				path,
				method === 'POST' ? { email: address('x'), role: 'owner', organizationId: a.id } : undefined
			);
			expect(res.status, path).toBe(404);
		}
	});

	it('caps the invitations waiting at once per studio', async () => {
		const ownerB = await signUp('owner-b');
		await join(b.id, await userId(address('owner-b')), 'owner');
		const inviter = await userId(address('owner-b'));
		await db.insert(t.invitation).values(
			Array.from({ length: 50 }, (_, i) => ({
				id: crypto.randomUUID(),
				organizationId: b.id,
				email: address(`waiting-${i}`),
				role: 'engineer',
				expiresAt: new Date(Date.now() + 86_400_000),
				inviterId: inviter
			}))
		);
		const res = await invite(ownerB, address('one-too-many'));
		expect(res.status).toBe(429);
		expect(await res.text()).toContain('50 invitations are already waiting');
		await db.delete(t.invitation).where(eq(t.invitation.organizationId, b.id));
	});
});

describe('the team keeps an owner, and a removed member keeps their past work', () => {
	it('refuses to demote or remove the last owner (409)', async () => {
		const demote = await ownerA.form('/studio/people?/setRole', { userId: ownerAId, role: 'engineer' });
		expect(demote.status).toBe(409);
		expect(await demote.text()).toContain('You are the only owner');
		const leave = await ownerA.form('/studio/people?/remove', { userId: ownerAId });
		expect(leave.status).toBe(409);
		const [row] = await db
			.select({ role: t.member.role })
			.from(t.member)
			.where(and(eq(t.member.organizationId, a.id), eq(t.member.userId, ownerAId)));
		expect(row!.role).toBe('owner');
	});

	it('takes a removed engineer off the day plan at once, and their sessions still name them', async () => {
		const removed = await signUp('removed');
		const removedId = await userId(address('removed'));
		await join(a.id, removedId, 'engineer');
		const booking = await session(a, ownerAId, removedId, '10:00', '12:00');
		expect((await removed.fetch(`/plan?date=${DAY}`)).status).toBe(200);

		const res = await ownerA.form('/studio/people?/remove', { userId: removedId });
		expect(res.status).toBe(200);
		expect(await res.text()).toContain('is no longer in the team');

		// The same session cookie, the next request: the plan is closed to them.
		expect((await removed.fetch(`/plan?date=${DAY}`)).status).toBe(403);
		// Its API by address: the studio is not published, so to someone outside its team it is not there.
		expect((await removed.fetch(`/api/studios/${a.slug}/plan?date=${DAY}`)).status).toBe(404);
		// The session they ran is still theirs.
		const [row] = await db.select({ engineerId: t.booking.engineerId }).from(t.booking).where(eq(t.booking.id, booking));
		expect(row!.engineerId).toBe(removedId);
		const seen = await ownerA.fetch(`/api/bookings/${booking}`);
		expect(seen.status).toBe(200);
		expect(JSON.stringify(await seen.json())).toContain('Team spec removed');
		const plan = (await (await ownerA.fetch(`/api/studios/${a.slug}/plan?date=${DAY}`)).json()) as unknown;
		expect(JSON.stringify(plan)).toContain(booking);
	});
});

describe('a person in two teams', () => {
	it('switches to the other studio and sees its plan, and cannot switch into a studio they are not in', async () => {
		const email = address('engineer');
		const me = await userId(email);
		await join(b.id, me, 'engineer');
		const mine = await session(a, ownerAId, me, '14:00', '15:00');
		const theirs = await session(b, ownerAId, me, '16:00', '17:00');
		const engineer = await new Client().signIn(email, PASSWORD);

		// Signed in afresh: the first studio they joined.
		let html = await (await engineer.fetch(`/plan?date=${DAY}`)).text();
		expect(html).toContain(`Day plan · ${a.name}`);
		expect(html).toContain('data-testid="studio-switch"');
		let plan = JSON.stringify(await (await engineer.fetch(`/api/studios/${a.slug}/plan?date=${DAY}`)).json());
		expect(plan).toContain(mine);
		expect(plan).not.toContain(theirs);

		const back = `/plan?date=${DAY}`;
		const switched = await engineer.form('/studio-switch', { studio: b.id, back });
		expect(switched.status).toBe(303);
		expect(switched.headers.get('location')).toBe(back);
		html = await (await engineer.fetch(back)).text();
		expect(html).toContain(`Day plan · ${b.name}`);
		plan = JSON.stringify(await (await engineer.fetch(`/api/studios/${b.slug}/plan?date=${DAY}`)).json());
		expect(plan).toContain(theirs);
		expect(plan).not.toContain(mine);

		// Not their team: refused, and the studio they work in stays.
		const demo = await studioIdOf(db);
		expect((await engineer.form('/studio-switch', { studio: demo, back })).status).toBe(403);
		expect((await engineer.form('/studio-switch', { studio: 'x'.repeat(65) })).status).toBe(400);
		plan = JSON.stringify(await (await engineer.fetch(`/api/studios/${b.slug}/plan?date=${DAY}`)).json());
		expect(plan).toContain(theirs);

		// An address their role there cannot open sends them to that role's home instead.
		const home = await engineer.form('/studio-switch', { studio: a.id, back: '/studio/people' });
		expect(home.headers.get('location')).toBe('/plan');
		// An address off the site is not followed.
		const away = await engineer.form('/studio-switch', { studio: a.id, back: '//elsewhere.test/plan' });
		expect(away.headers.get('location')).toBe('/plan');
	});

	it('shows no switcher to someone in one team, and refuses a visitor', async () => {
		const html = await (await ownerA.fetch('/studio/people')).text();
		expect(html).not.toContain('data-testid="studio-switch"');
		expect((await new Client().form('/studio-switch', { studio: a.id })).status).toBe(401);
	});
});

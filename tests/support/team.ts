// A studio's team for specs that need one of their own: a studio beside the demo one (its
// settings copied, under another name, unpublished, with one open room), people put in its team,
// and the invitation e-mails the mail catcher received.
import { eq } from 'drizzle-orm';
import type { Database } from '../../src/lib/server/db/client';
import * as t from '../../src/lib/server/db/schema';
import { studioIdOf } from './db';
import { MAIL_API } from './env';

export interface TestStudio {
	id: string;
	name: string;
	slug: string;
	room: string;
}

export async function makeStudio(db: Database, name: string): Promise<TestStudio> {
	const id = crypto.randomUUID();
	const slug = `team-${id.slice(0, 8)}`;
	await db.insert(t.organization).values({ id, name, slug });
	const [demo] = await db
		.select()
		.from(t.studio)
		.where(eq(t.studio.id, await studioIdOf(db)));
	const { id: _id, updatedAt: _u, ...settings } = demo!;
	await db.insert(t.studio).values({ ...settings, id, name, published: false });
	const [room] = await db
		.insert(t.room)
		.values({
			studioId: id,
			slug: `team-room-${id.slice(0, 6)}`,
			name: `${name} room`,
			hourly: 1000,
			halfDay: 3000,
			fullDay: 5000
		})
		.returning();
	return { id, name, slug, room: room!.id };
}

export async function joinTeam(db: Database, studioId: string, userId: string, role: t.StaffRole): Promise<void> {
	await db.insert(t.member).values({ id: crypto.randomUUID(), organizationId: studioId, userId, role });
}

export async function userIdOf(db: Database, email: string): Promise<string> {
	const [row] = await db.select({ id: t.user.id }).from(t.user).where(eq(t.user.email, email));
	if (!row) throw new Error(`no user ${email}`);
	return row.id;
}

export interface CaughtMail {
	subject: string;
	text: string;
	to: { address: string }[];
	from: { name: string }[];
}

/** Every message the mail catcher holds for an address, oldest first. */
export async function mailTo(address: string): Promise<CaughtMail[]> {
	const all = (await (await fetch(`${MAIL_API}/api/email`)).json()) as CaughtMail[];
	return all.filter((m) => m.to.some((x) => x.address === address));
}

/** The invitation id in an invitation e-mail's link. */
export const invitationIdIn = (text: string) => text.match(/\/invitations\/([0-9a-f-]{36})/)?.[1];

// The engineer's calendar feed over real HTTP: a secret address, read without cookies, parsed back
// independently with node-ical (RFC 5545: one VEVENT per session with a stable UID and SEQUENCE,
// STATUS CONFIRMED or CANCELLED).
import { afterAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import ical from 'node-ical';
import { Client, signedIn } from '../support/http';
import { APP_URL, DEMO } from '../support/env';
import { testDb } from '../support/db';
import { sleep } from '../support/wait';
import { payOnFake } from '../support/stripe-fake';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

async function tokenOf(email: string): Promise<string | undefined> {
	const [row] = await db
		.select({ token: t.calendarFeed.token })
		.from(t.calendarFeed)
		.innerJoin(t.user, eq(t.user.id, t.calendarFeed.userId))
		.where(eq(t.user.email, email));
	return row?.token;
}

async function feed(token: string) {
	const res = await fetch(`${APP_URL}/feed/${token}/sessions.ics`);
	return { status: res.status, type: res.headers.get('content-type'), text: await res.text() };
}

function vevents(text: string): ical.VEvent[] {
	return Object.values(ical.sync.parseICS(text)).filter((c) => c?.type === 'VEVENT') as ical.VEvent[];
}

describe('the calendar feed', () => {
	it('gives engineers every session behind a secret address, and a new address turns the old one off', async () => {
		const engineer = await signedIn(DEMO.engineer);
		const made = await engineer.form('/plan?/feed', {});
		expect(made.status).toBe(200);
		const token = await tokenOf(DEMO.engineer);
		expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);

		// A session held but not paid is nobody's yet: it stays out of the feed until its deposit arrives.
		const artist = await signedIn(DEMO.artist);
		let booked: { id: string; checkoutUrl: string } | undefined;
		for (let i = 0; i < 20 && !booked; i++) {
			const ymd = new Date(Date.now() + (20 + Math.floor(Math.random() * 8)) * 86_400_000).toISOString().slice(0, 10);
			const res = await artist.json('/api/bookings', { room: 'control-room', start: `${ymd}T21:00`, end: `${ymd}T23:00` });
			if (res.status === 201) booked = (await res.json()) as { id: string; checkoutUrl: string };
		}
		expect(booked).toBeDefined();
		const before = await feed(token!);
		expect(before.status).toBe(200);
		expect(before.type).toMatch(/^text\/calendar/);
		expect(vevents(before.text).map((e) => e.uid)).not.toContain(booked!.id);
		// The seeded demo sessions of the coming week are in it, at their exact instants.
		const [demo] = await db.select().from(t.booking).where(eq(t.booking.reference, 'HP-DEMO3'));
		const demoEvent = vevents(before.text).find((e) => e.uid === demo!.id);
		expect(demoEvent?.status).toBe('CONFIRMED');
		expect(new Date(demoEvent!.start!).getTime()).toBe(demo!.startsAt.getTime());
		expect(demoEvent!.summary).toContain('Noa Virta');

		const sessionId = booked!.checkoutUrl.split('/pay/')[1]!;
		expect(await payOnFake(sessionId)).toBe(200);
		let after: ical.VEvent | undefined;
		for (let i = 0; i < 50 && !after; i++) {
			after = vevents((await feed(token!)).text).find((e) => e.uid === booked!.id);
			if (!after) await sleep(200);
		}
		expect(after?.status).toBe('CONFIRMED');

		await engineer.form('/plan?/feed', {});
		const replaced = await tokenOf(DEMO.engineer);
		expect(replaced).not.toBe(token);
		expect((await feed(token!)).status).toBe(404);
		expect((await feed(replaced!)).status).toBe(200);
	});

	it('has no address for artists or accountants, and an unknown address is a 404', async () => {
		for (const who of [DEMO.artist, DEMO.accountant]) {
			const res = await (await signedIn(who)).form('/plan?/feed', {});
			expect(res.status).toBe(403);
			expect(await tokenOf(who)).toBeUndefined();
		}
		expect((await feed('A'.repeat(43))).status).toBe(404);
		expect((await feed('not-a-token')).status).toBe(404);
		expect((await new Client().fetch('/plan')).status).toBe(303);
	});
});

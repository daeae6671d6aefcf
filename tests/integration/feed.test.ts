// The engineer's calendar feed over real HTTP: a secret address, read without cookies, parsed back
// independently with node-ical (RFC 5545: one VEVENT per session with a stable UID and SEQUENCE,
// STATUS CONFIRMED or CANCELLED).
import { afterAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import ical from 'node-ical';
import { Client, signedIn } from '../support/http';
import { APP_URL, DEMO } from '../support/env';
import { testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { addDays, studioToday } from '../support/dates';
import { expectRefusedPage } from '../support/refusal';
import { payOnFake } from '../support/stripe-fake';
import { holdFirstFree } from '../support/booking';
import * as t from '../../src/lib/server/db/schema';
import { DEMO_BOOKING_IDS } from '../../src/lib/domain/demo';

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
	return Object.values(ical.sync.parseICS(text)).filter((c): c is ical.VEvent => c?.type === 'VEVENT');
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
		// The first free late evening in the control room from 20 days ahead, on the studio's calendar.
		const booked = await holdFirstFree(artist, {
			room: 'control-room',
			days: Array.from({ length: 20 }, (_, i) => addDays(studioToday(), 20 + i)),
			slots: [['21:00', '23:00']]
		});
		expect(booked).toBeDefined();
		const before = await feed(token!);
		expect(before.status).toBe(200);
		expect(before.type).toMatch(/^text\/calendar/);
		expect(vevents(before.text).map((e) => e.uid)).not.toContain(booked.id);
		// The seeded demo sessions of the coming week are in it, at their exact instants.
		const [demo] = await db.select().from(t.booking).where(eq(t.booking.id, DEMO_BOOKING_IDS[2]));
		const demoEvent = vevents(before.text).find((e) => e.uid === demo!.id);
		expect(demoEvent?.status).toBe('CONFIRMED');
		expect(new Date(demoEvent!.start).getTime()).toBe(demo!.startsAt.getTime());
		expect(demoEvent!.summary).toContain('Noa Virta');

		expect(await payOnFake(booked.sessionId)).toBe(200);
		const after = await waitFor(
			async () => vevents((await feed(token!)).text).find((e) => e.uid === booked.id),
			'the paid session in the feed'
		);
		expect(after.status).toBe('CONFIRMED');

		await engineer.form('/plan?/feed', {});
		const replaced = await tokenOf(DEMO.engineer);
		expect(replaced).not.toBe(token);
		const old = await feed(token!);
		expect(old.status).toBe(404);
		expect(old.text).not.toContain('BEGIN:VEVENT');
		expect(old.text).not.toContain(booked.id);
		const current = await feed(replaced!);
		expect(current.status).toBe(200);
		expect(vevents(current.text).map((e) => e.uid)).toContain(booked.id);
	});

	it('has no address for artists or accountants, and an unknown address is a 404', async () => {
		for (const who of [DEMO.artist, DEMO.accountant]) {
			const res = await (await signedIn(who)).form('/plan?/feed', {});
			await expectRefusedPage(res, 403, /Your role does not give access/, ['/feed/']);
			expect(await tokenOf(who)).toBeUndefined();
		}
		for (const token of ['A'.repeat(43), 'not-a-token']) {
			const res = await feed(token);
			expect(res.status).toBe(404);
			expect(res.type).not.toMatch(/calendar/);
			expect(res.text).not.toContain('BEGIN:VCALENDAR');
		}
		const stranger = await new Client().fetch('/plan');
		expect(stranger.status).toBe(303);
		expect(stranger.headers.get('location')).toBe('/sign-in?next=%2Fplan');
	});
});

// Scheduled e-mails over real sockets: the reminders planned when the deposit confirms a session,
// cancelled with it, sent once through the outbox when due (also across a restart of an app
// instance, with a second instance running beside the suite's), and the balance request after a
// session is closed; contents read back from the mail catcher. Jobs run on pg-boss in the test
// database (schema pgboss).
import { spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, ne, sql } from 'drizzle-orm';
import { signedIn } from '../support/http';
import { APP_URL, DEMO, MAIL_API } from '../support/env';
import { studioIdOf, testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { workdaysAhead } from '../support/dates';
import { bookAndPay } from '../support/booking';
import { moveIntoPast } from '../support/started';
import { wav } from '../support/audio';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());
const HOUR = 3_600_000;

// The demo studio's reminder settings are its owner's to change, and other files post its settings
// forms (the fuzz and the route walk): this file sets the seeded 7 days and 48 hours, directions
// and load-in notes itself (the same words as scripts/seed.ts).
beforeAll(async () => {
	await db
		.update(t.studio)
		.set({
			reminderHours: [168, 48],
			directions:
				'From the main road, take the gravel lane past the red mailbox; the barn is the second building on the left. Park on the grass beside it.',
			loadInNotes:
				'Level access through the double barn doors, no steps; a trolley waits inside. Ask before carrying anything heavy alone.'
		})
		.where(eq(t.studio.id, await studioIdOf(db)));
});

/** This file's days: working weekdays two weeks and more ahead, so both default reminders are still ahead. */
const DAYS = workdaysAhead(15, 25);
const book = (who: Awaited<ReturnType<typeof signedIn>>) =>
	bookAndPay(db, who, {
		room: 'vocal-booth',
		days: DAYS,
		slots: [
			['21:00', '23:00'],
			['19:00', '21:00']
		]
	});

interface CaughtMail {
	id: string;
	subject: string;
	text: string;
	html?: string;
	to: { address: string }[];
}
async function caught(): Promise<CaughtMail[]> {
	return (await (await fetch(`${MAIL_API}/api/email`)).json()) as CaughtMail[];
}

/** A booking's planned messages (reminders, the balance request); its receipts are the receipts' tests' subject. */
const rowsOf = (bookingId: string) =>
	db
		.select()
		.from(t.scheduledMessage)
		.where(and(eq(t.scheduledMessage.bookingId, bookingId), ne(t.scheduledMessage.kind, 'receipt')))
		.orderBy(t.scheduledMessage.dueAt);

/** The queue's jobs of one message (pg-boss keeps them in pgboss.job until they are archived). */
async function jobsOf(messageId: string) {
	return (await db.execute(
		sql`select state, start_after, singleton_key from pgboss.job where name = 'booking-message' and data->>'messageId' = ${messageId}`
	)) as unknown as { state: string; start_after: Date; singleton_key: string }[];
}

describe('reminders', () => {
	it('are planned 7 days and 48 hours before when the deposit confirms the session, and listed in its JSON', async () => {
		const artist = await signedIn(DEMO.artist);
		const b = await book(artist);
		const [row] = await db.select().from(t.booking).where(eq(t.booking.id, b.id));
		const rows = await waitFor(async () => {
			const r = await rowsOf(b.id);
			return r.length === 2 ? r : undefined;
		}, 'the reminders planned');
		expect(rows.map((r) => [r.kind, r.key, r.dueAt.getTime(), r.sentAt, r.cancelledAt])).toEqual([
			['reminder', 'reminder:168', row!.startsAt.getTime() - 168 * HOUR, null, null],
			['reminder', 'reminder:48', row!.startsAt.getTime() - 48 * HOUR, null, null]
		]);
		// Each has its job waiting on the queue for its own time.
		for (const r of rows) {
			const jobs = await jobsOf(r.id);
			expect(jobs.map((j) => [j.state, new Date(j.start_after).getTime(), j.singleton_key])).toEqual([
				['created', r.dueAt.getTime(), `${r.id}:${r.dueAt.toISOString()}`]
			]);
		}
		const res = await artist.fetch(`/api/bookings/${b.id}`);
		expect(res.status).toBe(200);
		const body = (await res.json()) as { messages: { kind: string; dueAt: string; sentAt: string | null }[] };
		const planned = body.messages.filter((m) => m.kind !== 'receipt');
		expect(planned.map((m) => [m.kind, new Date(m.dueAt).getTime(), m.sentAt])).toEqual(
			rows.map((r) => ['reminder', r.dueAt.getTime(), null])
		);
		// The deposit's receipt is listed with them, already sent.
		expect(body.messages.filter((m) => m.kind === 'receipt').map((m) => m.sentAt !== null)).toEqual([true]);
		// The booking page lists them for the artist.
		const page = await (await artist.fetch(`/bookings/${b.id}`)).text();
		expect(page).toContain('E-mails for this session');
		expect(page).toContain('Reminder, 7 days before');
		expect(page).toContain('Reminder, 48 hours before');
	});

	it('are cancelled when the booking is cancelled, and say so in its JSON', async () => {
		const artist = await signedIn(DEMO.artist);
		const b = await book(artist);
		await waitFor(async () => (await rowsOf(b.id)).length === 2, 'the reminders planned');
		expect((await artist.json(`/api/bookings/${b.id}/cancel`, {})).status).toBe(200);
		const rows = await waitFor(async () => {
			const r = await rowsOf(b.id);
			return r.every((m) => m.cancelledAt) ? r : undefined;
		}, 'the reminders cancelled');
		expect(rows.map((r) => r.sentAt)).toEqual([null, null]);
		const body = (await (await artist.fetch(`/api/bookings/${b.id}`)).json()) as {
			messages: { kind: string; cancelledAt: string | null }[];
		};
		const planned = body.messages.filter((m) => m.kind !== 'receipt');
		expect(planned).toHaveLength(2);
		expect(planned.every((m) => m.cancelledAt !== null)).toBe(true);
		// A message no longer wanted is not on the page (the deposit's receipt still is).
		const page = await (await artist.fetch(`/bookings/${b.id}`)).text();
		expect(page).not.toContain('Reminder, 7 days before');
		expect(page).not.toContain('Reminder, 48 hours before');
	});
});

/** A free TCP port on the loopback, for the second app instance. */
function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const srv = createServer();
		srv.once('error', reject);
		srv.listen(0, '127.0.0.1', () => {
			const { port } = srv.address() as { port: number };
			srv.close(() => resolve(port));
		});
	});
}

/** A second instance of the built app on its own port, same database, queue and services. */
async function startInstance(port: number): Promise<ChildProcess> {
	const origin = `http://127.0.0.1:${port}`;
	const child = spawn(process.execPath, ['build/index.js'], {
		env: { ...process.env, PORT: String(port), HOST: '127.0.0.1', ORIGIN: APP_URL, BETTER_AUTH_URL: APP_URL },
		stdio: ['ignore', 'ignore', 'inherit']
	});
	await waitFor(async () => {
		const res = await fetch(`${origin}/api/health`).catch(() => null);
		return res?.status === 200;
	}, 'the second instance answering');
	return child;
}

/** Stops an instance as the service manager does (SIGTERM) and waits until it has exited. */
function stopInstance(child: ChildProcess): Promise<number | null> {
	return new Promise((resolve) => {
		if (child.exitCode !== null) return resolve(child.exitCode);
		child.once('exit', (code) => resolve(code));
		child.kill('SIGTERM');
	});
}

/**
 * Moves a confirmed session (as a move by the owner would) so that its reminder `hours` before
 * falls `aheadMs` from now: a one-minute session at that odd time, tried a few minutes later
 * while another session has the room then (SQLSTATE 23P01).
 */
async function moveSoWanted(bookingId: string, hours: number, aheadMs: number): Promise<Date> {
	for (let i = 0; i < 10; i++) {
		const startsAt = new Date(Math.ceil((Date.now() + hours * HOUR + aheadMs) / 1000) * 1000 + i * 120_000);
		const endsAt = new Date(startsAt.getTime() + 60_000);
		try {
			await db.update(t.booking).set({ startsAt, endsAt, busyUntil: endsAt }).where(eq(t.booking.id, bookingId));
			return new Date(startsAt.getTime() - hours * HOUR);
		} catch (e) {
			if ((e as { cause?: { code?: string } }).cause?.code === '23P01') continue;
			throw e;
		}
	}
	throw new Error('no free minute to move the session to');
}

describe('a reminder coming due', () => {
	let second: ChildProcess | null = null;
	afterAll(async () => {
		if (second) await stopInstance(second);
	});

	it('is sent once with the session’s details, across a restart and with two instances running', async () => {
		const artist = await signedIn(DEMO.artist);
		const [a, b] = [await book(artist), await book(artist)];
		for (const x of [a, b]) await waitFor(async () => (await rowsOf(x.id)).length === 2, 'the reminders planned');
		const form = new FormData();
		form.set('file', new Blob([wav()], { type: 'audio/wav' }), 'guide-vocal.wav');
		expect((await artist.fetch(`/api/bookings/${a.id}/uploads`, { method: 'POST', body: form })).status).toBe(201);

		const port = await freePort();
		second = await startInstance(port);
		// The sessions move so that the 7-day reminder of one and the 48-hour reminder of the other
		// fall due in half a minute. The messages sweep (of either instance) finds the reminders'
		// rows at their old times, plans them anew and puts a job on the queue for each new time;
		// a reminder whose time is now past is cancelled, one still ahead moves with its session.
		const dueA = await moveSoWanted(a.id, 168, 30_000);
		const dueB = await moveSoWanted(b.id, 48, 30_000);
		const wanted = [
			{ booking: a.id, key: 'reminder:168', dueAt: dueA, other: 'reminder:48', otherCancelled: false },
			{ booking: b.id, key: 'reminder:48', dueAt: dueB, other: 'reminder:168', otherCancelled: true }
		];
		const messages: (typeof t.scheduledMessage.$inferSelect)[] = [];
		for (const w of wanted) {
			const row = await waitFor(async () => {
				const r = (await rowsOf(w.booking)).find((m) => m.key === w.key);
				return r && r.dueAt.getTime() === w.dueAt.getTime() ? r : undefined;
			}, `${w.key} moved`);
			await waitFor(async () => {
				const j = (await jobsOf(row.id)).filter((x) => new Date(x.start_after).getTime() === w.dueAt.getTime());
				return j.length === 1 && j[0]!.singleton_key === `${row.id}:${w.dueAt.toISOString()}`;
			}, `the job of ${w.key} at its new time`);
			messages.push(row);
		}
		// The second instance restarts while the jobs wait: they are rows in the database, not timers in a process.
		expect(await stopInstance(second)).toBe(0);
		second = await startInstance(port);

		for (const w of wanted) {
			const rows = await waitFor(async () => {
				const r = await rowsOf(w.booking);
				return r.find((m) => m.key === w.key)?.sentAt ? r : undefined;
			}, `${w.key} sent`);
			const other = rows.find((m) => m.key === w.other)!;
			// The 48-hour reminder of the session moved 7 days ahead moved with it; the 7-day one of the
			// session moved 2 days ahead is past and cancelled.
			expect([other.sentAt, other.cancelledAt !== null]).toEqual([null, w.otherCancelled]);
		}
		const mine = async () =>
			(await caught()).filter(
				(x) => x.subject.startsWith('Coming up:') && [a.id, b.id].some((id) => x.text.includes(`/bookings/${id}`))
			);
		const mails = await waitFor(async () => {
			const m = await mine();
			return m.length >= 2 ? m : undefined;
		}, 'both reminders in the mail catcher');
		// Each once: one outbox row per reminder, one e-mail each, every job of theirs at the new time done.
		const outbox = await db
			.select()
			.from(t.emailOutbox)
			.where(
				and(
					eq(t.emailOutbox.studioId, await studioIdOf(db)),
					sql`(${t.emailOutbox.dedupeKey} like ${`reminder:${a.id}:%`} or ${t.emailOutbox.dedupeKey} like ${`reminder:${b.id}:%`})`
				)
			);
		expect(outbox.map((o) => o.dedupeKey).sort()).toEqual(
			[`reminder:${a.id}:reminder:168`, `reminder:${b.id}:reminder:48`].sort()
		);
		const atNewTime = async () =>
			(
				await Promise.all(
					messages.map(async (r) => (await jobsOf(r.id)).filter((j) => new Date(j.start_after).getTime() === r.dueAt.getTime()))
				)
			).flat();
		await waitFor(async () => (await atNewTime()).every((j) => j.state === 'completed'), 'the jobs completed');
		expect(await atNewTime()).toHaveLength(2);
		// Later sweeps of both instances have come and gone: still one e-mail each.
		const later = Date.now();
		await waitFor(async () => {
			const [row] = await db.execute(
				sql`select count(*)::int as n from pgboss.job where name = 'sweep-messages' and state = 'completed' and started_on > to_timestamp(${later / 1000})`
			);
			return Number((row as { n: number }).n) >= 2;
		}, 'two later message sweeps');
		expect(await mine()).toHaveLength(2);
		expect(mails).toHaveLength(2);

		const seven = mails.find((m) => m.text.includes(`/bookings/${a.id}`))!;
		const two = mails.find((m) => m.text.includes(`/bookings/${b.id}`))!;
		expect(seven.text).toContain('is in 7 days.');
		expect(two.text).toContain('is in 48 hours.');
		const text = seven.text;
		expect(seven.to[0]!.address).toBe(DEMO.artist);
		expect(seven.subject).toMatch(/^Coming up: Vocal booth on \w+, \d{1,2} \w+ \d{4}, \d\d:\d\d–\d\d:\d\d$/);
		expect(text).toMatch(/When: {6}\w+, \d{1,2} \w+ \d{4}, \d\d:\d\d–\d\d:\d\d \(Europe\/Helsinki time\)/);
		expect(text).toContain('Room:      Vocal booth');
		expect(text).toContain('take the gravel lane past the red mailbox');
		expect(text).toContain('Level access through the double barn doors');
		expect(text).toContain('tune again with the capo on');
		expect(text).toContain('80 and 85 dB(A)');
		expect(text).toContain('guide-vocal.wav');
		expect(two.text).toContain('Nothing yet.');
		expect(text).toContain(`${APP_URL}/bookings/${a.id}`);
		expect(seven.html).toContain('<h3>Getting here</h3>');
		expect(seven.html).toContain('guide-vocal.wav');

		// The booking's JSON says when it went, and when the other is due.
		const body = (await (await artist.fetch(`/api/bookings/${a.id}`)).json()) as {
			messages: { kind: string; sentAt: string | null; cancelledAt: string | null }[];
		};
		const planned = body.messages.filter((m) => m.kind !== 'receipt');
		expect(planned.map((m) => [m.kind, m.sentAt !== null, m.cancelledAt !== null]).sort()).toEqual([
			['reminder', false, false],
			['reminder', true, false]
		]);
	});
});

describe('the balance request', () => {
	it('goes out after the session is closed with a balance owed: the amount and a link to pay it', async () => {
		const artist = await signedIn(DEMO.artist);
		const owner = await signedIn(DEMO.owner);
		const b = await book(artist);
		await waitFor(async () => (await rowsOf(b.id)).length === 2, 'the reminders planned');
		const held = await moveIntoPast(db, b.id);
		expect((await owner.json(`/api/bookings/${b.id}/close`, { actualEnd: held.end })).status).toBe(200);
		const [final] = await db
			.select()
			.from(t.invoice)
			.where(eq(t.invoice.sourceKey, `final:${b.id}`));
		expect(final!.amountDue).toBeGreaterThan(0);
		const rows = await waitFor(async () => {
			const r = await rowsOf(b.id);
			return r.find((m) => m.kind === 'balance_request' && m.sentAt) ? r : undefined;
		}, 'the balance request sent');
		// The reminders of a session now over are cancelled, never sent.
		expect(rows.filter((r) => r.kind === 'reminder').map((r) => [r.sentAt, r.cancelledAt !== null])).toEqual([
			[null, true],
			[null, true]
		]);
		const request = rows.find((r) => r.kind === 'balance_request')!;
		const [row] = await db.select().from(t.booking).where(eq(t.booking.id, b.id));
		expect(request.dueAt.getTime()).toBe(row!.actualEndsAt!.getTime());
		const mail = await waitFor(
			async () => (await caught()).find((m) => m.subject.startsWith('Balance for your session') && m.text.includes(b.id)),
			'the balance request in the mail catcher'
		);
		const euros = `€${(final!.amountDue / 100).toFixed(2)}`; // display only; amounts are integers
		expect(mail.subject).toContain(euros);
		expect(mail.text).toContain(`Balance to pay: ${euros}`);
		expect(mail.text).toContain(`${APP_URL}/bookings/${b.id}`);
		expect(mail.to[0]!.address).toBe(DEMO.artist);
		const outbox = await db
			.select()
			.from(t.emailOutbox)
			.where(eq(t.emailOutbox.dedupeKey, `balance_request:${b.id}:balance_request`));
		expect(outbox).toHaveLength(1);
		// The page the link leads to offers the balance to pay.
		const page = await (await artist.fetch(`/bookings/${b.id}`)).text();
		expect(page).toContain('Balance request');
	});
});

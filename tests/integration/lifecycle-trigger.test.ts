// The database keeps a booking's life to the rules of src/lib/domain/lifecycle.ts, whoever writes
// to it: the trigger booking_status_guard (drizzle/0011_session_lifecycle.sql) refuses every
// status move BOOKING_MOVES does not list, a completion without an end after the start, a no-show
// before the start, and a new time or room once a booking is no longer open; the exclusion
// constraints keep a no-show's time taken. Rows are written straight into the database, in a
// studio of this file's own (so no other spec's sessions are near), and removed afterwards.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { testDb } from '../support/db';
import { makeStudio, userIdOf, type TestStudio } from '../support/team';
import { DEMO } from '../support/env';
import * as t from '../../src/lib/server/db/schema';
import { BOOKING_STATUSES, canMove, type BookingStatus } from '../../src/lib/domain/lifecycle';

const { db, client } = testDb();

let studio: TestStudio;
let artistId: string;
beforeAll(async () => {
	studio = await makeStudio(db, 'Lifecycle trigger studio');
	artistId = await userIdOf(db, DEMO.artist);
});
afterAll(async () => {
	await db.delete(t.booking).where(eq(t.booking.studioId, studio.id));
	await client.end();
});

const HOUR = 3_600_000;
/** Each row its own hour, far from now, so no two of them ever overlap. */
let slot = 0;
function nextSlot(past: boolean): { startsAt: Date; endsAt: Date } {
	slot += 2;
	const base = Date.now() + (past ? -300 : 300) * 24 * HOUR;
	const startsAt = new Date(Math.floor(base / HOUR) * HOUR + slot * HOUR);
	return { startsAt, endsAt: new Date(startsAt.getTime() + HOUR) };
}

/** A booking written straight in the given status (an insert is not a move: the trigger guards updates). */
async function rowIn(status: BookingStatus, when: { startsAt: Date; endsAt: Date } = nextSlot(true)): Promise<string> {
	const [row] = await db
		.insert(t.booking)
		.values({
			studioId: studio.id,
			reference: `LT-${crypto.randomUUID().slice(0, 8)}`,
			roomId: studio.room,
			artistId,
			startsAt: when.startsAt,
			endsAt: when.endsAt,
			busyUntil: when.endsAt,
			status,
			quote: {},
			currency: 'EUR',
			total: 10_000,
			deposit: 3000,
			actualEndsAt: status === 'completed' ? when.endsAt : null
		})
		.returning({ id: t.booking.id });
	return row!.id;
}

/** PostgreSQL's refusal, as postgres.js reports it. */
interface PgError {
	code: string;
	constraint_name?: string;
	message: string;
}

/** Runs an UPDATE; undefined when it went through, the error when PostgreSQL refused it. */
async function attempt(run: () => Promise<unknown>): Promise<PgError | undefined> {
	try {
		await run();
		return undefined;
	} catch (e) {
		// postgres.js raises PostgreSQL's error itself; Drizzle wraps it as the cause of its own.
		for (let cur: unknown = e, i = 0; cur && i < 5; i++) {
			const err = cur as Partial<PgError> & { cause?: unknown };
			if (typeof err.code === 'string' && /^[0-9A-Z]{5}$/.test(err.code)) return err as PgError;
			cur = err.cause;
		}
		throw e;
	}
}

/** The status move in plain SQL; a move to completed carries an end after the start, as closing does. */
const moveTo = (id: string, to: BookingStatus) =>
	to === 'completed'
		? client`update booking set status = ${to}, actual_ends_at = ends_at where id = ${id}`
		: client`update booking set status = ${to} where id = ${id}`;

async function statusOf(id: string): Promise<string> {
	const [row] = await client<{ status: string }[]>`select status from booking where id = ${id}`;
	return row!.status;
}

function expectGuardRefusal(err: PgError | undefined, message: string) {
	expect(err, 'the update should have been refused').toBeDefined();
	expect(err!.code).toBe('23514');
	expect(err!.constraint_name).toBe('booking_status_move');
	expect(err!.message).toBe(message);
}

describe('every move between two statuses', () => {
	const pairs = BOOKING_STATUSES.flatMap((from) => BOOKING_STATUSES.filter((to) => to !== from).map((to) => [from, to] as const));

	it('covers all 42 ordered pairs of the seven statuses', () => {
		expect(BOOKING_STATUSES).toHaveLength(7);
		expect(pairs).toHaveLength(42);
	});

	it.each(pairs)('%s → %s is accepted exactly when the lifecycle allows it', async (from, to) => {
		// Past sessions, so that a move to no_show meets only the rule of the moves.
		const id = await rowIn(from);
		const err = await attempt(() => moveTo(id, to));
		if (canMove(from, to)) {
			expect(err, err?.message).toBeUndefined();
			expect(await statusOf(id)).toBe(to);
		} else {
			expectGuardRefusal(err, `a booking cannot go from ${from} to ${to}`);
			expect(await statusOf(id)).toBe(from);
		}
	});

	it.each(BOOKING_STATUSES)('a write that keeps the status %s is not a move, and goes through', async (status) => {
		const id = await rowIn(status);
		expect(await attempt(() => client`update booking set notes = 'still here' where id = ${id}`)).toBeUndefined();
		expect(await attempt(() => client`update booking set status = ${status} where id = ${id}`)).toBeUndefined();
	});
});

describe('the conditions on a move', () => {
	it('completes a session only with an end after its start', async () => {
		const id = await rowIn('confirmed');
		const message = 'a session is completed only with an end after its start';
		expectGuardRefusal(
			await attempt(
				() => client`update booking set status = 'completed', actual_ends_at = starts_at - interval '1 minute' where id = ${id}`
			),
			message
		);
		expectGuardRefusal(
			await attempt(() => client`update booking set status = 'completed', actual_ends_at = starts_at where id = ${id}`),
			message
		);
		expectGuardRefusal(await attempt(() => client`update booking set status = 'completed' where id = ${id}`), message);
		expect(await statusOf(id)).toBe('confirmed');
		expect(
			await attempt(
				() => client`update booking set status = 'completed', actual_ends_at = starts_at + interval '1 minute' where id = ${id}`
			)
		).toBeUndefined();
		expect(await statusOf(id)).toBe('completed');
	});

	it('refuses a no-show before the start, and takes it once the start has passed', async () => {
		const ahead = await rowIn('confirmed', nextSlot(false));
		expectGuardRefusal(await attempt(() => moveTo(ahead, 'no_show')), 'a session is a no-show only once its start has passed');
		expect(await statusOf(ahead)).toBe('confirmed');
		const past = await rowIn('confirmed');
		expect(await attempt(() => moveTo(past, 'no_show'))).toBeUndefined();
	});

	it.each(['completed', 'no_show', 'cancelled', 'expired'] as const)(
		'keeps the time and room of a %s booking',
		async (status) => {
			const id = await rowIn(status);
			const message = `a ${status} booking keeps its time and room`;
			expectGuardRefusal(
				await attempt(
					() =>
						client`update booking set starts_at = starts_at + interval '30 minutes', ends_at = ends_at + interval '30 minutes', busy_until = busy_until + interval '30 minutes' where id = ${id}`
				),
				message
			);
			expectGuardRefusal(
				await attempt(
					() =>
						client`update booking set ends_at = ends_at + interval '30 minutes', busy_until = busy_until + interval '30 minutes' where id = ${id}`
				),
				message
			);
			const [other] = await db
				.insert(t.room)
				.values({
					studioId: studio.id,
					slug: `lt-room-${crypto.randomUUID().slice(0, 6)}`,
					name: 'Second room',
					hourly: 1000,
					halfDay: 3000,
					fullDay: 5000
				})
				.returning({ id: t.room.id });
			expectGuardRefusal(await attempt(() => client`update booking set room_id = ${other!.id} where id = ${id}`), message);
		}
	);

	it.each(['held', 'pending', 'confirmed'] as const)('lets an open (%s) booking change its time', async (status) => {
		const id = await rowIn(status, nextSlot(false));
		expect(
			await attempt(
				() =>
					client`update booking set starts_at = starts_at + interval '15 minutes', ends_at = ends_at + interval '15 minutes', busy_until = busy_until + interval '15 minutes' where id = ${id}`
			)
		).toBeUndefined();
	});
});

describe('a no-show keeps its slot', () => {
	it('refuses a new booking over a no-show’s time, as over a session that took place', async () => {
		const when = nextSlot(true);
		const id = await rowIn('confirmed', when);
		expect(await attempt(() => moveTo(id, 'no_show'))).toBeUndefined();
		const half = { startsAt: new Date(when.startsAt.getTime() + HOUR / 2), endsAt: new Date(when.endsAt.getTime() + HOUR / 2) };
		for (const status of ['held', 'confirmed'] as const) {
			const err = await attempt(() => rowIn(status, half));
			expect(err?.code, err?.message).toBe('23P01');
			expect(err?.constraint_name).toBe('booking_room_no_overlap');
		}
		// What frees a time (a cancellation) is not what a no-show is: a cancelled booking over it is only history.
		expect(await attempt(() => rowIn('cancelled', half))).toBeUndefined();
	});
});

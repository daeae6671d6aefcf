// The database itself refuses double bookings: exclusion constraints on room, engineer and gear.
// Source: PostgreSQL manual, "Range Types" §8.17.10 (exclusion constraints) and "Constraints"
// §5.4.6; violations raise SQLSTATE 23P01 (PostgreSQL manual, Appendix A, "Error Codes").
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, inArray, sql } from 'drizzle-orm';
import { studioIdOf, testDb } from '../support/db';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
let studioId: string, roomA: string, roomB: string, artist: string, engineer: string, gear: string;
const made: string[] = [];

// A far-future day no other test books, so this file owns it.
const at = (hhmm: string) => new Date(`2031-02-03T${hhmm}:00+02:00`);

async function insertBooking(p: { room: string; start: string; end: string; engineer?: string; status?: t.BookingStatus }) {
	const id = crypto.randomUUID();
	await db.insert(t.booking).values({
		id,
		studioId,
		reference: `T-${id.slice(0, 8)}`,
		roomId: p.room,
		artistId: artist,
		engineerId: p.engineer ?? null,
		startsAt: at(p.start),
		endsAt: at(p.end),
		busyUntil: at(p.end),
		status: p.status ?? 'confirmed',
		quote: {},
		currency: 'EUR',
		total: 0,
		deposit: 0
	});
	made.push(id);
	return id;
}

async function sqlState(p: Promise<unknown>): Promise<string | undefined> {
	try {
		await p;
		return undefined;
	} catch (e) {
		const err = e as { code?: string; cause?: { code?: string } };
		return err.code ?? err.cause?.code;
	}
}

beforeAll(async () => {
	studioId = await studioIdOf(db);
	const rooms = await db
		.select()
		.from(t.room)
		.where(inArray(t.room.slug, ['live-room', 'vocal-booth']));
	roomA = rooms.find((r) => r.slug === 'live-room')!.id;
	roomB = rooms.find((r) => r.slug === 'vocal-booth')!.id;
	artist = (await db.select().from(t.user).where(eq(t.user.email, 'artist@slateroom.test')))[0]!.id;
	engineer = (await db.select().from(t.user).where(eq(t.user.email, 'engineer@slateroom.test')))[0]!.id;
	gear = (await db.select().from(t.gearItem).limit(1))[0]!.id;
});

afterAll(async () => {
	if (made.length) await db.delete(t.booking).where(inArray(t.booking.id, made));
	await client.end();
});

describe('migrations', () => {
	it('created the btree_gist extension and three exclusion constraints', async () => {
		const ext = await db.execute(sql`select extname from pg_extension where extname = 'btree_gist'`);
		expect(ext.length).toBe(1);
		const rows = await db.execute<{ conname: string }>(
			sql`select conname from pg_constraint where contype = 'x' order by conname`
		);
		expect(rows.map((r) => r.conname)).toEqual([
			'booking_engineer_no_overlap',
			'booking_gear_no_overlap',
			'booking_room_no_overlap'
		]);
	});
});

describe('room exclusion', () => {
	it('rejects an overlapping booking of the same room with 23P01 and accepts back-to-back ones', async () => {
		await insertBooking({ room: roomA, start: '10:00', end: '11:00' });
		// Half-open ranges: 11:00–12:00 touches 10:00–11:00 but does not overlap it.
		expect(await sqlState(insertBooking({ room: roomA, start: '11:00', end: '12:00' }))).toBeUndefined();
		expect(await sqlState(insertBooking({ room: roomA, start: '10:30', end: '11:30' }))).toBe('23P01');
		// Another room at the same time is fine.
		expect(await sqlState(insertBooking({ room: roomB, start: '10:30', end: '11:30' }))).toBeUndefined();
	});

	it('ignores cancelled and expired bookings', async () => {
		await insertBooking({ room: roomA, start: '14:00', end: '16:00', status: 'cancelled' });
		await insertBooking({ room: roomA, start: '14:00', end: '16:00', status: 'expired' });
		expect(await sqlState(insertBooking({ room: roomA, start: '14:00', end: '16:00' }))).toBeUndefined();
	});

	it('counts the turnaround: busy_until keeps the room after the booked end', async () => {
		const id = crypto.randomUUID();
		made.push(id);
		await db.insert(t.booking).values({
			id,
			studioId,
			reference: `T-${id.slice(0, 8)}`,
			roomId: roomB,
			artistId: artist,
			startsAt: at('17:00'),
			endsAt: at('18:00'),
			busyUntil: at('18:30'),
			status: 'held',
			quote: {},
			currency: 'EUR',
			total: 0,
			deposit: 0
		});
		expect(await sqlState(insertBooking({ room: roomB, start: '18:00', end: '19:00' }))).toBe('23P01');
		expect(await sqlState(insertBooking({ room: roomB, start: '18:30', end: '19:30' }))).toBeUndefined();
	});
});

describe('engineer exclusion', () => {
	it('keeps one engineer out of two rooms at once', async () => {
		await insertBooking({ room: roomA, start: '19:00', end: '21:00', engineer });
		expect(await sqlState(insertBooking({ room: roomB, start: '20:00', end: '22:00', engineer }))).toBe('23P01');
		expect(await sqlState(insertBooking({ room: roomB, start: '21:00', end: '22:00', engineer }))).toBeUndefined();
	});
});

describe('gear exclusion', () => {
	it('refuses one piece of gear in two overlapping bookings and frees it on cancellation', async () => {
		const first = await insertBooking({ room: roomA, start: '06:00', end: '08:00' });
		const second = await insertBooking({ room: roomB, start: '07:00', end: '09:00' });
		await db
			.insert(t.bookingGear)
			.values({ studioId, bookingId: first, gearItemId: gear, startsAt: new Date(0), busyUntil: new Date(0) });
		expect(
			await sqlState(
				db
					.insert(t.bookingGear)
					.values({ studioId, bookingId: second, gearItemId: gear, startsAt: new Date(0), busyUntil: new Date(0) })
			)
		).toBe('23P01');
		await db.update(t.booking).set({ status: 'cancelled' }).where(eq(t.booking.id, first));
		expect(
			await sqlState(
				db
					.insert(t.bookingGear)
					.values({ studioId, bookingId: second, gearItemId: gear, startsAt: new Date(0), busyUntil: new Date(0) })
			)
		).toBeUndefined();
	});
});

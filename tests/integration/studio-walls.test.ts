// Walls between studios, kept by PostgreSQL itself: a row of one studio can never point at a room,
// gear, booking, payment, refund or invoice of another, because every such reference is a foreign
// key over (studio_id, id) (PostgreSQL manual, "Constraints", foreign keys over several columns;
// a violation raises SQLSTATE 23503, Appendix A "Error Codes"). A booking's engineer must be in its
// studio's team, and each studio numbers its documents in its own gapless series (Directive
// 2006/112/EC, Article 226(2)).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, inArray, sql } from 'drizzle-orm';
import { studioIdOf, testDb } from '../support/db';
import { DATABASE_URL, DEMO } from '../support/env';
import { signedIn } from '../support/http';
import { settingsOf } from '../support/team';
import { createDb } from '../../src/lib/server/db/client';
import * as t from '../../src/lib/server/db/schema';
import { issueDocument } from '../../src/lib/server/invoices/issue';
import { documentTotals, lumpSumLines } from '../../src/lib/domain/invoice';

const { db, client } = testDb();

// A far-future day no other test books, so the bookings made here clash with nothing.
const at = (hhmm: string) => new Date(`2032-05-04T${hhmm}:00+03:00`);

interface Studio {
	id: string;
	room: string;
	gear: string;
	booking: string;
	payment: string;
}
let a: Studio;
let b: Studio;
let artist: string;
/** An engineer in the teams of both studios. */
let sharedEngineer: string;
/** A person in no studio's team. */
let outsider: string;
const madeUsers: string[] = [];
const madeBookings: string[] = [];
const madePayments: string[] = [];

async function sqlError(p: Promise<unknown>): Promise<{ code?: string; constraint?: string } | undefined> {
	try {
		await p;
		return undefined;
	} catch (e) {
		const err = e as { code?: string; constraint_name?: string; cause?: { code?: string; constraint_name?: string } };
		const inner = err.cause ?? err;
		return { code: inner.code, constraint: inner.constraint_name };
	}
}

async function person(name: string): Promise<string> {
	const id = crypto.randomUUID();
	await db.insert(t.user).values({ id, name, email: `${id}@walls.slateroom.test` });
	madeUsers.push(id);
	return id;
}

function bookingValues(studioId: string, roomId: string, start: string, end: string, engineerId: string | null = null) {
	const id = crypto.randomUUID();
	return {
		id,
		studioId,
		reference: `W-${id.slice(0, 8)}`,
		roomId,
		artistId: artist,
		engineerId,
		startsAt: at(start),
		endsAt: at(end),
		busyUntil: at(end),
		status: 'confirmed' as const,
		quote: {},
		currency: 'EUR',
		total: 1000,
		deposit: 0
	};
}

async function book(studioId: string, roomId: string, start: string, end: string, engineerId: string | null = null) {
	const values = bookingValues(studioId, roomId, start, end, engineerId);
	await db.insert(t.booking).values(values);
	madeBookings.push(values.id);
	return values.id;
}

/** A second studio beside the demo one: a copy of its settings, one room, one piece of gear. */
async function secondStudio(): Promise<string> {
	const id = crypto.randomUUID();
	await db.insert(t.organization).values({ id, name: 'Walls Test Studio', slug: `walls-${id.slice(0, 8)}` });
	const [demo] = await db
		.select()
		.from(t.studio)
		.where(eq(t.studio.id, await studioIdOf(db)));
	// Not published: nobody outside its team would see it. No payment account: nothing here is paid.
	await db.insert(t.studio).values({ ...settingsOf(demo!), id, name: 'Walls Test Studio', published: false });
	return id;
}

/** `open`: whether its room is in use (the demo studio's stays out of its pages). */
async function furnish(studioId: string, engineer: string, open = false): Promise<Studio> {
	const [room] = await db
		.insert(t.room)
		.values({
			studioId,
			slug: `walls-room-${crypto.randomUUID().slice(0, 8)}`,
			name: 'Walls room',
			hourly: 1000,
			halfDay: 3000,
			fullDay: 5000,
			active: open
		})
		.returning();
	const [gear] = await db
		.insert(t.gearItem)
		.values({ studioId, name: 'Walls microphone', category: 'microphone', homeRoomId: room!.id, active: false })
		.returning();
	await db
		.insert(t.member)
		.values({ id: crypto.randomUUID(), organizationId: studioId, userId: engineer, role: 'engineer' })
		.onConflictDoNothing();
	const booking = await book(studioId, room!.id, '08:00', '09:00');
	const [payment] = await db
		.insert(t.payment)
		.values({ studioId, bookingId: booking, kind: 'deposit', amount: 100, currency: 'EUR', status: 'paid' })
		.returning();
	madePayments.push(payment!.id);
	return { id: studioId, room: room!.id, gear: gear!.id, booking, payment: payment!.id };
}

beforeAll(async () => {
	artist = await person('Walls artist');
	sharedEngineer = await person('Walls engineer');
	outsider = await person('Walls outsider');
	a = await furnish(await studioIdOf(db), sharedEngineer);
	// The second studio's room is in use, so its session would show in a day plan that let it.
	b = await furnish(await secondStudio(), sharedEngineer, true);
});

afterAll(async () => {
	try {
		if (madePayments.length) await db.delete(t.payment).where(inArray(t.payment.id, madePayments));
		if (madeBookings.length) await db.delete(t.booking).where(inArray(t.booking.id, madeBookings));
		await db.delete(t.gearItem).where(inArray(t.gearItem.id, [a.gear, b.gear]));
		await db.delete(t.room).where(inArray(t.room.id, [a.room, b.room]));
		await db.delete(t.member).where(inArray(t.member.userId, madeUsers));
		await db.delete(t.user).where(inArray(t.user.id, madeUsers));
	} finally {
		await client.end();
	}
});

const FK = '23503';

describe('references between studios are refused by the database', () => {
	it('a booking in one studio cannot take a room of another', async () => {
		expect(await sqlError(db.insert(t.booking).values(bookingValues(a.id, b.room, '10:00', '11:00')))).toMatchObject({
			code: FK,
			constraint: 'booking_room_fk'
		});
		// The same booking in its own studio's room goes in.
		expect(await sqlError(book(a.id, a.room, '10:00', '11:00'))).toBeUndefined();
	});

	it("a booking cannot carry another studio's gear", async () => {
		const err = await sqlError(
			db
				.insert(t.bookingGear)
				.values({ studioId: a.id, bookingId: a.booking, gearItemId: b.gear, startsAt: new Date(0), busyUntil: new Date(0) })
		);
		expect(err).toMatchObject({ code: FK, constraint: 'booking_gear_item_fk' });
		// Nor can a gear row claim another studio for a booking it does not own.
		const claimed = await sqlError(
			db
				.insert(t.bookingGear)
				.values({ studioId: b.id, bookingId: a.booking, gearItemId: b.gear, startsAt: new Date(0), busyUntil: new Date(0) })
		);
		expect(claimed).toMatchObject({ code: FK, constraint: 'booking_gear_booking_fk' });
	});

	it("a piece of gear cannot live in another studio's room", async () => {
		const err = await sqlError(
			db.insert(t.gearItem).values({ studioId: a.id, name: 'Stray', category: 'microphone', homeRoomId: b.room })
		);
		expect(err).toMatchObject({ code: FK, constraint: 'gear_item_home_room_fk' });
	});

	it("payments, refunds, recall sheets and uploads stay with their studio's bookings", async () => {
		const payment = await sqlError(
			db
				.insert(t.payment)
				.values({ studioId: a.id, bookingId: b.booking, kind: 'deposit', amount: 100, currency: 'EUR', attempt: 2 })
		);
		expect(payment).toMatchObject({ code: FK, constraint: 'payment_booking_fk' });
		const refundOfOther = await sqlError(
			db.insert(t.refund).values({ studioId: a.id, bookingId: a.booking, paymentId: b.payment, amount: 10, currency: 'EUR' })
		);
		expect(refundOfOther).toMatchObject({ code: FK, constraint: 'refund_payment_fk' });
		const recall = await sqlError(db.insert(t.recallSheet).values({ studioId: a.id, bookingId: b.booking, artistId: artist }));
		expect(recall).toMatchObject({ code: FK, constraint: 'recall_sheet_booking_fk' });
		const upload = await sqlError(
			db.insert(t.upload).values({
				studioId: a.id,
				bookingId: b.booking,
				uploaderId: artist,
				originalName: 'x.wav',
				storageKey: `walls/${crypto.randomUUID()}`,
				contentType: 'audio/wav',
				sizeBytes: 1,
				sha256: '0'.repeat(64)
			})
		);
		expect(upload).toMatchObject({ code: FK, constraint: 'upload_booking_fk' });
	});

	it("an invoice cannot name another studio's booking or payment", async () => {
		const base = {
			studioId: a.id,
			series: 'WAL',
			year: 2099,
			number: 1,
			displayNumber: `WAL-${crypto.randomUUID().slice(0, 8)}`,
			typeCode: 386,
			issuedAt: new Date(),
			supplier: {},
			customer: {},
			currency: 'EUR',
			net: 100,
			vatTotal: 0,
			gross: 100,
			amountDue: 0,
			vatBreakdown: []
		};
		expect(await sqlError(db.insert(t.invoice).values({ ...base, bookingId: b.booking }))).toMatchObject({
			code: FK,
			constraint: 'invoice_booking_fk'
		});
		expect(await sqlError(db.insert(t.invoice).values({ ...base, paymentId: b.payment }))).toMatchObject({
			code: FK,
			constraint: 'invoice_payment_fk'
		});
	});
});

describe("a booking's engineer is in its studio's team", () => {
	it('refuses an engineer from outside the team, and takes one from inside', async () => {
		const err = await sqlError(db.insert(t.booking).values(bookingValues(a.id, a.room, '12:00', '13:00', outsider)));
		expect(err).toMatchObject({ code: FK, constraint: 'booking_engineer_member' });
		expect(await sqlError(book(a.id, a.room, '12:00', '13:00', sharedEngineer))).toBeUndefined();
	});

	it("refuses moving a booking's engineer to someone outside the team", async () => {
		const id = await book(a.id, a.room, '14:00', '15:00', sharedEngineer);
		const err = await sqlError(db.update(t.booking).set({ engineerId: outsider }).where(eq(t.booking.id, id)));
		expect(err).toMatchObject({ code: FK, constraint: 'booking_engineer_member' });
	});

	it('keeps one engineer out of two rooms at once within a studio, not across studios', async () => {
		await book(a.id, a.room, '16:00', '18:00', sharedEngineer);
		// Another studio's session at the same time is that studio's business.
		expect(await sqlError(book(b.id, b.room, '16:00', '18:00', sharedEngineer))).toBeUndefined();
		// Two at once in the same studio: the exclusion constraint refuses (SQLSTATE 23P01).
		const [second] = await db
			.insert(t.room)
			.values({
				studioId: a.id,
				slug: `walls-second-${crypto.randomUUID().slice(0, 8)}`,
				name: 'Walls second room',
				hourly: 1,
				halfDay: 1,
				fullDay: 1,
				active: false
			})
			.returning();
		try {
			expect(
				await sqlError(db.insert(t.booking).values(bookingValues(a.id, second!.id, '17:00', '19:00', sharedEngineer)))
			).toMatchObject({
				code: '23P01'
			});
		} finally {
			await db.delete(t.room).where(eq(t.room.id, second!.id));
		}
	});
});

describe('names that are unique within a studio', () => {
	it('lets two studios each have a room of the same short name', async () => {
		const [aRoom] = await db.select({ slug: t.room.slug }).from(t.room).where(eq(t.room.id, a.room));
		const [copy] = await db
			.insert(t.room)
			.values({ studioId: b.id, slug: aRoom!.slug, name: 'Same name', hourly: 1, halfDay: 1, fullDay: 1, active: false })
			.returning();
		expect(copy!.slug).toBe(aRoom!.slug);
		await db.delete(t.room).where(eq(t.room.id, copy!.id));
		// Within one studio, the short name is taken.
		const err = await sqlError(
			db.insert(t.room).values({ studioId: a.id, slug: aRoom!.slug, name: 'Twin', hourly: 1, halfDay: 1, fullDay: 1 })
		);
		expect(err?.code).toBe('23505');
	});
});

describe('document numbers per studio (Article 226(2))', () => {
	it('numbers documents issued at once in two studios in two gapless series', async () => {
		const wide = createDb(DATABASE_URL, { max: 12 });
		try {
			// A series of its own (2–5 capitals), so earlier runs' counters never matter.
			const series = `W${Array.from(crypto.getRandomValues(new Uint8Array(4)), (x) => String.fromCharCode(65 + (x % 26))).join('')}`;
			// Issued in 2099, so these documents stay out of every month anyone looks at.
			const issuedAt = new Date('2099-02-15T12:00:00Z');
			const lines = lumpSumLines(1000, 'deposit', 'Numbering check (integration test)', [{ rateBp: 2550, weight: 1 }]);
			const totals = documentTotals(lines, { currency: 'EUR', amountsIncludeVat: true, prepaid: 1000 });
			const issue = (studioId: string) =>
				wide.db.transaction(async (tx) => {
					const { invoice } = await issueDocument(tx, {
						studioId,
						typeCode: 386,
						series,
						issuedAt,
						timeZone: 'Europe/Helsinki',
						supplyDate: '2099-02-15',
						supplier: { name: 'Walls check', addressLines: [] },
						customer: { name: 'Walls check', addressLines: [] },
						bookingId: null,
						totals
					});
					return invoice;
				});
			// Interleaved: a, b, a, b, … all at once.
			const issued = await Promise.all(Array.from({ length: 16 }, (_, i) => issue(i % 2 === 0 ? a.id : b.id)));
			for (const s of [a, b]) {
				const numbers = issued
					.filter((d) => d.studioId === s.id)
					.map((d) => d.number)
					.sort((x, y) => x - y);
				expect(numbers).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
			}
			// The same display number exists once in each studio.
			const [{ n } = { n: 0 }] = await db
				.select({ n: sql<number>`count(distinct ${t.invoice.studioId})::int` })
				.from(t.invoice)
				.where(eq(t.invoice.displayNumber, `${series}-2099-0001`));
			expect(n).toBe(2);
		} finally {
			await wide.client.end();
		}
	});
});

describe("a studio's staff see only their studio's day and month", () => {
	it("leaves the other studio's sessions out of the day plan", async () => {
		const [own] = await db.select({ reference: t.booking.reference }).from(t.booking).where(eq(t.booking.id, b.booking));
		const engineer = await signedIn(DEMO.engineer);
		const res = await engineer.fetch('/api/studios/hollow-pine/plan?date=2032-05-04');
		expect(res.status).toBe(200);
		const text = await res.text();
		expect(text).not.toContain(b.booking);
		expect(text).not.toContain(own!.reference);
	});

	it("keeps the other studio's recall notes out of the day plan, though the artist is the same", async () => {
		// The artist's earlier session at B has a recall sheet; their later session at A does not.
		const notes = `B's recall ${crypto.randomUUID().slice(0, 8)}`;
		await db.insert(t.recallSheet).values({ studioId: b.id, bookingId: b.booking, artistId: artist, notes });
		const [demoRoom] = await db
			.select({ id: t.room.id })
			.from(t.room)
			.where(and(eq(t.room.studioId, a.id), eq(t.room.active, true)))
			.limit(1);
		const later = await book(a.id, demoRoom!.id, '14:00', '15:00');
		const [own] = await db.select({ reference: t.booking.reference }).from(t.booking).where(eq(t.booking.id, later));
		try {
			const engineer = await signedIn(DEMO.engineer);
			const res = await engineer.fetch('/api/studios/hollow-pine/plan?date=2032-05-04');
			expect(res.status).toBe(200);
			const text = await res.text();
			expect(text).toContain(own!.reference);
			expect(text).not.toContain(notes);
		} finally {
			await db.delete(t.recallSheet).where(eq(t.recallSheet.bookingId, b.booking));
		}
	});

	it("leaves the other studio's documents out of the month", async () => {
		const series = `M${Array.from(crypto.getRandomValues(new Uint8Array(3)), (x) => String.fromCharCode(65 + (x % 26))).join('')}`;
		const issuedAt = new Date('2099-03-10T12:00:00Z');
		const lines = lumpSumLines(500, 'deposit', 'Month wall check (integration test)', [{ rateBp: 2550, weight: 1 }]);
		const totals = documentTotals(lines, { currency: 'EUR', amountsIncludeVat: true, prepaid: 500 });
		const issued: Record<string, string> = {};
		for (const s of [a, b]) {
			const { invoice } = await db.transaction((tx) =>
				issueDocument(tx, {
					studioId: s.id,
					typeCode: 386,
					series,
					issuedAt,
					timeZone: 'Europe/Helsinki',
					supplyDate: '2099-03-10',
					supplier: { name: 'Walls check', addressLines: [] },
					customer: { name: 'Walls check', addressLines: [] },
					bookingId: null,
					totals
				})
			);
			issued[s.id] = invoice.id;
		}
		const accountant = await signedIn(DEMO.accountant);
		const res = await accountant.fetch('/api/studios/hollow-pine/invoices?month=2099-03');
		expect(res.status).toBe(200);
		const report = (await res.json()) as { documents: { id: string; number: string }[] };
		const ids = report.documents.map((d) => d.id);
		expect(ids).toContain(issued[a.id]);
		expect(ids).not.toContain(issued[b.id]);
	});
});

// Seeds the second demo studio (src/lib/domain/demo-second.ts, an invented business in Sweden):
// its organization and team, settings, rooms, gear and a few sessions placed relative to today.
// Idempotent like the first studio's seed; scripts/seed.ts calls it after the first studio.
import { eq, sql } from 'drizzle-orm';
import type { Database } from '../src/lib/server/db/client';
import * as t from '../src/lib/server/db/schema';
import { policyColumns, seedAccount, seedSurcharges } from './seed-policy';
import { SECOND_BOOKING_IDS, SECOND_POLICY as P, SECOND_ROOMS, SECOND_STUDIO, SECOND_TEAM } from '../src/lib/domain/demo-second';
import { newReference } from '../src/lib/server/bookings/reference';
import { quoteBooking } from '../src/lib/domain/pricing';
import { addDays, localDateOf, localToInstant, isoWeekday } from '../src/lib/domain/time';
import { isPublicHoliday } from '../src/lib/domain/holidays';

type Person = { email: string; name: string };

/** Tallbacken's connected payment account (invented; made on the local Stripe fake by scripts/stripe-accounts.ts). */
export const SECOND_ACCOUNT_ID = 'acct_1TallbackenDemo0';

async function seedStudio(db: Database): Promise<string> {
	await db
		.insert(t.organization)
		.values({ id: crypto.randomUUID(), name: SECOND_STUDIO.name, slug: SECOND_STUDIO.slug })
		.onConflictDoNothing({ target: t.organization.slug });
	const [org] = await db.select().from(t.organization).where(eq(t.organization.slug, SECOND_STUDIO.slug));
	const studioId = org!.id;
	await db
		.insert(t.studio)
		.values({
			id: studioId,
			published: true,
			...policyColumns(P),
			name: SECOND_STUDIO.name,
			tagline: 'A pine loft for bands and voices, above a carpentry workshop near Falun.',
			description:
				'Two rooms under a pitched roof: the loft for a band playing together and the cabin for vocals and overdubs. Book by the hour, the half day or the full day, with an engineer if you like. Prices exclude VAT.',
			street: 'Tallbacksvägen 3',
			postalCode: '791 99',
			city: 'Falun (invented address)',
			referencePrefix: 'TL',
			email: 'hej@tallbacken.test',
			vatId: 'SE000000000001',
			locale: 'en-GB',
			// Closed on Swedish public holidays (date-holidays' data for SE).
			closedOnPublicHolidays: true,
			directions: 'The loft is above the carpentry workshop: use the outside stair at the back of the yard.',
			loadInNotes: 'Gear goes up the outside stair, twelve steps; carry heavy cases in pairs.',
			// Reminders a week before and the day before.
			reminderHours: [168, 24]
		})
		.onConflictDoNothing();
	await seedSurcharges(db, studioId, P);
	await seedAccount(db, studioId, SECOND_ACCOUNT_ID);
	return studioId;
}

async function seedRooms(db: Database, studioId: string): Promise<Record<string, string>> {
	for (const [i, r] of SECOND_ROOMS.entries()) {
		await db
			.insert(t.room)
			.values({
				studioId,
				slug: r.slug,
				name: r.name,
				description: r.description,
				capacity: r.capacity,
				sortOrder: i + 1,
				hourly: r.rates.hourly,
				halfDay: r.rates.halfDay,
				fullDay: r.rates.fullDay
			})
			.onConflictDoNothing({ target: [t.room.studioId, t.room.slug] });
	}
	const made = await db.select().from(t.room).where(eq(t.room.studioId, studioId));
	return Object.fromEntries(made.map((r) => [r.slug, r.id]));
}

async function seedGear(db: Database, studioId: string, roomIds: Record<string, string>) {
	const [{ n } = { n: 0 }] = await db
		.select({ n: sql<number>`count(*)::int` })
		.from(t.gearItem)
		.where(eq(t.gearItem.studioId, studioId));
	if (n > 0) return;
	const items: Omit<typeof t.gearItem.$inferInsert, 'studioId'>[] = [
		{
			name: 'Valve condenser, cardioid',
			category: 'microphone',
			description: 'Vocals and acoustic instruments.',
			homeRoomId: roomIds['cabin'],
			caution: 'Valve microphone with its own power supply: connect the cable before switching the supply on.',
			hireFee: 25_000,
			hireable: true
		},
		{
			name: 'Dynamic microphones, cardioid (set of six)',
			category: 'microphone',
			description: 'Drums and guitar cabinets.',
			homeRoomId: roomIds['loft']
		},
		{
			name: 'Four-channel transistor preamp',
			category: 'preamp',
			description: 'Clean gain for drums and room microphones.',
			homeRoomId: roomIds['loft']
		},
		{
			name: 'Stereo bus compressor',
			category: 'compressor',
			description: 'Glue on the mix while tracking a band live.',
			homeRoomId: roomIds['loft'],
			hireFee: 20_000,
			hireable: true
		},
		{
			name: 'Baby grand piano',
			category: 'instrument',
			description: 'Tuned before each booked session.',
			homeRoomId: roomIds['loft'],
			caution: 'About 300 kg: moved only by the studio, never by its lid or legs.'
		},
		{
			name: 'Nearfield monitors (pair)',
			category: 'monitoring',
			description: 'For overdubs and rough mixes in the cabin.',
			homeRoomId: roomIds['cabin']
		}
	];
	await db.insert(t.gearItem).values(items.map((g) => ({ ...g, studioId })));
}

/** A weekday the studio is open: weekends and Swedish public holidays are skipped, away from today. */
function openDay(days: number): string {
	const step = days < 0 ? -1 : 1;
	let ymd = addDays(localDateOf(new Date(), P.timeZone), days);
	while (isoWeekday(ymd) >= 6 || isPublicHoliday(P.country, ymd)) ymd = addDays(ymd, step);
	return ymd;
}

function at(ymd: string, hhmm: string): Date {
	const [h, m] = hhmm.split(':').map(Number) as [number, number];
	const resolved = localToInstant(ymd, h * 60 + m, P.timeZone);
	if (resolved.kind === 'gap') throw new Error(`demo time ${ymd} ${hhmm} does not exist in ${P.timeZone}`);
	return resolved.instant;
}

const sessions: {
	artist: string;
	room: string;
	day: number;
	from: string;
	to: string;
	engineer: boolean;
	project: string;
	status: t.BookingStatus;
}[] = [
	{
		artist: 'artist2@slateroom.test',
		room: 'loft',
		day: -12,
		from: '10:00',
		to: '18:00',
		engineer: true,
		project: 'Pale Orchard: live takes for "Birch Hour"',
		status: 'completed'
	},
	{
		artist: 'artist2@slateroom.test',
		room: 'cabin',
		day: -5,
		from: '12:00',
		to: '16:00',
		engineer: true,
		project: 'Pale Orchard: string overdubs',
		status: 'completed'
	},
	{
		artist: 'artist2@slateroom.test',
		room: 'loft',
		day: 2,
		from: '10:00',
		to: '14:00',
		engineer: true,
		project: 'Pale Orchard: piano and vocals',
		status: 'confirmed'
	},
	{
		artist: 'artist2@slateroom.test',
		room: 'cabin',
		day: 4,
		from: '13:00',
		to: '17:00',
		engineer: false,
		project: 'Pale Orchard: demo vocals',
		status: 'confirmed'
	},
	{
		artist: 'artist2@slateroom.test',
		room: 'loft',
		day: 8,
		from: '10:00',
		to: '18:00',
		engineer: true,
		project: 'Pale Orchard: full band day',
		status: 'confirmed'
	}
];

async function seedSessions(db: Database, studioId: string, roomIds: Record<string, string>, ids: Record<string, string>) {
	const [{ n } = { n: 0 }] = await db
		.select({ n: sql<number>`count(*)::int` })
		.from(t.booking)
		.where(eq(t.booking.studioId, studioId));
	if (n > 0) return;
	const engineerId = ids['engineer2@slateroom.test']!;
	const holidays = (ymd: string) => isPublicHoliday(P.country, ymd);
	for (const [i, d] of sessions.entries()) {
		const ymd = openDay(d.day);
		const start = at(ymd, d.from);
		const end = at(ymd, d.to);
		const room = SECOND_ROOMS.find((r) => r.slug === d.room)!;
		const quote = quoteBooking({ start, end, room, engineer: d.engineer, gear: [], policy: P, holidays });
		await db.insert(t.booking).values({
			id: SECOND_BOOKING_IDS[i],
			studioId,
			reference: newReference('TL'),
			roomId: roomIds[d.room]!,
			engineerId: d.engineer ? engineerId : null,
			artistId: ids[d.artist]!,
			startsAt: start,
			endsAt: end,
			busyUntil: new Date(end.getTime() + P.turnaroundMinutes * 60_000),
			status: d.status,
			project: d.project,
			quote,
			currency: quote.currency,
			total: quote.total,
			deposit: quote.deposit,
			actualEndsAt: d.status === 'completed' ? end : null
		});
	}
}

/**
 * The second studio, its team (made with `addPerson` when missing) and its sessions, whose artists
 * are among `people` (the first studio's seed made them).
 */
export async function seedSecondStudio(
	db: Database,
	people: Record<string, string>,
	addPerson: (id: string, p: Person) => Promise<void>
): Promise<void> {
	const studioId = await seedStudio(db);
	const roomIds = await seedRooms(db, studioId);
	await seedGear(db, studioId, roomIds);
	const ids = { ...people };
	for (const p of SECOND_TEAM) {
		const [existing] = await db.select().from(t.user).where(eq(t.user.email, p.email));
		const id = existing?.id ?? crypto.randomUUID();
		if (!existing) await addPerson(id, p);
		ids[p.email] = id;
		await db
			.insert(t.member)
			.values({ id: crypto.randomUUID(), organizationId: studioId, userId: id, role: p.role })
			.onConflictDoNothing({ target: [t.member.organizationId, t.member.userId] });
	}
	await seedSessions(db, studioId, roomIds, ids);
}

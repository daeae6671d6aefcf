// Seeds the demo studios (invented businesses): settings, rooms, gear, people and a few bookings
// of each; the second studio's are in scripts/seed-second.ts. Idempotent: running it again changes nothing that is already there.
// Only for demo and test databases (npm start and npm test call it; SEED_DEMO=0 skips it).
import { eq, sql } from 'drizzle-orm';
import { hashPassword } from 'better-auth/crypto';
import { createDb } from '../src/lib/server/db/client';
import * as t from '../src/lib/server/db/schema';
import { policyColumns, seedAccount, seedSurcharges } from './seed-policy';
import { seedDemoBookings } from './seed-bookings';
import { seedSecondStudio } from './seed-second';
import { DEMO_POLICY as P, DEMO_ROOMS } from '../src/lib/domain/demo';
import { SETUP_STEPS } from '../src/lib/domain/setup';

const url = process.env.DATABASE_URL;
if (!url) throw new Error('DATABASE_URL is not set');
const { db, client } = createDb(url, { max: 2 });

export const DEMO_PASSWORD = 'slateroom-demo';

/** Hollow Pine's connected payment account (invented; made on the local Stripe fake by scripts/stripe-accounts.ts). */
const DEMO_ACCOUNT_ID = 'acct_1HollowPineDemo';

const people = [
	{ email: 'owner@slateroom.test', name: 'Maija Kuusela', role: 'owner' },
	{ email: 'engineer@slateroom.test', name: 'Elias Harmaa', role: 'engineer' },
	{ email: 'accountant@slateroom.test', name: 'Riikka Laskunen', role: 'accountant' },
	{ email: 'artist@slateroom.test', name: 'Noa Virta (The Lantern Static)', role: 'artist' },
	{ email: 'artist2@slateroom.test', name: 'Iiris Sorsa (Pale Orchard)', role: 'artist' }
] as const;

/** The demo studio's organization (its name, short name and team), then its settings. */
async function seedStudio(): Promise<string> {
	await db
		.insert(t.organization)
		.values({ id: crypto.randomUUID(), name: 'Hollow Pine Studio', slug: 'hollow-pine' })
		.onConflictDoNothing({ target: t.organization.slug });
	const [org] = await db.select().from(t.organization).where(eq(t.organization.slug, 'hollow-pine'));
	const studioId = org!.id;
	await db
		.insert(t.studio)
		.values({
			id: studioId,
			published: true,
			...policyColumns(P),
			name: 'Hollow Pine Studio',
			tagline: 'A converted barn for tracking bands and voices, outside Tampere.',
			description:
				'Three rooms under one roof: a timber live room with a high ceiling, a dry vocal booth and a control room with a view of both. Book by the hour, the half day or the full day; an engineer is available for any booking.',
			street: 'Kuusikkotie 14',
			postalCode: '33980',
			city: 'Pirkkala (invented address)',
			referencePrefix: 'HP',
			setupDone: [...SETUP_STEPS],
			email: 'hello@hollowpine.test',
			vatId: 'FI00000000',
			locale: 'en-GB',
			closedOnPublicHolidays: false,
			// The platform keeps 2 % of each of this studio's charges (the second demo studio pays none).
			platformFeeBp: 200,
			directions:
				'From the main road, take the gravel lane past the red mailbox; the barn is the second building on the left. Park on the grass beside it.',
			loadInNotes:
				'Level access through the double barn doors, no steps; a trolley waits inside. Ask before carrying anything heavy alone.',
			// Artists move a session free with 7 days' notice, for a fee from 7 days to 48 hours, not closer.
			moveFreeHours: 168,
			moveMinHours: 48,
			moveFee: 2500
		})
		.onConflictDoNothing();

	await seedSurcharges(db, studioId, P);
	await seedAccount(db, studioId, DEMO_ACCOUNT_ID);
	return studioId;
}

const rooms = [
	{
		slug: 'live-room',
		name: 'Live room',
		description: 'Timber walls, a five-metre ceiling and room for a five-piece band tracking together.',
		capacity: 6,
		sortOrder: 1
	},
	{
		slug: 'vocal-booth',
		name: 'Vocal booth',
		description: 'A dry, quiet booth for vocals, voice-over and single instruments.',
		capacity: 2,
		sortOrder: 2
	},
	{
		slug: 'control-room',
		name: 'Control room',
		description: 'Mixing, overdubs and editing, with a window onto the live room.',
		capacity: 4,
		sortOrder: 3
	}
];

async function seedRooms(studioId: string) {
	for (const r of rooms) {
		const rates = DEMO_ROOMS.find((d) => d.slug === r.slug)!.rates;
		await db
			.insert(t.room)
			.values({ ...r, studioId, hourly: rates.hourly, halfDay: rates.halfDay, fullDay: rates.fullDay })
			.onConflictDoNothing({ target: [t.room.studioId, t.room.slug] });
	}
	const made = await db.select().from(t.room).where(eq(t.room.studioId, studioId));
	return Object.fromEntries(made.map((r) => [r.slug, r.id]));
}

const PHANTOM =
	'Needs 48 V phantom power (IEC 61938): switch phantom off and mute the channel before patching; keep it away from ribbon microphones.';

async function seedGear(studioId: string, roomIds: Record<string, string>) {
	const [{ count } = { count: 0 }] = await db
		.select({ count: sql<number>`count(*)::int` })
		.from(t.gearItem)
		.where(eq(t.gearItem.studioId, studioId));
	if (count > 0) return;
	const items: Omit<typeof t.gearItem.$inferInsert, 'studioId'>[] = [
		{
			name: 'Large-diaphragm condenser, multi-pattern',
			category: 'microphone',
			description: 'Vocals, acoustic guitar, room sound.',
			homeRoomId: roomIds['vocal-booth'],
			caution: PHANTOM,
			hireable: false
		},
		{
			name: 'Small-diaphragm condensers, cardioid (matched pair)',
			category: 'microphone',
			description: 'Overheads, acoustic guitar, strings.',
			homeRoomId: roomIds['live-room'],
			caution: PHANTOM
		},
		{
			name: 'Ribbon microphone, figure-of-eight',
			category: 'microphone',
			description: 'Guitar cabinets, brass, room.',
			homeRoomId: roomIds['live-room'],
			hireFee: 1500,
			hireable: true,
			caution: 'Ribbon element: never send phantom power to it and keep it out of strong air blasts (kick drum ports, plosives).'
		},
		{
			name: 'Dynamic microphone, cardioid (set of four)',
			category: 'microphone',
			description: 'Snare, toms, guitar cabinets.',
			homeRoomId: roomIds['live-room']
		},
		{
			name: 'Two-channel valve preamp',
			category: 'preamp',
			description: 'Colour for vocals and bass.',
			homeRoomId: roomIds['control-room'],
			hireFee: 2500,
			hireable: true,
			caution: 'Valve unit: let it cool before moving; never remove the mains safety earth.'
		},
		{
			name: 'Optical compressor, stereo',
			category: 'compressor',
			description: 'Gentle levelling on vocals and bass while tracking.',
			homeRoomId: roomIds['control-room'],
			hireFee: 2000,
			hireable: true
		},
		{
			name: 'Upright piano, acoustic',
			category: 'instrument',
			description: 'Tuned monthly.',
			homeRoomId: roomIds['live-room'],
			caution: 'About 230 kg: moved only by two or more people with a dolly, never lifted by the lid or keybed.'
		},
		{
			name: 'Headphone amplifier, six outputs',
			category: 'monitoring',
			description: 'Cue mixes for the live room.',
			homeRoomId: roomIds['live-room'],
			caution: 'Start cue mixes quiet and raise them slowly: long sessions near 85 dB(A) put hearing at risk.'
		}
	];
	await db.insert(t.gearItem).values(items.map((g) => ({ ...g, studioId })));
}

/** The demo people; the staff among them join the studio's team with their role. */
async function seedPeople(studioId: string) {
	const ids: Record<string, string> = {};
	for (const p of people) {
		const [existing] = await db.select().from(t.user).where(eq(t.user.email, p.email));
		const id = existing?.id ?? crypto.randomUUID();
		ids[p.email] = id;
		if (!existing) await insertPerson(id, p);
		if (p.role === 'artist') continue;
		await db
			.insert(t.member)
			.values({ id: crypto.randomUUID(), organizationId: studioId, userId: id, role: p.role })
			.onConflictDoNothing({ target: [t.member.organizationId, t.member.userId] });
	}
	return ids;
}

async function insertPerson(id: string, p: { email: string; name: string }) {
	await db.insert(t.user).values({ id, email: p.email, name: p.name, emailVerified: true });
	await db.insert(t.account).values({
		id: crypto.randomUUID(),
		accountId: id,
		providerId: 'credential',
		userId: id,
		password: await hashPassword(DEMO_PASSWORD),
		updatedAt: new Date()
	});
}

try {
	const studioId = await seedStudio();
	const roomIds = await seedRooms(studioId);
	await seedGear(studioId, roomIds);
	const userIds = await seedPeople(studioId);
	await seedDemoBookings(db, { studioId, roomIds, userIds });
	// The benchmark starts from one studio (scripts/bench.sh).
	if (process.env.SEED_SECOND_STUDIO !== '0') await seedSecondStudio(db, userIds, insertPerson);
	console.log('demo studios seeded');
} finally {
	await client.end();
}

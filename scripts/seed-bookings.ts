// Demo bookings for the seeded studio, placed relative to today so the demo always has a past
// and a future: two finished sessions with recall sheets, and upcoming confirmed sessions.
// Priced by the pricing engine, like every booking. Runs once: it does nothing when any booking exists.
import { eq, sql } from 'drizzle-orm';
import type { Database } from '../src/lib/server/db/client';
import * as t from '../src/lib/server/db/schema';
import { DEMO_BOOKING_IDS, DEMO_POLICY, DEMO_ROOMS } from '../src/lib/domain/demo';
import { newReference } from '../src/lib/server/bookings/reference';
import { quoteBooking } from '../src/lib/domain/pricing';
import { addDays, localDateOf, localToInstant } from '../src/lib/domain/time';
import { publicHolidayChecker } from '../src/lib/domain/holidays';

const TZ = DEMO_POLICY.timeZone;

/** The studio's calendar date `days` after today, counted in days and not in 24-hour steps (on the
 * evening before a clock change, today plus 72 hours is already the fourth day). */
function ymdAhead(days: number): string {
	return addDays(localDateOf(new Date(), TZ), days);
}

function at(ymd: string, hhmm: string): Date {
	const [h, m] = hhmm.split(':').map(Number) as [number, number];
	const resolved = localToInstant(ymd, h * 60 + m, TZ);
	if (resolved.kind === 'gap') throw new Error(`demo time ${ymd} ${hhmm} does not exist in ${TZ}`);
	return resolved.instant;
}

interface DemoBooking {
	artist: string;
	room: string;
	day: number;
	from: string;
	to: string;
	engineer: boolean;
	project: string;
	status: t.BookingStatus;
	recall?: t.RecallChannel[];
	recallNotes?: string;
}

const demo: DemoBooking[] = [
	{
		artist: 'artist@slateroom.test',
		room: 'live-room',
		day: -14,
		from: '10:00',
		to: '18:00',
		engineer: true,
		project: 'The Lantern Static: "Harbour Lights" (drums and bass)',
		status: 'completed',
		recall: [
			{
				source: 'Kick drum',
				microphone: 'Dynamic, cardioid',
				placement: 'Inside the port, 5 cm from the beater head',
				preampGainDb: 38,
				highPassHz: null,
				compressor: '4:1, attack 10 ms, release 100 ms, about 3 dB reduction',
				notes: 'Felt beater; the front head has a port.'
			},
			{
				source: 'Overheads (pair)',
				microphone: 'Small-diaphragm condensers, cardioid',
				pattern: 'Cardioid',
				placement: 'Spaced pair, 1 m above the cymbals, equal distance to the snare',
				preampGainDb: 42,
				phantom: true,
				highPassHz: 80
			},
			{
				source: 'Bass DI',
				microphone: 'Direct box',
				preampGainDb: 20,
				eq: 'Slight dip near 250 Hz',
				compressor: '3:1 while tracking, a few dB of reduction',
				routing: 'Valve preamp, then the optical compressor'
			}
		],
		recallNotes: 'Drums tuned low; the band liked the room sound with the curtains open.'
	},
	{
		artist: 'artist2@slateroom.test',
		room: 'vocal-booth',
		day: -7,
		from: '13:00',
		to: '17:00',
		engineer: true,
		project: 'Pale Orchard: lead vocals for "Copper Field"',
		status: 'completed',
		recall: [
			{
				source: 'Lead vocal',
				microphone: 'Large-diaphragm condenser, multi-pattern',
				pattern: 'Cardioid',
				placement: '20 cm, pop screen at 10 cm, capsule at mouth height',
				preampGainDb: 52,
				phantom: true,
				highPassHz: 75,
				compressor: '3:1, medium attack, 3–4 dB reduction on the loudest lines'
			}
		],
		recallNotes: 'Singer prefers the cue mix with a little reverb; capo on fret 2 for the acoustic guide.'
	},
	{
		artist: 'artist@slateroom.test',
		room: 'live-room',
		day: 3,
		from: '10:00',
		to: '14:00',
		engineer: true,
		project: 'The Lantern Static: guitars',
		status: 'confirmed'
	},
	{
		artist: 'artist2@slateroom.test',
		room: 'vocal-booth',
		day: 3,
		from: '15:00',
		to: '19:00',
		engineer: false,
		project: 'Pale Orchard: harmonies',
		status: 'confirmed'
	},
	{
		artist: 'artist@slateroom.test',
		room: 'control-room',
		day: 6,
		from: '12:00',
		to: '20:00',
		engineer: true,
		project: 'The Lantern Static: rough mixes',
		status: 'confirmed'
	},
	{
		artist: 'artist2@slateroom.test',
		room: 'live-room',
		day: 10,
		from: '09:00',
		to: '17:00',
		engineer: true,
		project: 'Pale Orchard: full band day',
		status: 'confirmed'
	}
];

export async function seedDemoBookings(
	db: Database,
	ids: { studioId: string; roomIds: Record<string, string>; userIds: Record<string, string> }
): Promise<void> {
	const [{ n } = { n: 0 }] = await db
		.select({ n: sql<number>`count(*)::int` })
		.from(t.booking)
		.where(eq(t.booking.studioId, ids.studioId));
	if (n > 0) return;
	const engineerId = ids.userIds['engineer@slateroom.test'];
	const holidays = publicHolidayChecker(DEMO_POLICY.country);
	for (const [i, d] of demo.entries()) {
		const ymd = ymdAhead(d.day);
		const start = at(ymd, d.from);
		const end = at(ymd, d.to);
		const room = DEMO_ROOMS.find((r) => r.slug === d.room)!;
		const quote = quoteBooking({ start, end, room, engineer: d.engineer, gear: [], policy: DEMO_POLICY, holidays });
		const [row] = await db
			.insert(t.booking)
			.values({
				id: DEMO_BOOKING_IDS[i],
				studioId: ids.studioId,
				reference: newReference('HP'),
				roomId: ids.roomIds[d.room]!,
				engineerId: d.engineer ? engineerId : null,
				artistId: ids.userIds[d.artist]!,
				startsAt: start,
				endsAt: end,
				busyUntil: new Date(end.getTime() + DEMO_POLICY.turnaroundMinutes * 60_000),
				status: d.status,
				project: d.project,
				quote,
				currency: quote.currency,
				total: quote.total,
				deposit: quote.deposit,
				actualEndsAt: d.status === 'completed' ? end : null
			})
			.returning();
		if (d.recall) {
			await db.insert(t.recallSheet).values({
				studioId: ids.studioId,
				bookingId: row!.id,
				artistId: ids.userIds[d.artist]!,
				authorId: engineerId,
				channels: d.recall,
				notes: d.recallNotes ?? ''
			});
		}
	}
}

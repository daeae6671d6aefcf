/**
 * The second demo studio's values: Tallbacken Ljudloft, an invented studio in a timber loft above
 * a carpentry workshop near Falun, Sweden. It shows that each studio keeps its own zone, currency,
 * VAT, rooms, rates, hours and ladder. Shared by the seed script and the tests; not a real
 * business. Amounts are integer öre (SEK, ISO 4217: 2 decimals); prices exclude VAT.
 */
import type { RoomRates, StudioPolicy } from './types';

/** The second studio's demo sessions' ids, in the order scripts/seed-second.ts seeds them. */
export const SECOND_BOOKING_IDS = [
	'de300000-0000-4000-8000-0000000000b1',
	'de300000-0000-4000-8000-0000000000b2',
	'de300000-0000-4000-8000-0000000000b3',
	'de300000-0000-4000-8000-0000000000b4',
	'de300000-0000-4000-8000-0000000000b5'
] as const;

export const SECOND_STUDIO = {
	slug: 'tallbacken',
	name: 'Tallbacken Ljudloft',
	location: 'a timber loft above a carpentry workshop near Falun, Sweden'
} as const;

/** Its team; every demo account shares the demo password. */
export const SECOND_TEAM = [
	{ email: 'owner2@slateroom.test', name: 'Karin Ekholt', role: 'owner' },
	{ email: 'engineer2@slateroom.test', name: 'Oskar Vinterlund', role: 'engineer' },
	{ email: 'accountant2@slateroom.test', name: 'Lena Sjöstrand', role: 'accountant' }
] as const;

const WEEKDAYS = [1, 2, 3, 4, 5];

export const SECOND_POLICY: StudioPolicy = Object.freeze({
	timeZone: 'Europe/Stockholm',
	currency: 'SEK',
	country: 'SE',
	vatRateBp: 2500, // 25 %, added to prices that exclude it
	pricesIncludeVat: false,
	blocks: { halfDayMinutes: 4 * 60, fullDayMinutes: 8 * 60 },
	minBookingMinutes: 60,
	incrementMinutes: 60,
	turnaroundMinutes: 15,
	minNoticeMinutes: 12 * 60,
	horizonDays: 120,
	holdMinutes: 30,
	// Weekdays 10:00 to 22:00, Saturday 11:00 to 18:00, closed on Sunday (and on public holidays,
	// a setting of the studio row).
	openingHours: [
		...WEEKDAYS.map((weekday) => ({ weekday, openMinute: 10 * 60, closeMinute: 22 * 60 })),
		{ weekday: 6, openMinute: 11 * 60, closeMinute: 18 * 60 }
	],
	surcharges: [
		{
			id: 'evening',
			label: 'Evening surcharge',
			kind: 'window',
			percentBp: 2000, // +20 % from 18:00 to 22:00, Monday to Friday
			weekdays: [...WEEKDAYS],
			fromMinute: 18 * 60,
			toMinute: 22 * 60
		}
	],
	depositBp: 2500, // 25 % of the gross, rounded up to whole kronor
	depositMinimum: 50_000, // at least 500.00 kr (or the whole total if smaller)
	cancellation: [
		{ minNoticeHours: 14 * 24, refundBp: 10_000 }, // 14 days or more: the whole deposit
		{ minNoticeHours: 72, refundBp: 5000 }, // 72 hours to 14 days: half
		{ minNoticeHours: 0, refundBp: 0 } // under 72 hours: nothing
	],
	overtimeIncrementMinutes: 30,
	engineerRates: { hourly: 45_000, halfDay: 160_000, fullDay: 300_000 }
} satisfies StudioPolicy);

export const SECOND_ROOMS: (RoomRates & { description: string; capacity: number })[] = [
	{
		slug: 'loft',
		name: 'The loft',
		description: 'Pine beams under a pitched roof; room for a band of five to play together.',
		capacity: 6,
		rates: { hourly: 60_000, halfDay: 210_000, fullDay: 400_000 }
	},
	{
		slug: 'cabin',
		name: 'The cabin',
		description: 'A small, dry room for vocals, strings and overdubs, with a window onto the yard.',
		capacity: 2,
		rates: { hourly: 40_000, halfDay: 140_000, fullDay: 260_000 }
	}
];

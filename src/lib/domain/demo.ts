/**
 * The demo studio's values: Hollow Pine Studio, an invented studio in a
 * converted barn outside Tampere, Finland. Shared by the seed script and the tests; not a real
 * business. Amounts are integer cents (EUR, ISO 4217: 2 decimals).
 */
import type { RoomRates, StudioPolicy } from './types';

export const DEMO_STUDIO = {
	name: 'Hollow Pine Studio',
	location: 'a converted barn outside Tampere, Finland'
} as const;

const EVERY_DAY = [1, 2, 3, 4, 5, 6, 7];

/** Freezes a value and everything in it, so shared demo constants cannot be changed by accident. */
function deepFreeze<T>(value: T): T {
	if (value && typeof value === 'object') {
		for (const inner of Object.values(value)) deepFreeze(inner);
		Object.freeze(value);
	}
	return value;
}

export const DEMO_POLICY: StudioPolicy = deepFreeze({
	timeZone: 'Europe/Helsinki',
	currency: 'EUR',
	country: 'FI',
	vatRateBp: 2550, // 25.5 %, prices include VAT
	pricesIncludeVat: true,
	blocks: { halfDayMinutes: 4 * 60, fullDayMinutes: 8 * 60 },
	minBookingMinutes: 2 * 60,
	incrementMinutes: 30,
	turnaroundMinutes: 30,
	minNoticeMinutes: 24 * 60,
	horizonDays: 180,
	holdMinutes: 30,
	// Open 09:00 to 23:00 every day.
	openingHours: EVERY_DAY.map((weekday) => ({ weekday, openMinute: 9 * 60, closeMinute: 23 * 60 })),
	surcharges: [
		{
			id: 'evening',
			label: 'Evening surcharge',
			kind: 'window',
			percentBp: 2500, // +25 % from 18:00 to 23:00, Monday to Friday
			weekdays: [1, 2, 3, 4, 5],
			fromMinute: 18 * 60,
			toMinute: 23 * 60
		},
		{
			id: 'weekend',
			label: 'Weekend surcharge',
			kind: 'window',
			percentBp: 2000, // +20 % all of Saturday and Sunday
			weekdays: [6, 7],
			fromMinute: 0,
			toMinute: 24 * 60
		},
		{
			id: 'holiday',
			label: 'Public holiday surcharge',
			kind: 'holiday',
			percentBp: 5000, // +50 % on Finnish public holidays
			weekdays: [],
			fromMinute: 0,
			toMinute: 24 * 60
		}
	],
	depositBp: 3000, // 30 % of the gross, rounded up to whole euros
	depositMinimum: 5000, // at least 50.00 (or the whole total if smaller)
	cancellation: [
		{ minNoticeHours: 7 * 24, refundBp: 10_000 }, // 7 days or more: the whole deposit
		{ minNoticeHours: 48, refundBp: 5000 }, // 48 hours to 7 days: half
		{ minNoticeHours: 0, refundBp: 0 } // under 48 hours: nothing
	],
	overtimeIncrementMinutes: 15,
	engineerRates: { hourly: 3500, halfDay: 12_000, fullDay: 23_000 }
});

export const DEMO_ROOMS: RoomRates[] = deepFreeze([
	{ slug: 'live-room', name: 'Live room', rates: { hourly: 4500, halfDay: 16_000, fullDay: 30_000 } },
	{ slug: 'vocal-booth', name: 'Vocal booth', rates: { hourly: 3000, halfDay: 10_000, fullDay: 19_000 } },
	{ slug: 'control-room', name: 'Control room', rates: { hourly: 4000, halfDay: 14_000, fullDay: 26_000 } }
]);

/** A fresh, mutable copy of the demo policy (DEMO_POLICY itself is frozen). */
export function demoPolicy(): StudioPolicy {
	return structuredClone(DEMO_POLICY);
}

/** A demo room by slug; throws on an unknown slug. */
export function demoRoom(slug: string): RoomRates {
	const room = DEMO_ROOMS.find((r) => r.slug === slug);
	if (!room) throw new RangeError(`no demo room "${slug}"`);
	return structuredClone(room);
}

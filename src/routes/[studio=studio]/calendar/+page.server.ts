import * as bookings from '$lib/server/bookings';
import { listRooms, publicRoom } from '$lib/server/studio';
import { publicHolidayList } from '$lib/domain/holidays';
import { isCalendarDate } from '$lib/components/booking/choices';
import { addDays, mondayOf, wallClock } from '$lib/domain/time';
import type { AvailabilityBody } from '$lib/components/calendar/availability';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url, parent }) => {
	const { storefront } = await parent();
	const ctx = await bookings.pricingContext(storefront.id);
	const { studio, policy } = ctx;
	const rows = await listRooms(studio.id);
	const rooms = rows.map((r) => publicRoom(r, studio.currency));
	const tz = studio.timeZone;
	const today = wallClock(Date.now(), tz).date;

	const wanted = url.searchParams.get('room');
	const room = wanted === 'all' || rooms.some((r) => r.slug === wanted) ? wanted! : (rooms[0]?.slug ?? 'all');
	const dateParam = url.searchParams.get('date');
	const focus = dateParam && isCalendarDate(dateParam) ? dateParam : today;
	const from = mondayOf(focus);
	const to = addDays(from, 6);

	// The first week is rendered on the server too, so the list of free times works before (and
	// without) the calendar's script; the browser refetches as the visitor moves between weeks.
	const slugs = room === 'all' ? rooms.map((r) => r.slug) : [room];
	const results = await Promise.all(slugs.map((slug) => bookings.availability(ctx, { room: slug, from, to })));
	const initial: Record<string, AvailabilityBody> = {};
	results.forEach((r, i) => {
		if (r.ok) initial[slugs[i]!] = r.body;
	});

	// Public holidays carry a surcharge even when the studio opens: shown so nobody is surprised.
	const horizonEnd = addDays(today, policy.horizonDays + 1);
	const holidays: { date: string; name: string }[] = [];
	for (let y = Number(today.slice(0, 4)); y <= Number(horizonEnd.slice(0, 4)); y++) {
		for (const h of publicHolidayList(policy.country, y)) if (h.date >= today && h.date <= horizonEnd) holidays.push(h);
	}
	const holidaySurcharge = policy.surcharges.find((s) => s.kind === 'holiday');

	const opens = policy.openingHours.map((h) => h.openMinute);
	const closes = policy.openingHours.map((h) => Math.min(h.closeMinute, 1440));
	return {
		rooms: rooms.map((r) => ({ slug: r.slug, name: r.name })),
		room,
		focus,
		week: { from, to },
		initial,
		today,
		holidays,
		holidaySurchargePercent: holidaySurcharge ? holidaySurcharge.percentBp / 100 : null,
		rules: {
			minBookingMinutes: studio.minBookingMinutes,
			incrementMinutes: studio.incrementMinutes,
			halfDayMinutes: studio.halfDayMinutes,
			fullDayMinutes: studio.fullDayMinutes,
			turnaroundMinutes: studio.turnaroundMinutes,
			minNoticeHours: studio.minNoticeMinutes / 60,
			horizonDays: studio.horizonDays,
			// The hours the grid shows: an hour either side of the opening hours.
			dayStartMinute: opens.length ? Math.max(0, Math.floor(Math.min(...opens) / 60) * 60 - 60) : 480,
			dayEndMinute: closes.length ? Math.min(1440, Math.ceil(Math.max(...closes) / 60) * 60 + 60) : 1440
		}
	};
};

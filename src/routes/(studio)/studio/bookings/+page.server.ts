import * as bookings from '$lib/server/bookings';
import { requireRole } from '$lib/server/guard';
import { listRooms, staffStudio } from '$lib/server/studio';
import { BOOKING_STATUSES, holdLapsed, isBookingStatus } from '$lib/domain/lifecycle';
import { localDayBounds } from '$lib/domain/time';
import { isCalendarDate } from '$lib/components/booking/choices';
import { dateProblem } from '$lib/schemas/input';
import { studioPath } from '$lib/studio-paths';
import type { PageServerLoad } from './$types';

const validDate = (s: string | null) => (s && isCalendarDate(s) ? s : '');

export const load: PageServerLoad = async ({ locals, url }) => {
	const owner = requireRole(locals, 'owner');
	const studio = await staffStudio(locals);
	const rooms = await listRooms(studio.id, { includeInactive: true });
	const tz = studio.timeZone;

	const status = url.searchParams.getAll('status').filter(isBookingStatus);
	const room = rooms.some((r) => r.slug === url.searchParams.get('room')) ? url.searchParams.get('room')! : '';
	let from = validDate(url.searchParams.get('from'));
	let to = validDate(url.searchParams.get('to'));
	// A date the filter cannot use (2027-02-30, year 1) is left out of it and said so beside its field.
	const problems: { from?: string; to?: string } = {};
	for (const key of ['from', 'to'] as const) {
		const asked = url.searchParams.get(key);
		if (asked && !validDate(asked)) problems[key] = dateProblem(asked) ?? 'Use a date such as 2027-03-28.';
	}
	if (from && to && to < from) [from, to] = [to, from];
	const q = (url.searchParams.get('q') ?? '').trim().slice(0, 100);

	// Local dates of the studio, both ends included: from its midnight to the midnight after `to`.
	const rows = await bookings.listInStudio(
		{ studioId: studio.id, role: owner.role },
		{
			status: status.length ? status : undefined,
			from: from ? localDayBounds(from, tz).start : undefined,
			to: to ? localDayBounds(to, tz).end : undefined
		}
	);
	const needle = q.toLowerCase();
	const list = rows
		.filter((b) => !room || b.roomSlug === room)
		.filter((b) => !needle || [b.reference, b.artistName, b.project].some((v) => v?.toLowerCase().includes(needle)))
		.map((b) => ({
			id: b.id,
			reference: b.reference,
			status: b.status,
			// A hold whose time ran out frees the slot even before the sweep marks it expired.
			holdLapsed: holdLapsed(b, Date.now()),
			startsAt: b.startsAt,
			endsAt: b.endsAt,
			roomName: b.roomName,
			artistName: b.artistName,
			project: b.project,
			engineer: !!b.engineerId,
			currency: b.currency,
			total: b.total,
			deposit: b.deposit
		}));

	return {
		calendarHref: `${studioPath(locals.studio!.slug, 'calendar')}?room=all`,
		filters: { status, room, from, to, q },
		problems,
		rooms: rooms.map((r) => ({ slug: r.slug, name: r.name })),
		statuses: [...BOOKING_STATUSES],
		bookings: list,
		truncated: rows.length >= 500
	};
};

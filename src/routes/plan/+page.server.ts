import { error } from '@sveltejs/kit';
import { TZDate } from '@date-fns/tz';
import { addDays, format } from 'date-fns';
import { and, asc, eq, gt, inArray, lt } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { booking, room, user } from '$lib/server/db/schema';
import { requireRole } from '$lib/server/guard';
import { getStudio } from '$lib/server/studio';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	requireRole(locals, 'owner', 'engineer');
	const studio = await getStudio();
	const today = format(TZDate.tz(studio.timeZone), 'yyyy-MM-dd');
	const date = url.searchParams.get('date') ?? today;
	if (!/^\d{4}-\d{2}-\d{2}$/.test(date)) error(400, { message: 'Use a date such as 2027-03-28.' });
	const [y, m, d] = date.split('-').map(Number) as [number, number, number];
	const dayStart = new TZDate(y, m - 1, d, studio.timeZone);
	const dayEnd = addDays(dayStart, 1);
	const sessions = await db
		.select({
			id: booking.id,
			reference: booking.reference,
			startsAt: booking.startsAt,
			endsAt: booking.endsAt,
			status: booking.status,
			project: booking.project,
			roomName: room.name,
			roomSlug: room.slug,
			artist: user.name
		})
		.from(booking)
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(and(lt(booking.startsAt, dayEnd), gt(booking.endsAt, dayStart), inArray(booking.status, ['pending', 'confirmed', 'completed'])))
		.orderBy(asc(room.sortOrder), asc(booking.startsAt));
	return {
		date,
		prev: format(addDays(dayStart, -1), 'yyyy-MM-dd'),
		next: format(addDays(dayStart, 1), 'yyyy-MM-dd'),
		sessions: sessions.map((s) => ({ ...s, startsAt: s.startsAt.toISOString(), endsAt: s.endsAt.toISOString() }))
	};
};

// A session's end is recorded only once it has begun, and the app books no time in the past.
// Tests that close a session book it ahead, as people do, then move it back here: by whole weeks,
// to a day that is not a public holiday, so its weekday, wall-clock times and price stay the same.
import { eq } from 'drizzle-orm';
import * as t from '../../src/lib/server/db/schema';
import { addDays, daysFrom, localParts, localToInstant } from '../../src/lib/domain/time';
import { isPublicHoliday } from '../../src/lib/domain/holidays';
import type { Database } from '../../src/lib/server/db/client';
import { TZ } from './dates';

/** PostgreSQL's SQLSTATE of an error, wherever the driver and Drizzle put it. */
function sqlState(e: unknown): string | undefined {
	for (let cur: unknown = e, i = 0; cur && i < 5; i++) {
		const c = cur as { code?: unknown; cause?: unknown };
		if (typeof c.code === 'string') return c.code;
		cur = c.cause;
	}
	return undefined;
}

const pad = (n: number) => String(n).padStart(2, '0');
const wall = (ymd: string, minute: number) => `${ymd}T${pad(Math.floor(minute / 60))}:${pad(minute % 60)}`;

/** Moves the booking to the same weekday and hours some weeks ago; gives its new local start and end. */
export async function moveIntoPast(db: Database, bookingId: string): Promise<{ start: string; end: string }> {
	const [b] = await db.select().from(t.booking).where(eq(t.booking.id, bookingId));
	if (!b) throw new Error(`no booking ${bookingId}`);
	const start = localParts(b.startsAt, TZ);
	const end = localParts(b.endsAt, TZ);
	const endDayOffset = daysFrom(start.ymd, end.ymd);
	const turnaround = b.busyUntil.getTime() - b.endsAt.getTime();
	const weeksAhead = Math.ceil((b.startsAt.getTime() - Date.now()) / (7 * 86_400_000));
	for (let weeks = weeksAhead + 1; weeks < weeksAhead + 60; weeks++) {
		const ymd = addDays(start.ymd, -7 * weeks);
		if (isPublicHoliday('FI', ymd)) continue;
		const startsAt = localToInstant(ymd, start.minuteOfDay, TZ).instant;
		const endsAt = localToInstant(addDays(ymd, endDayOffset), end.minuteOfDay, TZ).instant;
		try {
			await db
				.update(t.booking)
				.set({ startsAt, endsAt, busyUntil: new Date(endsAt.getTime() + turnaround) })
				.where(eq(t.booking.id, bookingId));
		} catch (e) {
			// Another test's session (or the demo's history) has that week: try the week before.
			if (sqlState(e) === '23P01') continue;
			throw e;
		}
		return { start: wall(ymd, start.minuteOfDay), end: wall(addDays(ymd, endDayOffset), end.minuteOfDay) };
	}
	throw new Error('no free week in the past for this session');
}

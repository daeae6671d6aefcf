// The calendar feed: a secret address per person that calendar programs poll (they cannot sign
// in), giving sessions as iCalendar (RFC 5545). Engineers and owners get every session of each
// studio they work at in that role; nobody else has a feed. The address can be replaced, which turns the old one off.
import { randomBytes } from 'node:crypto';
import { and, asc, eq, gte, inArray, lt } from 'drizzle-orm';
import ical, { ICalCalendarMethod, ICalEventStatus } from 'ical-generator';
import { db } from './db';
import { booking, calendarFeed, member, organization, room, user } from './db/schema';
import type { Role } from '$lib/roles';

/** Roles that may hold a feed: those who see every session. */
export const FEED_ROLES: Role[] = ['owner', 'engineer'];
/** The feed shows sessions from a month back to the booking horizon and a little more. */
const PAST_DAYS = 31;
const AHEAD_DAYS = 400;

function newToken(): string {
	// 256 bits, URL-safe: the address is the only credential (OWASP ASVS 7.2.3, enough entropy).
	return randomBytes(32).toString('base64url');
}

export async function feedTokenOf(userId: string): Promise<string | null> {
	const [existing] = await db.select({ token: calendarFeed.token }).from(calendarFeed).where(eq(calendarFeed.userId, userId));
	return existing?.token ?? null;
}

/** Makes a new secret address, turning off any earlier one. */
export async function replaceFeedToken(userId: string): Promise<string> {
	const token = newToken();
	await db
		.insert(calendarFeed)
		.values({ userId, token })
		.onConflictDoUpdate({ target: calendarFeed.userId, set: { token, createdAt: new Date() } });
	return token;
}

/** The feed for a token, or null when the token is unknown or its holder may no longer have one. */
export async function feedFor(token: string, now = new Date()): Promise<string | null> {
	if (!/^[A-Za-z0-9_-]{43}$/.test(token)) return null;
	const studios = await db
		.select({ id: organization.id, name: organization.name })
		.from(calendarFeed)
		.innerJoin(member, eq(member.userId, calendarFeed.userId))
		.innerJoin(organization, eq(organization.id, member.organizationId))
		.where(and(eq(calendarFeed.token, token), inArray(member.role, FEED_ROLES)));
	if (!studios.length) return null;
	const several = studios.length > 1;

	const rows = await db
		.select({ b: booking, roomName: room.name, artist: user.name, studioName: organization.name })
		.from(booking)
		.innerJoin(organization, eq(organization.id, booking.studioId))
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(
			and(
				inArray(
					booking.studioId,
					studios.map((s) => s.id)
				),
				inArray(booking.status, ['pending', 'confirmed', 'completed', 'no_show', 'cancelled']),
				gte(booking.startsAt, new Date(now.getTime() - PAST_DAYS * 86_400_000)),
				lt(booking.startsAt, new Date(now.getTime() + AHEAD_DAYS * 86_400_000))
			)
		)
		.orderBy(asc(booking.startsAt));
	const engineerIds = [...new Set(rows.map((r) => r.b.engineerId).filter((x): x is string => !!x))];
	const engineers = new Map(
		(engineerIds.length
			? await db.select({ id: user.id, name: user.name }).from(user).where(inArray(user.id, engineerIds))
			: []
		).map((e) => [e.id, e.name])
	);

	const cal = ical({
		prodId: { company: 'Slateroom', product: 'Sessions', language: 'EN' },
		method: ICalCalendarMethod.PUBLISH,
		name: several ? 'Slateroom: sessions' : `${studios[0]!.name}: sessions`,
		// RFC 7986 REFRESH-INTERVAL / X-PUBLISHED-TTL: ask calendar programs to poll every 15 minutes.
		ttl: 15 * 60
	});
	for (const { b, roomName, artist, studioName } of rows) {
		const engineerName = b.engineerId ? (engineers.get(b.engineerId) ?? 'engineer') : null;
		cal.createEvent({
			id: b.id,
			sequence: b.sequence,
			stamp: b.updatedAt,
			// UTC times (RFC 5545 §3.3.5 form 2): no VTIMEZONE needed, the same instant on any device.
			start: b.startsAt,
			end: b.endsAt,
			summary: `${roomName}: ${artist}${b.status === 'cancelled' ? ' (cancelled)' : b.status === 'no_show' ? ' (nobody came)' : ''}`,
			description: [
				`Booking ${b.reference}`,
				b.project ? `Project: ${b.project}` : null,
				`Engineer: ${engineerName ?? 'none booked'}`,
				b.notes ? `Notes: ${b.notes}` : null
			]
				.filter((x) => x !== null)
				.join('\n'),
			location: several ? `${roomName}, ${studioName}` : roomName,
			// RFC 5545 §3.8.1.11: a cancelled session stays in the feed as CANCELLED, so calendars drop it.
			// A no-show too: the event was CONFIRMED in the feed until then, and a session nobody came
			// to is not one to show as having taken place; the same UID marked CANCELLED replaces it.
			status:
				b.status === 'cancelled' || b.status === 'no_show'
					? ICalEventStatus.CANCELLED
					: b.status === 'pending'
						? ICalEventStatus.TENTATIVE
						: ICalEventStatus.CONFIRMED
		});
	}
	return cal.toString();
}

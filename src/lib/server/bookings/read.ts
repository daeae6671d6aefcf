// Reading bookings, scoped by the acting user (OWASP ASVS 8.2.2). A booking is read through its
// own studio: its artist sees it at any studio, a studio's owner and engineers see that studio's
// bookings, its accountant those in its accounts; staff of one studio see nothing of another's.
import { and, asc, desc, eq, gte, inArray, lt, sql } from 'drizzle-orm';
import { db } from '../db';
import {
	booking,
	bookingGear,
	gearItem,
	invoice,
	organization,
	payment,
	recordedPayment,
	room,
	studio,
	user
} from '../db/schema';
import type { SessionUser } from '../auth';
import type { Role } from '$lib/roles';
import { roleIn } from '../team';
import { OPEN_STATUSES, type BookingStatus } from '$lib/domain/lifecycle';
import type { Quote } from '$lib/domain/pricing';
import { publicQuote } from './quote';
import { isoInZone } from './request';

export function canSeeAll(actor: { role: Role }): boolean {
	return actor.role === 'owner' || actor.role === 'engineer';
}

/** A person's role at a studio: their role in its team, else an artist (anyone may book anywhere). */
export async function roleAt(userId: string, studioId: string): Promise<Role> {
	return (await roleIn(studioId, userId)) ?? 'artist';
}

/**
 * The acting user as they stand at one booking's studio: the engineer of one studio who books at
 * another is an artist there. Every decision about a booking is taken with this, never with the
 * role of the studio the person happens to work in now.
 */
export async function actorAt(actor: SessionUser, studioId: string): Promise<SessionUser> {
	return { ...actor, role: await roleAt(actor.id, studioId) };
}

const summaryColumns = {
	id: booking.id,
	studioId: booking.studioId,
	reference: booking.reference,
	status: booking.status,
	startsAt: booking.startsAt,
	endsAt: booking.endsAt,
	holdExpiresAt: booking.holdExpiresAt,
	currency: booking.currency,
	total: booking.total,
	deposit: booking.deposit,
	project: booking.project,
	roomSlug: room.slug,
	roomName: room.name,
	artistId: booking.artistId,
	artistName: user.name,
	engineerId: booking.engineerId,
	createdAt: booking.createdAt
};

type ListFilter = { status?: BookingStatus[]; from?: Date; to?: Date };

function filterConditions(filter: ListFilter) {
	const conditions = [];
	if (filter.status?.length) conditions.push(inArray(booking.status, filter.status));
	if (filter.from) conditions.push(gte(booking.endsAt, filter.from));
	if (filter.to) conditions.push(lt(booking.startsAt, filter.to));
	return conditions;
}

/**
 * One studio's bookings, for its owner and engineers (nothing for anyone else): the owner's list
 * of all bookings and `GET /api/bookings?studio=`. The caller gives the role the person has in
 * that studio's team.
 */
export async function listInStudio(actor: { studioId: string; role: Role }, filter: ListFilter = {}) {
	if (!canSeeAll(actor)) return [];
	return db
		.select(summaryColumns)
		.from(booking)
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(and(eq(booking.studioId, actor.studioId), ...filterConditions(filter)))
		.orderBy(desc(booking.startsAt))
		.limit(500);
}

/**
 * The acting user's own bookings as an artist, at every studio, newest first, each with its
 * studio's name, short name and zone: "My bookings" and `GET /api/bookings`.
 */
export async function listOwn(actor: Pick<SessionUser, 'id'>) {
	return db
		.select({
			...summaryColumns,
			studioSlug: organization.slug,
			studioName: studio.name,
			studioTimeZone: studio.timeZone
		})
		.from(booking)
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.innerJoin(studio, eq(studio.id, booking.studioId))
		.innerJoin(organization, eq(organization.id, booking.studioId))
		.where(eq(booking.artistId, actor.id))
		.orderBy(desc(booking.startsAt))
		.limit(500);
}

/** What a line of a booking list shows. */
const lineColumns = {
	id: booking.id,
	reference: booking.reference,
	startsAt: booking.startsAt,
	endsAt: booking.endsAt,
	status: booking.status,
	room: room.name,
	total: booking.total,
	currency: booking.currency
};

/**
 * The owner's desk of their studio: sessions of the coming week still ahead, how many bookings of
 * each status have not ended, and sessions over but not closed (their end and overtime not
 * recorded, so no final invoice yet). Nothing for anyone but the studio's owner.
 */
export async function ownerDesk(actor: { studioId: string; role: Role }, now = new Date()) {
	if (actor.role !== 'owner') return null;
	const here = eq(booking.studioId, actor.studioId);
	const weekAhead = new Date(now.getTime() + 7 * 24 * 3600 * 1000);
	const [upcoming, counts, toClose] = await Promise.all([
		db
			.select({ ...lineColumns, artist: user.name })
			.from(booking)
			.innerJoin(room, eq(room.id, booking.roomId))
			.innerJoin(user, eq(user.id, booking.artistId))
			.where(and(here, gte(booking.startsAt, now), lt(booking.startsAt, weekAhead), inArray(booking.status, OPEN_STATUSES)))
			.orderBy(booking.startsAt)
			.limit(20),
		db
			.select({ status: booking.status, n: sql<number>`count(*)::int` })
			.from(booking)
			.where(and(here, gte(booking.endsAt, now)))
			.groupBy(booking.status),
		db
			.select({
				id: booking.id,
				reference: booking.reference,
				startsAt: booking.startsAt,
				endsAt: booking.endsAt,
				artist: user.name
			})
			.from(booking)
			.innerJoin(user, eq(user.id, booking.artistId))
			.where(and(here, eq(booking.status, 'confirmed'), lt(booking.endsAt, now)))
			.orderBy(asc(booking.endsAt))
			.limit(20)
	]);
	return { upcoming, counts: Object.fromEntries(counts.map((c) => [c.status, c.n])) as Record<string, number>, toClose };
}

export type BookingRow = typeof booking.$inferSelect;

/**
 * A booking's row, when the acting user may know it exists, with the user as they stand at its
 * studio (`as`): its artist, and anyone in its studio's team (what they may do with it is the
 * caller's to decide: paying, cancelling). Anyone else gets undefined, a 404: another artist's
 * booking, or another studio's, is not theirs to know of.
 */
export async function getRow(actor: SessionUser, id: string): Promise<{ booking: BookingRow; as: SessionUser } | undefined> {
	const [row] = await db.select().from(booking).where(eq(booking.id, id));
	if (!row) return undefined;
	const as = await actorAt(actor, row.studioId);
	if (as.role === 'artist' && row.artistId !== actor.id) return undefined;
	return { booking: row, as };
}

/**
 * Whether a booking appears in the accounts: it has a document, money paid or on its way, or a payment recorded by hand. The accountant reads
 * those bookings (the references in the month lead to them), and no others.
 */
async function inTheAccounts(bookingId: string): Promise<boolean> {
	const [documents, payments, recorded] = await Promise.all([
		db.select({ id: invoice.id }).from(invoice).where(eq(invoice.bookingId, bookingId)).limit(1),
		db
			.select({ id: payment.id })
			.from(payment)
			.where(and(eq(payment.bookingId, bookingId), inArray(payment.status, ['paid', 'processing'])))
			.limit(1),
		db.select({ id: recordedPayment.id }).from(recordedPayment).where(eq(recordedPayment.bookingId, bookingId)).limit(1)
	]);
	return documents.length > 0 || payments.length > 0 || recorded.length > 0;
}

/**
 * One booking with its studio, or undefined when it does not exist or is not the viewer's to see
 * (a 404 either way): the artist's own at any studio; in its studio's team, any for the owner and
 * engineers and those in the accounts for the accountant. `viewerRole` is the viewer's role at the
 * booking's studio.
 */
export async function getForViewer(actor: SessionUser, id: string) {
	const [row] = await db
		.select({
			...summaryColumns,
			quote: booking.quote,
			notes: booking.notes,
			billing: booking.billing,
			actualEndsAt: booking.actualEndsAt,
			cancelledAt: booking.cancelledAt,
			cancelReason: booking.cancelReason,
			noShowAt: booking.noShowAt,
			sequence: booking.sequence,
			studio: {
				slug: organization.slug,
				name: studio.name,
				timeZone: studio.timeZone,
				currency: studio.currency,
				locale: studio.locale,
				halfDayMinutes: studio.halfDayMinutes,
				fullDayMinutes: studio.fullDayMinutes
			}
		})
		.from(booking)
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.innerJoin(studio, eq(studio.id, booking.studioId))
		.innerJoin(organization, eq(organization.id, booking.studioId))
		.where(eq(booking.id, id));
	if (!row) return undefined;
	const viewerRole = await roleAt(actor.id, row.studioId);
	const own = row.artistId === actor.id;
	if (!canSeeAll({ role: viewerRole }) && !own && !(viewerRole === 'accountant' && (await inTheAccounts(id)))) {
		return undefined;
	}
	const [gear, engineer] = await Promise.all([
		db
			.select({
				id: gearItem.id,
				name: gearItem.name,
				category: gearItem.category,
				hireFee: bookingGear.hireFee,
				caution: gearItem.caution
			})
			.from(bookingGear)
			.innerJoin(gearItem, eq(gearItem.id, bookingGear.gearItemId))
			.where(eq(bookingGear.bookingId, id)),
		row.engineerId ? db.select({ name: user.name }).from(user).where(eq(user.id, row.engineerId)) : Promise.resolve([])
	]);
	return { ...row, viewerRole, quote: row.quote as Quote, gear, engineerName: engineer[0]?.name ?? null };
}

export type BookingDetail = NonNullable<Awaited<ReturnType<typeof getForViewer>>>;

/**
 * Whom a booking is billed to, for those who deal with its money (its artist, the owner, the
 * accountant): null means the artist's name alone. An engineer runs the session and is not shown
 * the buyer's address (undefined).
 */
export function billedTo(b: Pick<BookingDetail, 'billing' | 'viewerRole'>) {
	return b.viewerRole === 'engineer' ? undefined : b.billing;
}
type BookingSummary = Awaited<ReturnType<typeof listInStudio>>[number];

/** The studio a booking is read through, as the JSON API names it. */
export interface StudioTag {
	slug: string;
	name: string;
	timeZone: string;
}

/** The booking as the JSON API shows it: its studio, its times in that studio's zone. */
export function bookingJson(b: BookingSummary | BookingDetail, place: StudioTag) {
	const timeZone = place.timeZone;
	return {
		id: b.id,
		studio: { slug: place.slug, name: place.name, timeZone },
		reference: b.reference,
		status: b.status,
		start: isoInZone(b.startsAt, timeZone),
		end: isoInZone(b.endsAt, timeZone),
		holdExpiresAt: b.holdExpiresAt ? isoInZone(b.holdExpiresAt, timeZone) : null,
		room: { slug: b.roomSlug, name: b.roomName },
		artist: { name: b.artistName },
		project: b.project,
		currency: b.currency,
		total: b.total,
		deposit: b.deposit,
		...('quote' in b
			? {
					quote: publicQuote(b.quote),
					gear: b.gear.map((g) => ({ id: g.id, name: g.name, hireFee: g.hireFee })),
					engineer: b.engineerName
				}
			: {})
	};
}

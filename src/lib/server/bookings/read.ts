// Reading bookings, scoped by the acting user (OWASP ASVS 8.2.2): an artist sees their own only,
// the owner and engineers see all, the accountant those in the accounts.
import { and, asc, desc, eq, gte, inArray, lt, sql } from 'drizzle-orm';
import { db } from '../db';
import { booking, bookingGear, gearItem, invoice, payment, room, user } from '../db/schema';
import type { SessionUser } from '../auth';
import { OPEN_STATUSES, type BookingStatus } from '$lib/domain/lifecycle';
import type { Quote } from '$lib/domain/pricing';
import { publicQuote } from './quote';
import { isoInZone } from './request';

export function canSeeAll(actor: SessionUser): boolean {
	return actor.role === 'owner' || actor.role === 'engineer';
}

const summaryColumns = {
	id: booking.id,
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

export async function listForViewer(actor: SessionUser, filter: { status?: BookingStatus[]; from?: Date; to?: Date } = {}) {
	const conditions = [];
	if (!canSeeAll(actor)) conditions.push(eq(booking.artistId, actor.id));
	if (filter.status?.length) conditions.push(inArray(booking.status, filter.status));
	if (filter.from) conditions.push(gte(booking.endsAt, filter.from));
	if (filter.to) conditions.push(lt(booking.startsAt, filter.to));
	return db
		.select(summaryColumns)
		.from(booking)
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(conditions.length ? and(...conditions) : undefined)
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

/** The acting user's own bookings (as artist), newest first: the "My bookings" page. */
export async function listOwn(actor: SessionUser) {
	return db
		.select(lineColumns)
		.from(booking)
		.innerJoin(room, eq(room.id, booking.roomId))
		.where(eq(booking.artistId, actor.id))
		.orderBy(desc(booking.startsAt));
}

/**
 * The owner's desk: sessions of the coming week still ahead, how many bookings of each status
 * have not ended, and sessions over but not closed (their end and overtime not recorded, so no
 * final invoice yet). Nothing for anyone but the owner.
 */
export async function ownerDesk(actor: SessionUser, now = new Date()) {
	if (actor.role !== 'owner') return null;
	const weekAhead = new Date(now.getTime() + 7 * 24 * 3600 * 1000);
	const [upcoming, counts, toClose] = await Promise.all([
		db
			.select({ ...lineColumns, artist: user.name })
			.from(booking)
			.innerJoin(room, eq(room.id, booking.roomId))
			.innerJoin(user, eq(user.id, booking.artistId))
			.where(and(gte(booking.startsAt, now), lt(booking.startsAt, weekAhead), inArray(booking.status, OPEN_STATUSES)))
			.orderBy(booking.startsAt)
			.limit(20),
		db
			.select({ status: booking.status, n: sql<number>`count(*)::int` })
			.from(booking)
			.where(gte(booking.endsAt, now))
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
			.where(and(eq(booking.status, 'confirmed'), lt(booking.endsAt, now)))
			.orderBy(asc(booking.endsAt))
			.limit(20)
	]);
	return { upcoming, counts: Object.fromEntries(counts.map((c) => [c.status, c.n])) as Record<string, number>, toClose };
}

export type BookingRow = typeof booking.$inferSelect;

/**
 * A booking's row, when the acting user may know it exists: an artist their own only (another's
 * is a 404, its existence is not theirs to know), every other role any. What they may do with it
 * is the caller's to decide (paying, cancelling).
 */
export async function getRow(actor: SessionUser, id: string): Promise<BookingRow | undefined> {
	const [row] = await db.select().from(booking).where(eq(booking.id, id));
	if (!row || (actor.role === 'artist' && row.artistId !== actor.id)) return undefined;
	return row;
}

/**
 * Whether a booking appears in the accounts: it has a document, or money paid or on its way. The accountant reads
 * those bookings (the references in the month lead to them), and no others.
 */
async function inTheAccounts(bookingId: string): Promise<boolean> {
	const [documents, payments] = await Promise.all([
		db.select({ id: invoice.id }).from(invoice).where(eq(invoice.bookingId, bookingId)).limit(1),
		db
			.select({ id: payment.id })
			.from(payment)
			.where(and(eq(payment.bookingId, bookingId), inArray(payment.status, ['paid', 'processing'])))
			.limit(1)
	]);
	return documents.length > 0 || payments.length > 0;
}

/**
 * One booking, or undefined when it does not exist or is not the viewer's to see (a 404 either
 * way): the artist's own, any for the owner and engineers, and for the accountant those in the accounts.
 */
export async function getForViewer(actor: SessionUser, id: string) {
	const [row] = await db
		.select({
			...summaryColumns,
			quote: booking.quote,
			notes: booking.notes,
			actualEndsAt: booking.actualEndsAt,
			cancelledAt: booking.cancelledAt,
			cancelReason: booking.cancelReason,
			sequence: booking.sequence
		})
		.from(booking)
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(eq(booking.id, id));
	if (!row) return undefined;
	if (!canSeeAll(actor) && row.artistId !== actor.id && !(actor.role === 'accountant' && (await inTheAccounts(id)))) {
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
	return { ...row, quote: row.quote as Quote, gear, engineerName: engineer[0]?.name ?? null };
}

export type BookingDetail = NonNullable<Awaited<ReturnType<typeof getForViewer>>>;

/** The booking as the JSON API shows it. */
export function bookingJson(b: Awaited<ReturnType<typeof listForViewer>>[number] | BookingDetail, timeZone: string) {
	return {
		id: b.id,
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

// The studio's settings as the domain rules want them (StudioPolicy), and its rooms.
import { error } from '@sveltejs/kit';
import { and, asc, eq } from 'drizzle-orm';
import { db } from './db';
import { organization, room, studio, surchargeRule } from './db/schema';
import type { RoomRates, StudioPolicy } from '$lib/domain/types';
import { staffActor } from './actor';
import type { Membership } from './team';
import { RESERVED_SLUGS, hasSlugShape } from '$lib/domain/studio-slug';

export type StudioRow = typeof studio.$inferSelect;
export type RoomRow = typeof room.$inferSelect;

/** A studio by its id; 404 when there is none (never a 500). */
export async function getStudio(id: string): Promise<StudioRow> {
	const row = await findStudio(id);
	if (!row) error(404, { error: 'not_found', message: 'There is no such studio.' });
	return row;
}

/** A studio by its id, or null when there is none. */
export async function findStudio(id: string): Promise<StudioRow | null> {
	const [row] = await db.select().from(studio).where(eq(studio.id, id));
	return row ?? null;
}

export function policyFrom(row: StudioRow, surcharges: (typeof surchargeRule.$inferSelect)[]): StudioPolicy {
	return {
		timeZone: row.timeZone,
		currency: row.currency,
		country: row.country,
		vatRateBp: row.vatRateBp,
		pricesIncludeVat: row.pricesIncludeVat,
		blocks: { halfDayMinutes: row.halfDayMinutes, fullDayMinutes: row.fullDayMinutes },
		minBookingMinutes: row.minBookingMinutes,
		incrementMinutes: row.incrementMinutes,
		turnaroundMinutes: row.turnaroundMinutes,
		minNoticeMinutes: row.minNoticeMinutes,
		horizonDays: row.horizonDays,
		holdMinutes: row.holdMinutes,
		openingHours: row.openingHours,
		surcharges: surcharges
			.filter((s) => s.active)
			.map((s) => ({
				id: s.id,
				label: s.label,
				kind: s.kind === 'holiday' ? 'holiday' : 'window',
				percentBp: s.percentBp,
				weekdays: s.weekdays,
				fromMinute: s.fromMinute,
				toMinute: s.toMinute
			})),
		depositBp: row.depositBp,
		depositMinimum: row.depositMinimum,
		cancellation: row.cancellation,
		overtimeIncrementMinutes: row.overtimeIncrementMinutes,
		engineerRates: { hourly: row.engineerHourly, halfDay: row.engineerHalfDay, fullDay: row.engineerFullDay }
	};
}

export async function getPolicy(id: string): Promise<{ studio: StudioRow; policy: StudioPolicy }> {
	const row = await getStudio(id);
	const surcharges = await db
		.select()
		.from(surchargeRule)
		.where(eq(surchargeRule.studioId, row.id))
		.orderBy(asc(surchargeRule.sortOrder));
	return { studio: row, policy: policyFrom(row, surcharges) };
}

export async function listRooms(studioId: string, options: { includeInactive?: boolean } = {}): Promise<RoomRow[]> {
	const rows = await db.select().from(room).where(eq(room.studioId, studioId)).orderBy(asc(room.sortOrder), asc(room.name));
	return options.includeInactive ? rows : rows.filter((r) => r.active);
}

export async function getRoomBySlug(studioId: string, slug: string): Promise<RoomRow | undefined> {
	const [row] = await db
		.select()
		.from(room)
		.where(and(eq(room.studioId, studioId), eq(room.slug, slug)));
	return row?.active ? row : undefined;
}

export function roomRates(row: RoomRow): RoomRates {
	return { slug: row.slug, name: row.name, rates: { hourly: row.hourly, halfDay: row.halfDay, fullDay: row.fullDay } };
}

/** What anyone may see of a room: its name, description and rate card. */
export function publicRoom(row: RoomRow, currency: string) {
	return {
		slug: row.slug,
		name: row.name,
		description: row.description,
		capacity: row.capacity,
		currency,
		rates: { hourly: row.hourly, halfDay: row.halfDay, fullDay: row.fullDay }
	};
}

/** A studio as its short name names it, and who may see it. */
export interface StudioAtAddress {
	studio: StudioRow;
	slug: string;
	/** The viewer's membership of its team, if any (their role there). */
	membership: Membership | null;
}

/**
 * The studio whose short name is `slug`, when the viewer may see it: a published studio is seen by
 * anyone, one not published yet only by its own team (`memberships`, from locals). Null for an
 * unknown or reserved name and for a studio the viewer may not see: the caller answers 404, so an
 * outsider cannot tell an unpublished studio from none.
 */
export async function studioBySlug(slug: string, memberships: readonly Membership[]): Promise<StudioAtAddress | null> {
	if (!hasSlugShape(slug) || RESERVED_SLUGS.has(slug)) return null;
	const [row] = await db
		.select({ studio, slug: organization.slug })
		.from(studio)
		.innerJoin(organization, eq(organization.id, studio.id))
		.where(eq(organization.slug, slug));
	if (!row) return null;
	const membership = memberships.find((m) => m.studioId === row.studio.id) ?? null;
	if (!row.studio.published && !membership) return null;
	return { studio: row.studio, slug: row.slug, membership };
}

/** The studio a staff member works in now (403 for anyone outside a team). */
export function staffStudio(locals: App.Locals): Promise<StudioRow> {
	return getStudio(staffActor(locals, null).studioId);
}

// Rooms with their rate cards, and the gear inventory, as the owner keeps them. A rate change
// touches only future quotes: a booking keeps the quote it was made with (booking.quote).
import { and, asc, eq, isNotNull, sql } from 'drizzle-orm';
import { slugFromName } from '$lib/domain/studio-slug';
import { db } from './db';
import type { Actor } from './actor';
import { gearItem, room } from './db/schema';
import { audit } from './audit';

export type GearRow = typeof gearItem.$inferSelect;

export interface RoomValues {
	name: string;
	description: string;
	hourly: number;
	halfDay: number;
	fullDay: number;
	active: boolean;
}

export interface GearValues {
	name: string;
	category: string;
	description: string;
	homeRoomId: string | null;
	hireFee: number;
	hireable: boolean;
	notes: string;
	caution: string;
}

function changes<T extends object>(before: T, after: Partial<T>): Record<string, { from: unknown; to: unknown }> {
	const out: Record<string, { from: unknown; to: unknown }> = {};
	for (const key of Object.keys(after) as (keyof T)[]) {
		if (JSON.stringify(before[key]) !== JSON.stringify(after[key])) out[String(key)] = { from: before[key], to: after[key] };
	}
	return out;
}

/** Saves a room's name, description, rate card and whether it is bookable; false when there is no such room. */
export async function updateRoom(actor: Actor, id: string, values: RoomValues): Promise<boolean> {
	const [before] = await db
		.select()
		.from(room)
		.where(and(eq(room.studioId, actor.studioId), eq(room.id, id)));
	if (!before) return false;
	const diff = changes(before, values);
	if (Object.keys(diff).length === 0) return true;
	await db
		.update(room)
		.set(values)
		.where(and(eq(room.studioId, actor.studioId), eq(room.id, id)));
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'room.changed',
		entity: 'room',
		entityId: id,
		data: diff,
		ip: actor.ip
	});
	return true;
}

/**
 * Adds a room to the studio. Its short name (its key in addresses and the API) is made from its
 * name by the short-name rule, with -2, -3… when the studio already has one by that name.
 */
export async function addRoom(actor: Actor, values: RoomValues): Promise<string> {
	const base = slugFromName(values.name) || 'room';
	const taken = new Set(
		(await db.select({ slug: room.slug }).from(room).where(eq(room.studioId, actor.studioId))).map((r) => r.slug)
	);
	let slug = base;
	for (let n = 2; taken.has(slug); n++) slug = `${base.slice(0, 36)}-${n}`;
	const [row] = await db
		.insert(room)
		.values({
			...values,
			studioId: actor.studioId,
			slug,
			sortOrder: sql`(select coalesce(max(${room.sortOrder}), 0) + 1 from ${room} where ${room.studioId} = ${actor.studioId})`
		})
		.returning({ id: room.id });
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'room.added',
		entity: 'room',
		entityId: row!.id,
		data: { ...values, slug },
		ip: actor.ip
	});
	return row!.id;
}

/** Every piece of gear, retired ones last. */
export async function listGear(studioId: string): Promise<GearRow[]> {
	return db.select().from(gearItem).where(eq(gearItem.studioId, studioId)).orderBy(asc(gearItem.category), asc(gearItem.name));
}

/** The gear an artist may hire with a room (active, hireable, kept in a room), for the booking page. */
export async function listHireableGear(studioId: string) {
	return db
		.select({
			id: gearItem.id,
			name: gearItem.name,
			category: gearItem.category,
			description: gearItem.description,
			hireFee: gearItem.hireFee,
			caution: gearItem.caution,
			homeRoomId: gearItem.homeRoomId
		})
		.from(gearItem)
		.where(
			and(eq(gearItem.studioId, studioId), eq(gearItem.active, true), eq(gearItem.hireable, true), isNotNull(gearItem.homeRoomId))
		)
		.orderBy(asc(gearItem.category), asc(gearItem.name));
}

async function roomExists(studioId: string, id: string | null): Promise<boolean> {
	if (!id) return true;
	const [row] = await db
		.select({ id: room.id })
		.from(room)
		.where(and(eq(room.studioId, studioId), eq(room.id, id)));
	return !!row;
}

export async function addGear(actor: Actor, values: GearValues): Promise<GearRow | null> {
	if (!(await roomExists(actor.studioId, values.homeRoomId))) return null;
	const [row] = await db
		.insert(gearItem)
		.values({ ...values, studioId: actor.studioId })
		.returning();
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'gear.added',
		entity: 'gear_item',
		entityId: row!.id,
		data: values,
		ip: actor.ip
	});
	return row!;
}

/** 'missing' when there is no such piece of gear or home room. */
export async function updateGear(actor: Actor, id: string, values: GearValues): Promise<'saved' | 'missing'> {
	const [before] = await db
		.select()
		.from(gearItem)
		.where(and(eq(gearItem.studioId, actor.studioId), eq(gearItem.id, id)));
	if (!before || !(await roomExists(actor.studioId, values.homeRoomId))) return 'missing';
	const diff = changes(before, values);
	if (Object.keys(diff).length === 0) return 'saved';
	await db
		.update(gearItem)
		.set(values)
		.where(and(eq(gearItem.studioId, actor.studioId), eq(gearItem.id, id)));
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'gear.changed',
		entity: 'gear_item',
		entityId: id,
		data: diff,
		ip: actor.ip
	});
	return 'saved';
}

/**
 * Retires a piece of gear (or brings it back). Retired gear is no longer offered for new bookings;
 * it stays on the bookings and invoices that already name it, so it is never deleted.
 */
export async function setGearActive(actor: Actor, id: string, active: boolean): Promise<GearRow | null> {
	const [row] = await db
		.update(gearItem)
		.set({ active })
		.where(and(eq(gearItem.studioId, actor.studioId), eq(gearItem.id, id)))
		.returning();
	if (!row) return null;
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: active ? 'gear.restored' : 'gear.retired',
		entity: 'gear_item',
		entityId: id,
		ip: actor.ip
	});
	return row;
}

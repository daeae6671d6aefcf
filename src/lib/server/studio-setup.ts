// Setting up a studio: anyone signed in creates one (an organization, its owner and its settings,
// unpublished), then its owner goes through the set-up steps and publishes it. The platform's front
// page and GET /api/studios list the published studios.
import { and, asc, count, eq } from 'drizzle-orm';
import { db } from './db';
import { member, organization, room, studio } from './db/schema';
import type { Actor } from './actor';
import { audit } from './audit';
import { setActiveStudio } from './team';
import { pgCode } from './payments/core';
import type { NewStudio } from '$lib/schemas/studio';
import {
	DEFAULT_CANCELLATION,
	DEFAULT_OPENING_HOURS,
	DEFAULT_RULES,
	SETUP_STEPS,
	referencePrefixFromName,
	type SetupStep
} from '$lib/domain/setup';

export interface PublicStudio {
	slug: string;
	name: string;
	country: string;
	currency: string;
	timeZone: string;
	city: string;
}

export type CreateOutcome =
	| { ok: true; studio: PublicStudio & { id: string } }
	| { ok: false; status: 409; fields: Record<string, string[]>; message: string };

export const SLUG_TAKEN = 'That short name is taken; choose another.';

/**
 * Creates a studio in one transaction: its organization (name, short name), the creator as its
 * owner and its settings with the defaults of src/lib/domain/setup.ts, unpublished. The session
 * then works in it. A short name already taken is a 409, also when two people take it at once
 * (the unique index on organization.slug decides, SQLSTATE 23505).
 */
export async function createStudio(
	creator: { id: string; email: string },
	sessionId: string,
	input: NewStudio,
	ip: string | null = null
): Promise<CreateOutcome> {
	const id = crypto.randomUUID();
	try {
		await db.transaction(async (tx) => {
			await tx.insert(organization).values({ id, name: input.name, slug: input.slug });
			await tx.insert(member).values({ id: crypto.randomUUID(), organizationId: id, userId: creator.id, role: 'owner' });
			await tx.insert(studio).values({
				id,
				name: input.name,
				published: false,
				country: input.country,
				email: creator.email,
				timeZone: input.timeZone,
				currency: input.currency,
				referencePrefix: referencePrefixFromName(input.name),
				vatRateBp: 0,
				pricesIncludeVat: true,
				...DEFAULT_RULES,
				depositMinimum: 0,
				engineerHourly: 0,
				engineerHalfDay: 0,
				engineerFullDay: 0,
				closedOnPublicHolidays: false,
				openingHours: DEFAULT_OPENING_HOURS.map((h) => ({ ...h })),
				cancellation: DEFAULT_CANCELLATION.map((r) => ({ ...r }))
			});
		});
	} catch (e) {
		const { code, constraint } = pgCode(e);
		if (code === '23505' && (constraint ?? '').includes('slug')) {
			return { ok: false, status: 409, fields: { slug: [SLUG_TAKEN] }, message: SLUG_TAKEN };
		}
		throw e;
	}
	await setActiveStudio(sessionId, id);
	await audit({ studioId: id, actorId: creator.id, action: 'studio.created', entity: 'studio', entityId: id, data: input, ip });
	const { name, slug, country, currency, timeZone } = input;
	return { ok: true, studio: { id, name, slug, country, currency, timeZone, city: '' } };
}

/** Is a short name free? (The insert still decides under a race.) */
export async function slugTaken(slug: string): Promise<boolean> {
	const [row] = await db.select({ id: organization.id }).from(organization).where(eq(organization.slug, slug));
	return !!row;
}

/** The published studios, by name then short name. */
export async function listPublished(): Promise<PublicStudio[]> {
	return db
		.select({
			slug: organization.slug,
			name: studio.name,
			country: studio.country,
			currency: studio.currency,
			timeZone: studio.timeZone,
			city: studio.city
		})
		.from(studio)
		.innerJoin(organization, eq(organization.id, studio.id))
		.where(eq(studio.published, true))
		.orderBy(asc(studio.name), asc(organization.slug));
}

export interface SetupState {
	done: SetupStep[];
	rooms: number;
	published: boolean;
	/** What still stands between the studio and publishing, in words (empty: it may publish). */
	missing: string[];
}

export async function setupState(studioId: string): Promise<SetupState> {
	const [[row], [rooms]] = await Promise.all([
		db
			.select({
				done: studio.setupDone,
				published: studio.published,
				street: studio.street,
				city: studio.city,
				chargesEnabled: studio.chargesEnabled
			})
			.from(studio)
			.where(eq(studio.id, studioId)),
		db
			.select({ n: count() })
			.from(room)
			.where(and(eq(room.studioId, studioId), eq(room.active, true)))
	]);
	if (!row) throw new Error(`no studio ${studioId}`);
	// Get paid is done by Stripe's word (the account takes charges), never by a saved step.
	const done = SETUP_STEPS.filter((s) => (s === 'payouts' ? row.chargesEnabled : row.done.includes(s)));
	const missing: string[] = [];
	// Directive 2006/112/EC Article 226(5): an invoice states the supplier's address.
	if (!row.street || !row.city) missing.push('the studio’s address (its invoices carry it)');
	if (!rooms?.n) missing.push('at least one bookable room');
	return { done, rooms: rooms?.n ?? 0, published: row.published, missing };
}

/** Records that the owner has finished a step (what the step saved is saved by its own module). */
export async function markDone(actor: Actor, step: SetupStep): Promise<void> {
	const [row] = await db.select({ done: studio.setupDone }).from(studio).where(eq(studio.id, actor.studioId));
	if (!row || row.done.includes(step)) return;
	await db
		.update(studio)
		.set({ setupDone: [...row.done, step] })
		.where(eq(studio.id, actor.studioId));
}

export interface AddressValues {
	street: string;
	postalCode: string;
	city: string;
	country: string;
	vatId: string;
}

/** Saves the studio's address and VAT ID. */
export async function saveAddress(actor: Actor, values: AddressValues): Promise<void> {
	await db.update(studio).set(values).where(eq(studio.id, actor.studioId));
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'studio.address_changed',
		entity: 'studio',
		entityId: actor.studioId,
		data: values,
		ip: actor.ip
	});
}

/** Publishes the studio once nothing is missing; returns what is missing otherwise. */
export async function publish(actor: Actor): Promise<{ ok: true } | { ok: false; missing: string[] }> {
	const state = await setupState(actor.studioId);
	if (state.missing.length) return { ok: false, missing: state.missing };
	if (!state.published) await setPublished(actor, true);
	return { ok: true };
}

/** Takes the studio off the platform's list and its storefront off the web; its data stays. */
export async function unpublish(actor: Actor): Promise<void> {
	const [row] = await db.select({ published: studio.published }).from(studio).where(eq(studio.id, actor.studioId));
	if (row?.published) await setPublished(actor, false);
}

async function setPublished(actor: Actor, published: boolean) {
	await db.update(studio).set({ published }).where(eq(studio.id, actor.studioId));
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: published ? 'studio.published' : 'studio.unpublished',
		entity: 'studio',
		entityId: actor.studioId,
		ip: actor.ip
	});
}

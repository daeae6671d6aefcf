// The owner's rates and policy: the studio row and its surcharge rules. Changing them touches
// only future quotes; a booking keeps the quote it was made with (booking.quote).
import { and, asc, eq, sql } from 'drizzle-orm';
import { db } from './db';
import type { Actor } from './actor';
import { studio, surchargeRule } from './db/schema';
import { audit } from './audit';
import { getStudio } from './studio';
import { parseMoney } from '$lib/domain/money';
import type { CancellationRung, OpeningHours } from '$lib/domain/types';

export type SurchargeRow = typeof surchargeRule.$inferSelect;

/** What the Rates & policy form may change on the studio row. */
export interface PolicyValues {
	vatRateBp: number;
	pricesIncludeVat: boolean;
	minBookingMinutes: number;
	incrementMinutes: number;
	turnaroundMinutes: number;
	minNoticeMinutes: number;
	horizonDays: number;
	holdMinutes: number;
	depositBp: number;
	depositMinimum: number;
	overtimeIncrementMinutes: number;
	engineerHourly: number;
	engineerHalfDay: number;
	engineerFullDay: number;
	closedOnPublicHolidays: boolean;
	openingHours: OpeningHours[];
	cancellation: CancellationRung[];
}

export interface SurchargeValues {
	label: string;
	kind: 'window' | 'holiday';
	percentBp: number;
	weekdays: number[];
	fromMinute: number;
	toMinute: number;
	active: boolean;
}

export async function listSurcharges(studioId: string): Promise<SurchargeRow[]> {
	return db
		.select()
		.from(surchargeRule)
		.where(eq(surchargeRule.studioId, studioId))
		.orderBy(asc(surchargeRule.sortOrder), asc(surchargeRule.label));
}

function changes<T extends object>(before: T, after: Partial<T>): Record<string, { from: unknown; to: unknown }> {
	const out: Record<string, { from: unknown; to: unknown }> = {};
	for (const key of Object.keys(after) as (keyof T)[]) {
		const a = JSON.stringify(before[key]);
		const b = JSON.stringify(after[key]);
		if (a !== b) out[String(key)] = { from: before[key], to: after[key] };
	}
	return out;
}

/** Saves the policy; returns the names of the fields that changed (none: nothing written). */
export async function updatePolicy(actor: Actor, values: PolicyValues): Promise<string[]> {
	const before = await getStudio(actor.studioId);
	const diff = changes(before, values);
	const changed = Object.keys(diff);
	if (changed.length === 0) return [];
	await db.update(studio).set(values).where(eq(studio.id, actor.studioId));
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'studio.policy_changed',
		entity: 'studio',
		entityId: actor.studioId,
		data: diff,
		ip: actor.ip
	});
	return changed;
}

/**
 * The owner's choice to invoice EU business buyers abroad under reverse charge
 * ($lib/domain/vat-treatment.ts). Only bookings made after the change follow it: a booking keeps
 * the treatment of its quote. Returns whether anything changed.
 */
export async function setReverseChargeAbroad(actor: Actor, on: boolean): Promise<boolean> {
	const before = await getStudio(actor.studioId);
	if (before.reverseChargeAbroad === on) return false;
	await db.update(studio).set({ reverseChargeAbroad: on }).where(eq(studio.id, actor.studioId));
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'studio.reverse_charge_changed',
		entity: 'studio',
		entityId: actor.studioId,
		data: { reverseChargeAbroad: { from: before.reverseChargeAbroad, to: on } },
		ip: actor.ip
	});
	return true;
}

/** Saves one surcharge rule; false when there is no such rule. */
export async function updateSurcharge(actor: Actor, id: string, values: SurchargeValues): Promise<boolean> {
	const [before] = await db
		.select()
		.from(surchargeRule)
		.where(and(eq(surchargeRule.studioId, actor.studioId), eq(surchargeRule.id, id)));
	if (!before) return false;
	const diff = changes(before, values);
	if (Object.keys(diff).length === 0) return true;
	await db
		.update(surchargeRule)
		.set(values)
		.where(and(eq(surchargeRule.studioId, actor.studioId), eq(surchargeRule.id, id)));
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'surcharge.changed',
		entity: 'surcharge_rule',
		entityId: id,
		data: diff,
		ip: actor.ip
	});
	return true;
}

export async function addSurcharge(actor: Actor, values: SurchargeValues): Promise<SurchargeRow> {
	const [row] = await db
		.insert(surchargeRule)
		.values({
			...values,
			studioId: actor.studioId,
			sortOrder: sql`(select coalesce(max(${surchargeRule.sortOrder}), 0) + 1 from ${surchargeRule} where ${surchargeRule.studioId} = ${actor.studioId})`
		})
		.returning();
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'surcharge.added',
		entity: 'surcharge_rule',
		entityId: row!.id,
		data: values,
		ip: actor.ip
	});
	return row!;
}

/** What the reminder e-mails block of the settings page changes. */
export interface ReminderValues {
	/** Hours before a session, from REMINDER_CHOICES ($lib/domain/messages). */
	reminderHours: number[];
	directions: string;
	loadInNotes: string;
}

/**
 * Saves when reminders go out and what they say about getting there and loading in; returns the
 * names of the fields that changed. Bookings already planned follow on their own: the messages
 * sweep plans a newly chosen reminder for upcoming sessions, and one no longer chosen is not sent
 * (it is checked again at its time).
 */
export async function updateReminders(actor: Actor, values: ReminderValues): Promise<string[]> {
	const before = await getStudio(actor.studioId);
	const diff = changes(before, values);
	const changed = Object.keys(diff);
	if (changed.length === 0) return [];
	await db.update(studio).set(values).where(eq(studio.id, actor.studioId));
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'studio.reminders_changed',
		entity: 'studio',
		entityId: actor.studioId,
		data: diff,
		ip: actor.ip
	});
	return changed;
}

/** The moving policy for artists ($lib/domain/move.ts): free with freeHours' notice, for fee down to minHours, not closer. */
export interface MovePolicyValues {
	freeHours: number;
	minHours: number;
	/** Minor units of the studio's currency. */
	fee: number;
}

const MAX_MOVE_HOURS = 24 * 365;

/** The moving policy as typed on the rates & policy page: field messages, or the values. */
export function readMovePolicy(
	input: { freeHours: string; minHours: string; fee: string },
	currency: string
): { ok: true; values: MovePolicyValues } | { ok: false; fields: Record<string, string> } {
	const fields: Record<string, string> = {};
	const hours = (text: string, key: string) => {
		const n = /^\d{1,5}$/.test(text.trim()) ? Number(text.trim()) : NaN;
		if (!Number.isInteger(n) || n > MAX_MOVE_HOURS) fields[key] = `Whole hours from 0 to ${MAX_MOVE_HOURS}.`;
		return n;
	};
	const freeHours = hours(input.freeHours, 'freeHours');
	const minHours = hours(input.minHours, 'minHours');
	const fee = parseMoney(input.fee || '0', currency);
	if (!fee.ok) fields.fee = 'An amount such as 25 or 25.50, or 0 for none.';
	if (!fields.freeHours && !fields.minHours && minHours > freeHours)
		fields.minHours = 'The shortest notice cannot be longer than the notice for a free move.';
	if (Object.keys(fields).length || !fee.ok) return { ok: false, fields };
	return { ok: true, values: { freeHours, minHours, fee: fee.value } };
}

/** Saves the moving policy; returns whether anything changed. Bookings already moved keep what they paid. */
export async function setMovePolicy(actor: Actor, values: MovePolicyValues): Promise<boolean> {
	const before = await getStudio(actor.studioId);
	const from = { freeHours: before.moveFreeHours, minHours: before.moveMinHours, fee: before.moveFee };
	if (from.freeHours === values.freeHours && from.minHours === values.minHours && from.fee === values.fee) return false;
	await db
		.update(studio)
		.set({ moveFreeHours: values.freeHours, moveMinHours: values.minHours, moveFee: values.fee })
		.where(eq(studio.id, actor.studioId));
	await audit({
		studioId: actor.studioId,
		actorId: actor.user.id,
		action: 'studio.move_policy_changed',
		entity: 'studio',
		entityId: actor.studioId,
		data: { from, to: values },
		ip: actor.ip
	});
	return true;
}

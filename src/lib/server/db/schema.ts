// Slateroom's data model. Money columns are integers of minor units (bigint where sums may grow);
// times are timestamptz instants, turned into the studio's zone only at the edges.
// The exclusion constraints that keep a room, an engineer or a piece of gear out of two bookings
// at once live in a hand-written migration (drizzle/0001_booking_exclusions.sql): Drizzle has no
// builder for EXCLUDE constraints.
import { sql } from 'drizzle-orm';
import {
	pgTable,
	text,
	integer,
	bigint,
	boolean,
	timestamp,
	date,
	jsonb,
	uuid,
	uniqueIndex,
	index,
	primaryKey,
	check,
	serial,
	foreignKey,
	unique
} from 'drizzle-orm/pg-core';
import { organization, user } from './auth-schema';
import type { CancellationRung, OpeningHours } from '$lib/domain/types';
import type { BillingDetails } from '$lib/domain/billing';
// A relative import: drizzle-kit and the scripts load this file without SvelteKit's aliases.
import { BOOKING_STATUSES, type BookingStatus } from '../../domain/lifecycle';

export * from './auth-schema';

const ts = (name: string) => timestamp(name, { withTimezone: true });
const money = (name: string) => bigint(name, { mode: 'number' });
const created = () => ts('created_at').defaultNow().notNull();
/** The studio a row belongs to. Every table of a studio's data carries it. */
const studioId = () =>
	text('studio_id')
		.notNull()
		.references(() => studio.id);
const updated = () =>
	ts('updated_at')
		.defaultNow()
		.$onUpdate(() => new Date())
		.notNull();

/**
 * A studio's settings: identity, tax, time and the booking policy. Its id is its organization's
 * (better-auth's organization plugin keeps the name, short name and team).
 */
export const studio = pgTable(
	'studio',
	{
		id: text('id')
			.primaryKey()
			.references(() => organization.id),
		name: text('name').notNull(),
		/** Seen by anyone outside the team only once published. */
		published: boolean('published').notNull().default(false),
		tagline: text('tagline').notNull().default(''),
		description: text('description').notNull().default(''),
		/** The postal address as EN 16931 asks for it (BT-35, BT-38, BT-37) and the country (BT-40, ISO 3166-1 alpha-2). */
		street: text('street').notNull().default(''),
		postalCode: text('postal_code').notNull().default(''),
		city: text('city').notNull().default(''),
		country: text('country').notNull(),
		/** Two to four capitals that open the studio's booking references: HP-7K3Q-XM2P. */
		referencePrefix: text('reference_prefix').notNull(),
		/** The set-up steps the owner has finished (src/lib/domain/setup.ts names them). */
		setupDone: text('setup_done')
			.array()
			.notNull()
			.default(sql`'{}'::text[]`),
		email: text('email').notNull(),
		vatId: text('vat_id').notNull().default(''),
		timeZone: text('time_zone').notNull(),
		currency: text('currency').notNull(),
		locale: text('locale').notNull().default('en-GB'),
		vatRateBp: integer('vat_rate_bp').notNull(),
		pricesIncludeVat: boolean('prices_include_vat').notNull(),
		halfDayMinutes: integer('half_day_minutes').notNull().default(240),
		fullDayMinutes: integer('full_day_minutes').notNull().default(480),
		minBookingMinutes: integer('min_booking_minutes').notNull(),
		incrementMinutes: integer('increment_minutes').notNull(),
		turnaroundMinutes: integer('turnaround_minutes').notNull(),
		minNoticeMinutes: integer('min_notice_minutes').notNull(),
		horizonDays: integer('horizon_days').notNull(),
		holdMinutes: integer('hold_minutes').notNull(),
		depositBp: integer('deposit_bp').notNull(),
		depositMinimum: money('deposit_minimum').notNull(),
		overtimeIncrementMinutes: integer('overtime_increment_minutes').notNull(),
		engineerHourly: money('engineer_hourly').notNull(),
		engineerHalfDay: money('engineer_half_day').notNull(),
		engineerFullDay: money('engineer_full_day').notNull(),
		closedOnPublicHolidays: boolean('closed_on_public_holidays').notNull().default(false),
		openingHours: jsonb('opening_hours').$type<OpeningHours[]>().notNull(),
		cancellation: jsonb('cancellation').$type<CancellationRung[]>().notNull(),
		/**
		 * Business buyers in another EU member state pay no VAT here; they account for it (reverse
		 * charge, Directive 2006/112/EC Articles 44 and 196; EN 16931 category AE). Off by default.
		 */
		reverseChargeAbroad: boolean('reverse_charge_abroad').notNull().default(false),
		/** The studio's own Stripe account (Connect, direct charges): deposits and refunds run on it. */
		stripeAccountId: text('stripe_account_id').unique(),
		/** From the account's last `account.updated`: whether it may take charges and pay out now. */
		chargesEnabled: boolean('charges_enabled').notNull().default(false),
		payoutsEnabled: boolean('payouts_enabled').notNull().default(false),
		detailsSubmitted: boolean('details_submitted').notNull().default(false),
		/** The account's `requirements.currently_due`: what the owner still has to give. */
		accountRequirements: text('account_requirements')
			.array()
			.notNull()
			.default(sql`'{}'::text[]`),
		/** `created` of the account event last applied, so an older event arriving late changes nothing. */
		accountEventAt: ts('account_event_at'),
		/** The platform's fee on each charge, in basis points of the amount (application_fee_amount). */
		platformFeeBp: integer('platform_fee_bp').notNull().default(0),
		/** How to find the studio and where to park, and how gear comes in: sent with each reminder. */
		directions: text('directions').notNull().default(''),
		loadInNotes: text('load_in_notes').notNull().default(''),
		/** Hours before each session that a reminder goes to the artist (7 days and 48 hours unless the studio says otherwise). */
		reminderHours: integer('reminder_hours')
			.array()
			.notNull()
			.default(sql`'{168,48}'::integer[]`),
		/**
		 * The moving policy for artists (the owner moves any booking): free with at least
		 * move_free_hours' notice, for move_fee between that and move_min_hours, not at all closer.
		 */
		moveFreeHours: integer('move_free_hours').notNull().default(168),
		moveMinHours: integer('move_min_hours').notNull().default(48),
		moveFee: money('move_fee').notNull().default(0),
		updatedAt: updated()
	},
	(t) => [
		check('studio_reference_prefix_shape', sql`${t.referencePrefix} ~ '^[A-Z]{2,4}$'`),
		check('studio_platform_fee_range', sql`${t.platformFeeBp} between 0 and 10000`),
		check('studio_move_policy', sql`${t.moveMinHours} >= 0 and ${t.moveFreeHours} >= ${t.moveMinHours} and ${t.moveFee} >= 0`)
	]
);

export const surchargeRule = pgTable(
	'surcharge_rule',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		label: text('label').notNull(),
		/** 'window' (weekdays and a local time span) or 'holiday' (the country's public holidays). */
		kind: text('kind').notNull(),
		percentBp: integer('percent_bp').notNull(),
		weekdays: integer('weekdays')
			.array()
			.notNull()
			.default(sql`'{}'::int[]`),
		fromMinute: integer('from_minute').notNull().default(0),
		toMinute: integer('to_minute').notNull().default(1440),
		active: boolean('active').notNull().default(true),
		sortOrder: integer('sort_order').notNull().default(0)
	},
	(t) => [index('surcharge_rule_studio_idx').on(t.studioId, t.sortOrder)]
);

export const room = pgTable(
	'room',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		slug: text('slug').notNull(),
		name: text('name').notNull(),
		description: text('description').notNull().default(''),
		capacity: integer('capacity').notNull().default(1),
		hourly: money('hourly').notNull(),
		halfDay: money('half_day').notNull(),
		fullDay: money('full_day').notNull(),
		sortOrder: integer('sort_order').notNull().default(0),
		active: boolean('active').notNull().default(true),
		createdAt: created(),
		updatedAt: updated()
	},
	(t) => [
		unique('room_studio_id_key').on(t.studioId, t.id),
		uniqueIndex('room_studio_slug_idx').on(t.studioId, t.slug),
		check('room_rates_non_negative', sql`${t.hourly} >= 0 and ${t.halfDay} >= 0 and ${t.fullDay} >= 0`)
	]
);

/** Days the studio is closed: one day or a range of local dates, both ends included. */
export const blackout = pgTable(
	'blackout',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		startsOn: date('starts_on').notNull(),
		endsOn: date('ends_on').notNull(),
		reason: text('reason').notNull().default(''),
		createdBy: text('created_by').references(() => user.id, { onDelete: 'set null' }),
		createdAt: created()
	},
	(t) => [index('blackout_studio_idx').on(t.studioId, t.startsOn), check('blackout_range', sql`${t.endsOn} >= ${t.startsOn}`)]
);

export const gearItem = pgTable(
	'gear_item',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		name: text('name').notNull(),
		/** A category such as 'microphone', 'preamp', 'compressor', 'instrument', 'monitoring'. */
		category: text('category').notNull(),
		description: text('description').notNull().default(''),
		homeRoomId: uuid('home_room_id'),
		hireFee: money('hire_fee').notNull().default(0),
		hireable: boolean('hireable').notNull().default(false),
		notes: text('notes').notNull().default(''),
		/** Safety notes shown wherever the item is planned (phantom power, weight, mains). */
		caution: text('caution').notNull().default(''),
		active: boolean('active').notNull().default(true),
		createdAt: created(),
		updatedAt: updated()
	},
	(t) => [
		unique('gear_item_studio_id_key').on(t.studioId, t.id),
		index('gear_item_studio_idx').on(t.studioId, t.category),
		// A gear item's home is a room of its own studio. Removing the room only clears the home
		// (PostgreSQL 15's ON DELETE SET NULL with a column list, in the migration).
		foreignKey({ name: 'gear_item_home_room_fk', columns: [t.studioId, t.homeRoomId], foreignColumns: [room.studioId, room.id] }),
		check('gear_fee_non_negative', sql`${t.hireFee} >= 0`)
	]
);

// A booking's statuses and their moves are the domain's (src/lib/domain/lifecycle.ts). A hold keeps its
// slot until hold_expires_at; expired and cancelled free it.
export { BOOKING_STATUSES, type BookingStatus };

export const booking = pgTable(
	'booking',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		/** Short reference shown to people, e.g. "7K3Q-XM2P". */
		reference: text('reference').notNull(),
		roomId: uuid('room_id').notNull(),
		/** The engineer: a member of the studio's team when booked (a trigger checks), kept after they leave. */
		engineerId: text('engineer_id').references(() => user.id),
		artistId: text('artist_id')
			.notNull()
			.references(() => user.id),
		startsAt: ts('starts_at').notNull(),
		endsAt: ts('ends_at').notNull(),
		/** endsAt plus the studio's turnaround at booking time: what the room is kept for. */
		busyUntil: ts('busy_until').notNull(),
		status: text('status').$type<BookingStatus>().notNull().default('held'),
		holdExpiresAt: ts('hold_expires_at'),
		project: text('project').notNull().default(''),
		notes: text('notes').notNull().default(''),
		/** The quote as computed when booked; later rate changes never alter it. */
		quote: jsonb('quote').notNull(),
		currency: text('currency').notNull(),
		total: money('total').notNull(),
		deposit: money('deposit').notNull(),
		actualEndsAt: ts('actual_ends_at'),
		cancelledAt: ts('cancelled_at'),
		cancelledBy: text('cancelled_by').references(() => user.id),
		cancelReason: text('cancel_reason'),
		/** RFC 5545 SEQUENCE: rises each time the booking is moved. */
		sequence: integer('sequence').notNull().default(0),
		/** When the owner recorded that nobody came (status no_show), and who did. */
		noShowAt: ts('no_show_at'),
		noShowBy: text('no_show_by').references(() => user.id),
		/** The buyer chosen at booking; null: the artist's name alone (documents issued earlier keep theirs). */
		billing: jsonb('billing').$type<BillingDetails>(),
		createdAt: created(),
		updatedAt: updated()
	},
	(t) => [
		unique('booking_studio_id_key').on(t.studioId, t.id),
		uniqueIndex('booking_studio_reference_idx').on(t.studioId, t.reference),
		foreignKey({ name: 'booking_room_fk', columns: [t.studioId, t.roomId], foreignColumns: [room.studioId, room.id] }),
		index('booking_studio_time_idx').on(t.studioId, t.startsAt),
		index('booking_room_time_idx').on(t.studioId, t.roomId, t.startsAt),
		index('booking_artist_idx').on(t.artistId, t.startsAt),
		index('booking_status_idx').on(t.status, t.holdExpiresAt),
		check('booking_times', sql`${t.endsAt} > ${t.startsAt} and ${t.busyUntil} >= ${t.endsAt}`),
		check('booking_status_known', sql`${t.status} in (${sql.raw(BOOKING_STATUSES.map((s) => `'${s}'`).join(','))})`),
		check('booking_money', sql`${t.total} >= 0 and ${t.deposit} >= 0 and ${t.deposit} <= ${t.total}`)
	]
);

/** Gear on a booking. Times and activity are copied from the booking by trigger for the gear exclusion. */
export const bookingGear = pgTable(
	'booking_gear',
	{
		studioId: studioId(),
		bookingId: uuid('booking_id').notNull(),
		gearItemId: uuid('gear_item_id').notNull(),
		hireFee: money('hire_fee').notNull().default(0),
		startsAt: ts('starts_at').notNull(),
		busyUntil: ts('busy_until').notNull(),
		active: boolean('active').notNull().default(true)
	},
	(t) => [
		primaryKey({ columns: [t.bookingId, t.gearItemId] }),
		foreignKey({
			name: 'booking_gear_booking_fk',
			columns: [t.studioId, t.bookingId],
			foreignColumns: [booking.studioId, booking.id]
		}).onDelete('cascade'),
		foreignKey({
			name: 'booking_gear_item_fk',
			columns: [t.studioId, t.gearItemId],
			foreignColumns: [gearItem.studioId, gearItem.id]
		})
	]
);

/** One source on a recall sheet: how it was captured, so the sound can be rebuilt. */
export interface RecallChannel {
	source: string;
	microphone: string;
	pattern?: string;
	placement?: string;
	preampGainDb?: number | null;
	pad?: boolean;
	highPassHz?: number | null;
	phantom?: boolean;
	eq?: string;
	compressor?: string;
	routing?: string;
	notes?: string;
}

export const recallSheet = pgTable(
	'recall_sheet',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		bookingId: uuid('booking_id').notNull(),
		artistId: text('artist_id')
			.notNull()
			.references(() => user.id),
		authorId: text('author_id').references(() => user.id),
		channels: jsonb('channels')
			.$type<RecallChannel[]>()
			.notNull()
			.default(sql`'[]'::jsonb`),
		notes: text('notes').notNull().default(''),
		createdAt: created(),
		updatedAt: updated()
	},
	(t) => [
		uniqueIndex('recall_sheet_booking_idx').on(t.bookingId),
		foreignKey({
			name: 'recall_sheet_booking_fk',
			columns: [t.studioId, t.bookingId],
			foreignColumns: [booking.studioId, booking.id]
		}).onDelete('cascade'),
		index('recall_sheet_artist_idx').on(t.studioId, t.artistId)
	]
);

export const payment = pgTable(
	'payment',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		bookingId: uuid('booking_id').notNull(),
		/** 'deposit', 'balance', or 'move' (what a move to a dearer time adds to the deposit). */
		kind: text('kind').notNull(),
		amount: money('amount').notNull(),
		currency: text('currency').notNull(),
		/** 'open' (checkout started), 'processing', 'paid', 'failed', 'expired'. */
		status: text('status').notNull().default('open'),
		checkoutSessionId: text('checkout_session_id').unique(),
		checkoutUrl: text('checkout_url'),
		paymentIntentId: text('payment_intent_id'),
		paidAt: ts('paid_at'),
		/** Checkout attempt of this booking and kind: part of the Stripe Idempotency-Key. */
		attempt: integer('attempt').notNull().default(1),
		/** The Checkout Session's expires_at, fixed when the row is made so a retried create sends the same params. */
		expiresAt: ts('expires_at'),
		failureReason: text('failure_reason'),
		/** When the payments job last asked Stripe about this checkout (it backs off from there). */
		lastCheckedAt: ts('last_checked_at'),
		/**
		 * Set when the booking is cancelled while this deposit is still on its way (a delayed
		 * method): how much of it goes back if it arrives, by the ladder at the cancellation.
		 */
		refundOnArrival: money('refund_on_arrival'),
		/** The connected account the Checkout Session was made on; null: the platform's own (before Connect). */
		stripeAccountId: text('stripe_account_id'),
		/** The platform's fee asked on this charge (application_fee_amount), minor units. */
		applicationFee: money('application_fee').notNull().default(0),
		createdAt: created(),
		updatedAt: updated()
	},
	(t) => [
		unique('payment_studio_id_key').on(t.studioId, t.id),
		foreignKey({
			name: 'payment_booking_fk',
			columns: [t.studioId, t.bookingId],
			foreignColumns: [booking.studioId, booking.id]
		}),
		index('payment_booking_idx').on(t.bookingId),
		uniqueIndex('payment_booking_kind_attempt_idx').on(t.bookingId, t.kind, t.attempt),
		index('payment_status_idx').on(t.status),
		check('payment_amount', sql`${t.amount} > 0`),
		check('payment_kind_known', sql`${t.kind} in ('deposit','balance','move')`),
		check('payment_status_known', sql`${t.status} in ('open','processing','paid','failed','expired')`)
	]
);

export const refund = pgTable(
	'refund',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		bookingId: uuid('booking_id').notNull(),
		paymentId: uuid('payment_id'),
		amount: money('amount').notNull(),
		currency: text('currency').notNull(),
		/** 'pending', 'succeeded', 'failed'. */
		status: text('status').notNull().default('pending'),
		stripeRefundId: text('stripe_refund_id').unique(),
		failureReason: text('failure_reason'),
		/**
		 * Why the money goes back: 'cancellation' (the policy's refund), 'slot_unavailable' (a late
		 * deposit for a slot that was freed and taken), 'cancelled_before_payment', 'duplicate'.
		 */
		reason: text('reason').notNull().default('cancellation'),
		/** Sent as Stripe's Idempotency-Key: a double click or a retry makes one refund. */
		idempotencyKey: text('idempotency_key').unique(),
		requestedBy: text('requested_by').references(() => user.id),
		/** When the refund request reached Stripe (null: not sent yet; the payments job retries). */
		sentAt: ts('sent_at'),
		/** The connected account the refund is made on (its payment's); null: the platform's own. */
		stripeAccountId: text('stripe_account_id'),
		createdAt: created(),
		updatedAt: updated()
	},
	(t) => [
		unique('refund_studio_id_key').on(t.studioId, t.id),
		foreignKey({ name: 'refund_booking_fk', columns: [t.studioId, t.bookingId], foreignColumns: [booking.studioId, booking.id] }),
		foreignKey({ name: 'refund_payment_fk', columns: [t.studioId, t.paymentId], foreignColumns: [payment.studioId, payment.id] }),
		index('refund_booking_idx').on(t.bookingId),
		index('refund_status_idx').on(t.status),
		check('refund_amount', sql`${t.amount} >= 0`),
		check('refund_status_known', sql`${t.status} in ('pending','succeeded','failed')`)
	]
);

/**
 * A payment the owner took outside Checkout (cash or bank transfer). Never edited or deleted (a
 * trigger refuses both): a mistake is reversed by a negative entry that names the one it reverses
 * and why.
 */
export const recordedPayment = pgTable(
	'recorded_payment',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		bookingId: uuid('booking_id').notNull(),
		/** Minor units; negative only on a reversal. */
		amount: money('amount').notNull(),
		currency: text('currency').notNull(),
		/** 'cash' or 'bank_transfer'. */
		method: text('method').notNull(),
		/** The day the money changed hands, in the studio's calendar. */
		paidOn: date('paid_on').notNull(),
		note: text('note').notNull().default(''),
		/** On a reversal: the entry it reverses (each at most once) and why. */
		reversesId: uuid('reverses_id'),
		reason: text('reason'),
		recordedBy: text('recorded_by').references(() => user.id),
		createdAt: created()
	},
	(t) => [
		unique('recorded_payment_studio_id_key').on(t.studioId, t.id),
		foreignKey({
			name: 'recorded_payment_booking_fk',
			columns: [t.studioId, t.bookingId],
			foreignColumns: [booking.studioId, booking.id]
		}),
		foreignKey({
			name: 'recorded_payment_reverses_fk',
			columns: [t.studioId, t.reversesId],
			foreignColumns: [t.studioId, t.id]
		}),
		uniqueIndex('recorded_payment_reverses_idx').on(t.reversesId),
		index('recorded_payment_booking_idx').on(t.bookingId),
		index('recorded_payment_studio_paid_idx').on(t.studioId, t.paidOn),
		check('recorded_payment_method_known', sql`${t.method} in ('cash','bank_transfer')`),
		check(
			'recorded_payment_sign',
			sql`(${t.amount} > 0 and ${t.reversesId} is null and ${t.reason} is null) or (${t.amount} < 0 and ${t.reversesId} is not null and ${t.reason} is not null and ${t.reason} <> '')`
		)
	]
);

/**
 * A move of a booking to another time, room, engineer or gear. A move that costs more waits for
 * its payment ('awaiting_payment', the old slot stays the booking's until then); one that costs the
 * same or less is applied at once. The booking row is changed in the same transaction that marks
 * the move applied.
 */
export const bookingMove = pgTable(
	'booking_move',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		bookingId: uuid('booking_id').notNull(),
		fromStartsAt: ts('from_starts_at').notNull(),
		fromEndsAt: ts('from_ends_at').notNull(),
		fromRoomId: uuid('from_room_id').notNull(),
		fromEngineerId: text('from_engineer_id'),
		fromGearIds: uuid('from_gear_ids').array().notNull(),
		toStartsAt: ts('to_starts_at').notNull(),
		toEndsAt: ts('to_ends_at').notNull(),
		toBusyUntil: ts('to_busy_until').notNull(),
		toRoomId: uuid('to_room_id').notNull(),
		toEngineerId: text('to_engineer_id'),
		toGearIds: uuid('to_gear_ids').array().notNull(),
		/** The quote of the new time at the booking's own rate card, and the totals before and after. */
		quote: jsonb('quote').notNull(),
		oldTotal: money('old_total').notNull(),
		newTotal: money('new_total').notNull(),
		oldDeposit: money('old_deposit').notNull(),
		newDeposit: money('new_deposit').notNull(),
		/** The moving policy's fee for this move (0 when free or moved by the owner). */
		fee: money('fee').notNull().default(0),
		/** What the artist pays now (> 0) or gets back (< 0 before the refund ladder) to settle it. */
		settlement: money('settlement').notNull(),
		/** 'awaiting_payment', 'applied', 'cancelled' (given up, or the new slot was taken before payment). */
		status: text('status').notNull(),
		paymentId: uuid('payment_id'),
		refundId: uuid('refund_id'),
		requestedBy: text('requested_by').references(() => user.id),
		createdAt: created(),
		appliedAt: ts('applied_at')
	},
	(t) => [
		foreignKey({
			name: 'booking_move_booking_fk',
			columns: [t.studioId, t.bookingId],
			foreignColumns: [booking.studioId, booking.id]
		}),
		index('booking_move_booking_idx').on(t.bookingId, t.createdAt),
		// At most one move waits for its payment per booking.
		uniqueIndex('booking_move_one_waiting_idx')
			.on(t.bookingId)
			.where(sql`${t.status} = 'awaiting_payment'`),
		check('booking_move_status_known', sql`${t.status} in ('awaiting_payment','applied','cancelled')`),
		check('booking_move_times', sql`${t.toEndsAt} > ${t.toStartsAt} and ${t.toBusyUntil} >= ${t.toEndsAt}`)
	]
);

/**
 * An e-mail a booking has coming or has had: reminders before the session, the balance request
 * after it, a receipt for each payment. Sent once through the outbox by a pg-boss job at due_at;
 * a move changes due_at, a cancellation sets cancelled_at.
 */
export const scheduledMessage = pgTable(
	'scheduled_message',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		bookingId: uuid('booking_id').notNull(),
		/** 'reminder', 'balance_request' or 'receipt'. */
		kind: text('kind').notNull(),
		/** Tells apart messages of one kind: 'reminder:168', 'receipt:<payment id>'. */
		key: text('key').notNull(),
		dueAt: ts('due_at').notNull(),
		sentAt: ts('sent_at'),
		cancelledAt: ts('cancelled_at'),
		createdAt: created()
	},
	(t) => [
		foreignKey({
			name: 'scheduled_message_booking_fk',
			columns: [t.studioId, t.bookingId],
			foreignColumns: [booking.studioId, booking.id]
		}).onDelete('cascade'),
		uniqueIndex('scheduled_message_booking_key_idx').on(t.bookingId, t.key),
		index('scheduled_message_due_idx')
			.on(t.dueAt)
			.where(sql`${t.sentAt} is null and ${t.cancelledAt} is null`),
		check('scheduled_message_kind_known', sql`${t.kind} in ('reminder','balance_request','receipt')`)
	]
);

/** Each Stripe event id is handled once (deliveries are at least once). */
export const stripeEvent = pgTable('stripe_event', {
	id: text('id').primaryKey(),
	type: text('type').notNull(),
	/** The connected account a Connect event came from; null for the platform's own events. */
	account: text('account'),
	receivedAt: created(),
	processedAt: ts('processed_at')
});

/** Next number per studio, invoice series and year, taken under a row lock so numbers have no gaps. */
export const invoiceCounter = pgTable(
	'invoice_counter',
	{
		studioId: studioId(),
		series: text('series').notNull(),
		year: integer('year').notNull(),
		lastNumber: integer('last_number').notNull().default(0)
	},
	(t) => [primaryKey({ columns: [t.studioId, t.series, t.year] })]
);

export interface VatBreakdownRow {
	rateBp: number;
	base: number;
	amount: number;
	/** EN 16931 BT-118 when the rate does not say it: 'AE', reverse charge ($lib/domain/invoice vatCategoryOf). */
	category?: 'AE';
}

export const invoice = pgTable(
	'invoice',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		series: text('series').notNull(),
		year: integer('year').notNull(),
		number: integer('number').notNull(),
		/** e.g. "INV-2027-0001". */
		displayNumber: text('display_number').notNull(),
		/** UNTDID 1001: 386 prepayment (deposit) invoice, 380 invoice, 381 credit note. */
		typeCode: integer('type_code').notNull(),
		bookingId: uuid('booking_id'),
		/** EN 16931 BT-25: the invoice a credit note corrects, or the deposit invoice a final invoice deducts. */
		precedingInvoiceId: uuid('preceding_invoice_id'),
		issuedAt: ts('issued_at').notNull(),
		supplyDate: date('supply_date'),
		supplier: jsonb('supplier').notNull(),
		customer: jsonb('customer').notNull(),
		currency: text('currency').notNull(),
		net: money('net').notNull(),
		vatTotal: money('vat_total').notNull(),
		gross: money('gross').notNull(),
		prepaid: money('prepaid').notNull().default(0),
		rounding: money('rounding').notNull().default(0),
		/** Line amounts are shown incl. VAT (a rate card with VAT in, or money received or refunded). */
		amountsIncludeVat: boolean('amounts_include_vat').notNull().default(true),
		amountDue: money('amount_due').notNull(),
		vatBreakdown: jsonb('vat_breakdown').$type<VatBreakdownRow[]>().notNull(),
		/** On a final invoice: the VAT breakdown of the deposit invoice it deducts (already declared there). */
		prepaidVatBreakdown: jsonb('prepaid_vat_breakdown')
			.$type<VatBreakdownRow[]>()
			.notNull()
			.default(sql`'[]'::jsonb`),
		/** BT-106 sum of line nets and BT-109 taxable total, kept as issued. */
		lineNetTotal: money('line_net_total').notNull().default(0),
		/** One document per business fact: 'deposit:<payment id>', 'final:<booking id>', 'credit:<refund id>'. */
		sourceKey: text('source_key').unique(),
		paymentId: uuid('payment_id'),
		refundId: uuid('refund_id'),
		note: text('note').notNull().default(''),
		createdAt: created()
	},
	(t) => [
		unique('invoice_studio_id_key').on(t.studioId, t.id),
		uniqueIndex('invoice_series_number_idx').on(t.studioId, t.series, t.year, t.number),
		uniqueIndex('invoice_display_number_idx').on(t.studioId, t.displayNumber),
		foreignKey({
			name: 'invoice_booking_fk',
			columns: [t.studioId, t.bookingId],
			foreignColumns: [booking.studioId, booking.id]
		}),
		foreignKey({
			name: 'invoice_preceding_fk',
			columns: [t.studioId, t.precedingInvoiceId],
			foreignColumns: [t.studioId, t.id]
		}),
		foreignKey({
			name: 'invoice_payment_fk',
			columns: [t.studioId, t.paymentId],
			foreignColumns: [payment.studioId, payment.id]
		}),
		foreignKey({ name: 'invoice_refund_fk', columns: [t.studioId, t.refundId], foreignColumns: [refund.studioId, refund.id] }),
		check('invoice_type_known', sql`${t.typeCode} in (380, 381, 386)`),
		check('invoice_number_positive', sql`${t.number} > 0`),
		index('invoice_issued_idx').on(t.studioId, t.issuedAt),
		index('invoice_booking_idx').on(t.bookingId)
	]
);

export const invoiceLine = pgTable(
	'invoice_line',
	{
		id: serial('id').primaryKey(),
		studioId: studioId(),
		invoiceId: uuid('invoice_id').notNull(),
		position: integer('position').notNull(),
		description: text('description').notNull(),
		quantity: text('quantity').notNull().default('1'),
		unitCode: text('unit_code').notNull().default('C62'),
		unitPriceNet: money('unit_price_net').notNull(),
		net: money('net').notNull(),
		vatRateBp: integer('vat_rate_bp').notNull(),
		/** 'room', 'engineer', 'surcharge', 'gear', 'overtime', 'deposit', 'refund'. */
		kind: text('kind').notNull().default(''),
		/** Price of one unit and the line amount as the rate card shows them (incl. VAT when prices include it). */
		unitAmount: money('unit_amount').notNull().default(0),
		amount: money('amount').notNull().default(0)
	},
	(t) => [
		uniqueIndex('invoice_line_position_idx').on(t.invoiceId, t.position),
		foreignKey({
			name: 'invoice_line_invoice_fk',
			columns: [t.studioId, t.invoiceId],
			foreignColumns: [invoice.studioId, invoice.id]
		}).onDelete('cascade')
	]
);

export const upload = pgTable(
	'upload',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		studioId: studioId(),
		bookingId: uuid('booking_id').notNull(),
		uploaderId: text('uploader_id')
			.notNull()
			.references(() => user.id),
		originalName: text('original_name').notNull(),
		/** Path chosen by the server under UPLOAD_DIR; never the client's name. */
		storageKey: text('storage_key').notNull().unique(),
		contentType: text('content_type').notNull(),
		sizeBytes: integer('size_bytes').notNull(),
		sha256: text('sha256').notNull(),
		createdAt: created()
	},
	(t) => [
		foreignKey({
			name: 'upload_booking_fk',
			columns: [t.studioId, t.bookingId],
			foreignColumns: [booking.studioId, booking.id]
		}).onDelete('cascade'),
		index('upload_booking_idx').on(t.bookingId)
	]
);

export const emailOutbox = pgTable(
	'email_outbox',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		/** The studio a message is from; none for the platform's own (sign-up, password). */
		studioId: text('studio_id').references(() => studio.id),
		/** Makes each message once, e.g. "booking-confirmed:<booking id>". */
		dedupeKey: text('dedupe_key').notNull().unique(),
		to: text('to').notNull(),
		subject: text('subject').notNull(),
		text: text('text').notNull(),
		html: text('html'),
		attachments: jsonb('attachments').$type<{ filename: string; contentType: string; content: string }[]>(),
		status: text('status').notNull().default('queued'),
		attempts: integer('attempts').notNull().default(0),
		lastError: text('last_error'),
		sentAt: ts('sent_at'),
		createdAt: created()
	},
	(t) => [index('email_outbox_status_idx').on(t.status, t.createdAt)]
);

export const auditLog = pgTable(
	'audit_log',
	{
		id: serial('id').primaryKey(),
		/** The studio whose data changed; none for the platform's own events. */
		studioId: text('studio_id'),
		actorId: text('actor_id'),
		action: text('action').notNull(),
		entity: text('entity').notNull().default(''),
		entityId: text('entity_id'),
		data: jsonb('data'),
		ip: text('ip'),
		createdAt: created()
	},
	(t) => [index('audit_log_created_idx').on(t.createdAt), index('audit_log_studio_idx').on(t.studioId, t.createdAt)]
);

/** A secret per person for the read-only calendar feed. */
export const calendarFeed = pgTable('calendar_feed', {
	userId: text('user_id')
		.primaryKey()
		.references(() => user.id, { onDelete: 'cascade' }),
	token: text('token').notNull().unique(),
	createdAt: created()
});

/** The billing details an artist keeps in their account (one set), offered when they book. */
export const billingDetails = pgTable(
	'billing_details',
	{
		userId: text('user_id')
			.primaryKey()
			.references(() => user.id, { onDelete: 'cascade' }),
		kind: text('kind').$type<BillingDetails['kind']>().notNull(),
		name: text('name').notNull(),
		street: text('street').notNull(),
		postalCode: text('postal_code').notNull(),
		city: text('city').notNull(),
		country: text('country').notNull(),
		vatId: text('vat_id').notNull().default(''),
		updatedAt: updated()
	},
	(t) => [
		check('billing_details_kind', sql`${t.kind} in ('person', 'organisation')`),
		check('billing_details_country', sql`${t.country} ~ '^[A-Z]{2}$'`),
		check('billing_details_vat_only_organisation', sql`${t.vatId} = '' or ${t.kind} = 'organisation'`)
	]
);

/**
 * Sign-in failures and sign-ups, counted per client address and account in the database so
 * that every app instance sees the same counts (src/lib/domain/sign-in-limits.ts has the rules).
 * kind 'sign_in': failures of one account from one address; kind 'sign_up': sign-ups from an
 * address (account ''). A row is deleted once it has expired.
 */
export const authLimit = pgTable(
	'auth_limit',
	{
		kind: text('kind').notNull(),
		address: text('address').notNull(),
		account: text('account').notNull().default(''),
		count: integer('count').notNull(),
		windowStartedAt: ts('window_started_at').notNull(),
		lastAt: ts('last_at').notNull(),
		expiresAt: ts('expires_at').notNull()
	},
	(t) => [
		primaryKey({ columns: [t.kind, t.address, t.account] }),
		index('auth_limit_expires_idx').on(t.expiresAt),
		check('auth_limit_kind', sql`${t.kind} in ('sign_in', 'sign_up')`)
	]
);

/**
 * The fake's state and its business rules: Checkout Sessions, PaymentIntents, Charges, Refunds and
 * Events. Every mutation is synchronous, so one request's check-then-act can never interleave with
 * another's (Node runs one handler at a time).
 */
import {
	type Charge,
	type CheckoutSession,
	type LineItem,
	type Metadata,
	type PaymentIntent,
	type Refund,
	type RequestContext,
	type StripeEvent,
	type StripeObject,
	DEFAULT_API_VERSION,
	NO_REQUEST,
	err,
	formatAmount,
	newId,
	randomToken
} from './objects.js';

export interface LineItemInput {
	name: string;
	description: string | null;
	currency: string;
	unitAmount: number;
	quantity: number;
	productMetadata: Metadata;
}

export interface CreateSessionInput {
	lineItems: LineItemInput[];
	currency: string;
	customerEmail: string | null;
	clientReferenceId: string | null;
	metadata: Metadata;
	successUrl: string | null;
	cancelUrl: string | null;
	expiresAt: number;
	locale: string | null;
	submitType: string | null;
	paymentMethodTypes: string[];
	paymentIntentData: {
		metadata: Metadata;
		description: string | null;
		receiptEmail: string | null;
	};
}

export interface CreateRefundInput {
	paymentIntentId: string | null;
	chargeId: string | null;
	amount: number | null;
	metadata: Metadata;
	reason: string | null;
}

export interface SessionRecord {
	session: CheckoutSession;
	lineItems: LineItem[];
	paymentIntentData: CreateSessionInput['paymentIntentData'];
}

export interface DeliveryRecord {
	eventId: string;
	type: string;
	attempt: number;
	/** 'initial' and 'retry' are automatic; 'resend' comes from /_control/events/:id/resend */
	kind: 'initial' | 'retry' | 'resend';
	url: string;
	statusCode: number | null;
	error: string | null;
	signature: 'valid' | 'bad';
	timestamp: number;
	at: string;
	durationMs: number;
}

export interface IdempotencyRecord {
	fingerprint: string;
	status: number;
	body: string;
	requestId: string;
	createdAtMs: number;
}

export interface RefundFailurePlan {
	failureReason: string;
	delayMs: number;
}

export type PayMethod = 'card' | 'decline' | 'delayed';

export interface StateOptions {
	now: () => number;
	publicUrl: string;
	apiVersion?: string;
	/** Called for every new event, after it is stored. */
	onEvent?: (event: StripeEvent) => void;
	/** Whether an event of this type goes to the webhook endpoint (sets pending_webhooks). */
	willDeliver?: (type: string) => boolean;
}

const IDEMPOTENCY_TTL_MS = 24 * 60 * 60 * 1000;

function clone<T>(value: T): T {
	return structuredClone(value);
}

export class StripeFakeState {
	readonly sessions = new Map<string, SessionRecord>();
	readonly paymentIntents = new Map<string, PaymentIntent>();
	readonly charges = new Map<string, Charge>();
	readonly refunds = new Map<string, Refund>();
	/** Oldest first. */
	readonly events: StripeEvent[] = [];
	readonly eventsById = new Map<string, StripeEvent>();
	/** Webhook delivery attempts, oldest first (written by the dispatcher). */
	readonly deliveries: DeliveryRecord[] = [];
	readonly idempotency = new Map<string, IdempotencyRecord>();
	nextRefundFailure: RefundFailurePlan | null = null;

	readonly apiVersion: string;
	private readonly timers = new Set<NodeJS.Timeout>();

	constructor(private readonly options: StateOptions) {
		this.apiVersion = options.apiVersion ?? DEFAULT_API_VERSION;
	}

	get publicUrl(): string {
		return this.options.publicUrl;
	}
	set publicUrl(url: string) {
		this.options.publicUrl = url;
	}

	nowMs(): number {
		return this.options.now();
	}
	nowSec(): number {
		return Math.floor(this.options.now() / 1000);
	}

	reset(): void {
		this.clearTimers();
		this.sessions.clear();
		this.paymentIntents.clear();
		this.charges.clear();
		this.refunds.clear();
		this.events.length = 0;
		this.eventsById.clear();
		this.deliveries.length = 0;
		this.idempotency.clear();
		this.nextRefundFailure = null;
	}

	clearTimers(): void {
		for (const t of this.timers) clearTimeout(t);
		this.timers.clear();
	}

	private later(ms: number, fn: () => void): void {
		const timer = setTimeout(() => {
			this.timers.delete(timer);
			fn();
		}, ms);
		this.timers.add(timer);
	}

	// ---- lookups ---------------------------------------------------------------------------

	/** Any stored object by id (used by `expand`). */
	findById(id: string): StripeObject | undefined {
		if (id.startsWith('cs_')) return this.getSessionRecord(id)?.session;
		if (id.startsWith('pi_')) return this.paymentIntents.get(id);
		if (id.startsWith('ch_')) return this.charges.get(id);
		if (id.startsWith('re_')) return this.refunds.get(id);
		if (id.startsWith('evt_')) return this.eventsById.get(id);
		return undefined;
	}

	/** A session, expiring it first if its expires_at has passed (as Stripe does on its own). */
	getSessionRecord(id: string): SessionRecord | undefined {
		const rec = this.sessions.get(id);
		if (rec && rec.session.status === 'open' && this.nowSec() >= rec.session.expires_at) {
			this.expire(rec, NO_REQUEST);
		}
		return rec;
	}

	requireSession(id: string): SessionRecord {
		const rec = this.getSessionRecord(id);
		if (!rec) throw err.noSuch('checkout.session', id);
		return rec;
	}

	// ---- events ----------------------------------------------------------------------------

	emit(type: string, object: StripeObject, ctx: RequestContext, previousAttributes?: Record<string, unknown>): StripeEvent {
		const event: StripeEvent = {
			id: newId('evt_'),
			object: 'event',
			api_version: this.apiVersion,
			created: this.nowSec(),
			data: previousAttributes
				? { object: clone(object), previous_attributes: clone(previousAttributes) }
				: { object: clone(object) },
			livemode: false,
			pending_webhooks: this.options.willDeliver?.(type) ? 1 : 0,
			request: { id: ctx.requestId, idempotency_key: ctx.idempotencyKey },
			type
		};
		this.events.push(event);
		this.eventsById.set(event.id, event);
		this.options.onEvent?.(event);
		return event;
	}

	// ---- Checkout Sessions -----------------------------------------------------------------

	createSession(input: CreateSessionInput): CheckoutSession {
		const created = this.nowSec();
		const id = newId('cs_test_', 58);
		const lineItems: LineItem[] = input.lineItems.map((li) => {
			const total = li.unitAmount * li.quantity;
			return {
				id: newId('li_'),
				object: 'item',
				amount_discount: 0,
				amount_subtotal: total,
				amount_tax: 0,
				amount_total: total,
				currency: li.currency,
				description: li.name,
				metadata: {},
				price: {
					id: newId('price_'),
					object: 'price',
					active: false,
					billing_scheme: 'per_unit',
					created,
					currency: li.currency,
					custom_unit_amount: null,
					livemode: false,
					lookup_key: null,
					metadata: {},
					nickname: null,
					product: newId('prod_', 14),
					recurring: null,
					tax_behavior: 'unspecified',
					tiers_mode: null,
					transform_quantity: null,
					type: 'one_time',
					unit_amount: li.unitAmount,
					unit_amount_decimal: String(li.unitAmount)
				},
				quantity: li.quantity
			};
		});
		const amount = lineItems.reduce((sum, li) => sum + li.amount_total, 0);
		const session: CheckoutSession = {
			id,
			object: 'checkout.session',
			after_expiration: null,
			allow_promotion_codes: null,
			amount_subtotal: amount,
			amount_total: amount,
			automatic_tax: { enabled: false, liability: null, provider: null, status: null },
			billing_address_collection: null,
			cancel_url: input.cancelUrl,
			client_reference_id: input.clientReferenceId,
			client_secret: null,
			created,
			currency: input.currency,
			custom_fields: [],
			customer: null,
			customer_creation: 'if_required',
			customer_details: null,
			customer_email: input.customerEmail,
			expires_at: input.expiresAt,
			invoice: null,
			livemode: false,
			locale: input.locale,
			metadata: input.metadata,
			mode: 'payment',
			payment_intent: null, // created when the customer confirms (API 2022-08-01 and later)
			payment_link: null,
			payment_method_collection: 'if_required',
			payment_method_types: input.paymentMethodTypes,
			payment_status: 'unpaid',
			recovered_from: null,
			setup_intent: null,
			shipping_address_collection: null,
			shipping_cost: null,
			shipping_options: [],
			status: 'open',
			submit_type: input.submitType,
			subscription: null,
			success_url: input.successUrl,
			total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
			ui_mode: 'hosted',
			url: `${this.publicUrl}/pay/${id}`
		};
		this.sessions.set(id, { session, lineItems, paymentIntentData: input.paymentIntentData });
		return session;
	}

	expireSession(id: string, ctx: RequestContext): CheckoutSession {
		const rec = this.requireSession(id);
		if (rec.session.status !== 'open') {
			throw err.state(
				`Only Checkout Sessions with a status in ["open"] can be expired. This session has status '${rec.session.status}'.`
			);
		}
		this.expire(rec, ctx);
		return rec.session;
	}

	private expire(rec: SessionRecord, ctx: RequestContext): void {
		const s = rec.session;
		s.status = 'expired';
		s.url = null;
		const pi = s.payment_intent ? this.paymentIntents.get(s.payment_intent) : undefined;
		if (pi && pi.status === 'requires_payment_method') {
			pi.status = 'canceled';
			pi.canceled_at = this.nowSec();
			pi.cancellation_reason = 'abandoned';
			this.emit('payment_intent.canceled', pi, ctx);
		}
		this.emit('checkout.session.expired', s, ctx);
	}

	/** Expires every open session whose expires_at has passed; prunes idempotency keys older than 24 h. */
	sweep(): void {
		for (const id of this.sessions.keys()) this.getSessionRecord(id);
		const cutoff = this.nowMs() - IDEMPOTENCY_TTL_MS;
		for (const [key, rec] of this.idempotency) if (rec.createdAtMs < cutoff) this.idempotency.delete(key);
	}

	/** What the pay page's buttons do. Throws when the session is not open. */
	pay(id: string, method: PayMethod, payerEmail: string | null, ctx: RequestContext = NO_REQUEST): SessionRecord {
		const rec = this.requireSession(id);
		const s = rec.session;
		if (s.status !== 'open') {
			throw err.state(`This Checkout Session is ${s.status}; it can no longer be paid.`, 'checkout_session_not_open');
		}
		const pi = this.ensurePaymentIntent(rec, ctx);
		const email = s.customer_email ?? payerEmail ?? 'payer@example.test';
		pi.payment_method = newId('pm_');
		if (method === 'decline') {
			const charge = this.newCharge(pi, 'failed', 'card', email);
			charge.failure_code = 'card_declined';
			charge.failure_message = 'Your card was declined.';
			charge.outcome = {
				network_status: 'declined_by_network',
				reason: 'generic_decline',
				risk_level: 'normal',
				seller_message: 'The bank did not return any further details with this decline.',
				type: 'issuer_declined'
			};
			pi.status = 'requires_payment_method';
			pi.latest_charge = charge.id;
			pi.last_payment_error = {
				type: 'card_error',
				code: 'card_declined',
				decline_code: 'generic_decline',
				message: 'Your card was declined.',
				charge: charge.id,
				doc_url: 'https://stripe.com/docs/error-codes/card-declined'
			};
			this.emit('charge.failed', charge, ctx);
			this.emit('payment_intent.payment_failed', pi, ctx);
			return rec;
		}
		const delayed = method === 'delayed';
		const charge = this.newCharge(pi, delayed ? 'pending' : 'succeeded', delayed ? 'sepa_debit' : 'card', email);
		pi.latest_charge = charge.id;
		pi.last_payment_error = null;
		pi.payment_method_types = [delayed ? 'sepa_debit' : 'card'];
		s.status = 'complete';
		s.url = null;
		s.customer_details = {
			address: null,
			email,
			name: null,
			phone: null,
			tax_exempt: 'none',
			tax_ids: []
		};
		if (delayed) {
			pi.status = 'processing';
			this.emit('charge.pending', charge, ctx);
			this.emit('payment_intent.processing', pi, ctx);
		} else {
			pi.status = 'succeeded';
			pi.amount_received = pi.amount;
			s.payment_status = 'paid';
			this.emit('charge.succeeded', charge, ctx);
			this.emit('payment_intent.succeeded', pi, ctx);
		}
		this.emit('checkout.session.completed', s, ctx);
		return rec;
	}

	/** Ends a delayed ("pay later") payment: the bank settles it or it fails. */
	settle(id: string, outcome: 'succeed' | 'fail', ctx: RequestContext = NO_REQUEST): SessionRecord {
		const rec = this.requireSession(id);
		const s = rec.session;
		const pi = s.payment_intent ? this.paymentIntents.get(s.payment_intent) : undefined;
		const charge = pi?.latest_charge ? this.charges.get(pi.latest_charge) : undefined;
		if (s.status !== 'complete' || s.payment_status !== 'unpaid' || !pi || pi.status !== 'processing' || !charge) {
			throw err.state(`Checkout Session ${id} has no delayed payment waiting to settle.`);
		}
		if (outcome === 'succeed') {
			charge.status = 'succeeded';
			charge.paid = true;
			charge.captured = true;
			charge.amount_captured = charge.amount;
			pi.status = 'succeeded';
			pi.amount_received = pi.amount;
			s.payment_status = 'paid';
			this.emit('charge.succeeded', charge, ctx);
			this.emit('payment_intent.succeeded', pi, ctx);
			this.emit('checkout.session.async_payment_succeeded', s, ctx);
		} else {
			charge.status = 'failed';
			charge.failure_code = 'insufficient_funds';
			charge.failure_message = 'The account has insufficient funds to cover this payment.';
			pi.status = 'requires_payment_method';
			pi.last_payment_error = {
				type: 'invalid_request_error',
				code: 'payment_method_provider_decline',
				message: 'The payment was declined by the bank.',
				charge: charge.id
			};
			this.emit('charge.failed', charge, ctx);
			this.emit('payment_intent.payment_failed', pi, ctx);
			this.emit('checkout.session.async_payment_failed', s, ctx);
		}
		return rec;
	}

	private ensurePaymentIntent(rec: SessionRecord, ctx: RequestContext): PaymentIntent {
		const s = rec.session;
		const existing = s.payment_intent ? this.paymentIntents.get(s.payment_intent) : undefined;
		if (existing) return existing;
		const id = newId('pi_');
		const pi: PaymentIntent = {
			id,
			object: 'payment_intent',
			amount: s.amount_total,
			amount_capturable: 0,
			amount_received: 0,
			application: null,
			application_fee_amount: null,
			automatic_payment_methods: null,
			canceled_at: null,
			cancellation_reason: null,
			capture_method: 'automatic_async',
			client_secret: `${id}_secret_${randomToken(25)}`,
			confirmation_method: 'automatic',
			created: this.nowSec(),
			currency: s.currency,
			customer: null,
			description: rec.paymentIntentData.description,
			last_payment_error: null,
			latest_charge: null,
			livemode: false,
			// Only payment_intent_data[metadata] reaches the PaymentIntent; the session's metadata does not.
			metadata: clone(rec.paymentIntentData.metadata),
			next_action: null,
			on_behalf_of: null,
			payment_method: null,
			payment_method_types: clone(s.payment_method_types),
			processing: null,
			receipt_email: rec.paymentIntentData.receiptEmail,
			review: null,
			setup_future_usage: null,
			shipping: null,
			statement_descriptor: null,
			statement_descriptor_suffix: null,
			status: 'requires_payment_method',
			transfer_data: null,
			transfer_group: null
		};
		this.paymentIntents.set(id, pi);
		s.payment_intent = id;
		this.emit('payment_intent.created', pi, ctx);
		return pi;
	}

	private newCharge(pi: PaymentIntent, status: Charge['status'], type: 'card' | 'sepa_debit', email: string): Charge {
		const succeeded = status === 'succeeded';
		const charge: Charge = {
			id: newId('ch_'),
			object: 'charge',
			amount: pi.amount,
			amount_captured: succeeded ? pi.amount : 0,
			amount_refunded: 0,
			balance_transaction: null,
			billing_details: { address: null, email, name: null, phone: null },
			captured: succeeded,
			created: this.nowSec(),
			currency: pi.currency,
			customer: null,
			description: pi.description,
			failure_code: null,
			failure_message: null,
			livemode: false,
			metadata: clone(pi.metadata), // a PaymentIntent's charges carry its metadata
			outcome: succeeded
				? {
						network_status: 'approved_by_network',
						reason: null,
						risk_level: 'normal',
						seller_message: 'Payment complete.',
						type: 'authorized'
					}
				: null,
			paid: succeeded,
			payment_intent: pi.id,
			payment_method: pi.payment_method ?? newId('pm_'),
			payment_method_details: { type },
			refunded: false,
			status
		};
		this.charges.set(charge.id, charge);
		return charge;
	}

	// ---- Refunds ---------------------------------------------------------------------------

	createRefund(input: CreateRefundInput, ctx: RequestContext): Refund {
		let charge: Charge | undefined;
		if (input.chargeId) {
			charge = this.charges.get(input.chargeId);
			if (!charge) throw err.noSuch('charge', input.chargeId, 'charge');
			if (input.paymentIntentId && charge.payment_intent !== input.paymentIntentId) {
				throw err.state(`Charge ${charge.id} does not belong to PaymentIntent ${input.paymentIntentId}.`);
			}
		} else if (input.paymentIntentId) {
			const pi = this.paymentIntents.get(input.paymentIntentId);
			if (!pi) throw err.noSuch('payment_intent', input.paymentIntentId, 'payment_intent');
			charge = pi.latest_charge ? this.charges.get(pi.latest_charge) : undefined;
			if (!charge || charge.status !== 'succeeded') {
				throw err.state(`This PaymentIntent (${pi.id}) does not have a successful charge to refund.`);
			}
		}
		if (!charge) throw err.missing('payment_intent');
		if (charge.status !== 'succeeded') {
			throw err.state(`Charge ${charge.id} has not succeeded and cannot be refunded.`);
		}
		const remaining = charge.amount - charge.amount_refunded;
		if (remaining <= 0) {
			throw err.state(`Charge ${charge.id} has already been refunded.`, 'charge_already_refunded');
		}
		const amount = input.amount ?? remaining;
		if (amount > remaining) {
			throw err.state(
				`Refund amount (${formatAmount(amount, charge.currency)}) is greater than unrefunded amount on charge (${formatAmount(remaining, charge.currency)})`,
				'amount_too_large',
				'amount'
			);
		}
		const failure = this.nextRefundFailure;
		this.nextRefundFailure = null;
		const refund: Refund = {
			id: newId('re_'),
			object: 'refund',
			amount,
			balance_transaction: null,
			charge: charge.id,
			created: this.nowSec(),
			currency: charge.currency,
			metadata: input.metadata,
			payment_intent: charge.payment_intent,
			reason: input.reason,
			receipt_number: null,
			source_transfer_reversal: null,
			status: failure ? 'pending' : 'succeeded',
			transfer_reversal: null
		};
		if (failure) refund.pending_reason = 'processing';
		this.refunds.set(refund.id, refund);
		// Pending and succeeded refunds both count against what is left to refund.
		charge.amount_refunded += amount;
		charge.refunded = charge.amount_refunded >= charge.amount;
		this.emit('refund.created', refund, ctx);
		if (failure) {
			this.later(failure.delayMs, () => this.failRefund(refund.id, failure.failureReason));
		} else {
			this.emit('charge.refunded', charge, ctx);
		}
		return refund;
	}

	private failRefund(id: string, failureReason: string): void {
		const refund = this.refunds.get(id);
		if (!refund || refund.status !== 'pending') return;
		refund.status = 'failed';
		refund.failure_reason = failureReason;
		delete refund.pending_reason;
		const charge = this.charges.get(refund.charge);
		if (charge) {
			charge.amount_refunded -= refund.amount; // the money goes back to the balance: refundable again
			charge.refunded = charge.amount_refunded >= charge.amount;
		}
		this.emit('refund.updated', refund, NO_REQUEST, {
			status: 'pending',
			pending_reason: 'processing'
		});
		this.emit('refund.failed', refund, NO_REQUEST);
	}
}

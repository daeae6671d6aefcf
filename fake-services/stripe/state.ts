/**
 * The fake's state and its business rules: Checkout Sessions, PaymentIntents, Charges, Refunds,
 * Events, and Connect's accounts, account links and application fees. Every mutation is
 * synchronous, so one request's check-then-act can never interleave with another's (Node runs one
 * handler at a time).
 *
 * Connect (direct charges): every object made under a `Stripe-Account` header belongs to that
 * account, and so do the objects that follow from it (a session's PaymentIntent, its charges,
 * refunds and events). A request sees only the objects of its own scope.
 */
import {
	type Account,
	type AccountLink,
	type AccountRequirements,
	type ApplicationFee,
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
		/** Only on a connected account's session (direct charge): the platform's cut, in minor units. */
		applicationFeeAmount: number | null;
	};
}

/**
 * Whose objects a call may see: a connected account's id (the Stripe-Account header), null for the
 * platform's own (no header), or ALL_ACCOUNTS for the test controls and the pay page, which see everything.
 */
export const ALL_ACCOUNTS: unique symbol = Symbol('all accounts');
export type Scope = string | null | typeof ALL_ACCOUNTS;

export interface CreateAccountInput {
	type: Account['type'];
	country: string;
	email: string | null;
	defaultCurrency: string | null;
	businessType: string | null;
	businessProfile: { name: string | null; url: string | null; mcc: string | null };
	metadata: Metadata;
}

/** What `PUT /_control/accounts/:id` sets. */
export interface PutAccountInput {
	country: string | null;
	email: string | null;
	defaultCurrency: string | null;
	businessName: string | null;
	completed: boolean | null;
}

export interface AccountLinkRecord {
	token: string;
	account: string;
	refreshUrl: string;
	returnUrl: string;
	created: number;
	expiresAt: number;
	/** fresh: never opened; opened: the page was shown; finished: a button was pressed. */
	stage: 'fresh' | 'opened' | 'finished';
}

export interface CreateRefundInput {
	paymentIntentId: string | null;
	chargeId: string | null;
	amount: number | null;
	metadata: Metadata;
	reason: string | null;
	/** Gives back the same share of the charge's application fee (Stripe: `refund_application_fee`). */
	refundApplicationFee: boolean;
}

export interface SessionRecord {
	session: CheckoutSession;
	lineItems: LineItem[];
	paymentIntentData: CreateSessionInput['paymentIntentData'];
}

export interface DeliveryRecord {
	eventId: string;
	type: string;
	/** platform: STRIPE_WEBHOOK_URL; connect: STRIPE_CONNECT_WEBHOOK_URL (events that carry `account`). */
	endpoint: 'platform' | 'connect';
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
	/** Whether an event of this type (of this account, or null) goes to an endpoint (sets pending_webhooks). */
	willDeliver?: (type: string, account: string | null) => boolean;
}

const IDEMPOTENCY_TTL_MS = 24 * 60 * 60 * 1000;

/** How long an account link can be opened. Stripe documents only that links expire after a few minutes. */
export const ACCOUNT_LINK_TTL_SECONDS = 300;

/** Default currencies of the countries a studio is likely in; anything else gets 'eur'. */
const COUNTRY_CURRENCY: Record<string, string> = {
	GB: 'gbp',
	US: 'usd',
	CH: 'chf',
	NO: 'nok',
	SE: 'sek',
	DK: 'dkk',
	PL: 'pln',
	CZ: 'czk',
	HU: 'huf',
	CA: 'cad',
	AU: 'aud',
	JP: 'jpy'
};
export function defaultCurrencyOf(country: string): string {
	return COUNTRY_CURRENCY[country] ?? 'eur';
}

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
	/** Connected accounts, oldest first. */
	readonly accounts = new Map<string, Account>();
	readonly accountLinks = new Map<string, AccountLinkRecord>();
	readonly applicationFees = new Map<string, ApplicationFee>();
	/** The connected account each session, PaymentIntent, charge, refund and event belongs to (absent: the platform). */
	readonly owners = new Map<string, string>();
	/** The platform's Connect application id, named on PaymentIntents and fees that carry an application fee. */
	readonly application = newId('ca_', 16);

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
		this.accounts.clear();
		this.accountLinks.clear();
		this.applicationFees.clear();
		this.owners.clear();
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

	/** The connected account an object belongs to, or null for the platform's own. */
	ownerOf(id: string): string | null {
		return this.owners.get(id) ?? null;
	}

	/** Whether a call in `scope` may see the object with this id. */
	inScope(id: string, scope: Scope): boolean {
		return scope === ALL_ACCOUNTS || this.ownerOf(id) === scope;
	}

	/** One object of a map, if it is in scope: another account's object answers as if it did not exist. */
	scoped<T>(map: ReadonlyMap<string, T>, id: string, scope: Scope): T | undefined {
		return this.inScope(id, scope) ? map.get(id) : undefined;
	}

	private own(id: string, account: string | null): void {
		if (account !== null) this.owners.set(id, account);
	}

	/** Any stored object by id, in scope (used by `expand`). */
	findById(id: string, scope: Scope): StripeObject | undefined {
		if (!this.inScope(id, scope)) return undefined;
		if (id.startsWith('cs_')) return this.getSessionRecord(id)?.session;
		if (id.startsWith('pi_')) return this.paymentIntents.get(id);
		if (id.startsWith('ch_')) return this.charges.get(id);
		if (id.startsWith('re_')) return this.refunds.get(id);
		if (id.startsWith('evt_')) return this.eventsById.get(id);
		if (id.startsWith('fee_')) return this.applicationFees.get(id);
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

	requireSession(id: string, scope: Scope): SessionRecord {
		const rec = this.inScope(id, scope) ? this.getSessionRecord(id) : undefined;
		if (!rec) throw err.noSuch('checkout.session', id);
		return rec;
	}

	// ---- events ----------------------------------------------------------------------------

	/**
	 * Stores and sends an event. An event about a connected account's object (or about the account
	 * itself) belongs to that account and carries `account`, as Connect webhooks do.
	 */
	emit(type: string, object: StripeObject, ctx: RequestContext, previousAttributes?: Record<string, unknown>): StripeEvent {
		const account = object.object === 'account' ? object.id : this.ownerOf(object.id);
		const event: StripeEvent = {
			id: newId('evt_'),
			object: 'event',
			...(account === null ? {} : { account }),
			api_version: this.apiVersion,
			created: this.nowSec(),
			data: previousAttributes
				? { object: clone(object), previous_attributes: clone(previousAttributes) }
				: { object: clone(object) },
			livemode: false,
			pending_webhooks: this.options.willDeliver?.(type, account) ? 1 : 0,
			request: { id: ctx.requestId, idempotency_key: ctx.idempotencyKey },
			type
		};
		this.events.push(event);
		this.eventsById.set(event.id, event);
		this.own(event.id, account);
		this.options.onEvent?.(event);
		return event;
	}

	// ---- Checkout Sessions -----------------------------------------------------------------

	/** A Checkout Session of the platform (account null) or of a connected account (a direct charge). */
	createSession(input: CreateSessionInput, account: string | null): CheckoutSession {
		if (account !== null) this.requireChargesEnabled(account);
		const amountTotal = input.lineItems.reduce((sum, li) => sum + li.unitAmount * li.quantity, 0);
		const fee = input.paymentIntentData.applicationFeeAmount;
		if (fee !== null && account === null) {
			throw err.invalid(
				'payment_intent_data[application_fee_amount]',
				'An application_fee_amount can only be set on a direct charge, made on a connected account with the Stripe-Account header.'
			);
		}
		if (fee !== null && fee > amountTotal) {
			throw err.invalid(
				'payment_intent_data[application_fee_amount]',
				`The application_fee_amount (${fee}) cannot be more than the session's total (${amountTotal}).`
			);
		}
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
		this.own(id, account);
		for (const li of lineItems) this.own(li.id, account);
		return session;
	}

	expireSession(id: string, ctx: RequestContext, scope: Scope): CheckoutSession {
		const rec = this.requireSession(id, scope);
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
		const rec = this.requireSession(id, ALL_ACCOUNTS);
		const s = rec.session;
		if (s.status !== 'open') {
			throw err.state(`This Checkout Session is ${s.status}; it can no longer be paid.`, 'checkout_session_not_open');
		}
		const account = this.ownerOf(id);
		if (account !== null) this.requireChargesEnabled(account);
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
		if (!delayed) this.takeApplicationFee(pi, charge, ctx);
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
		const rec = this.requireSession(id, ALL_ACCOUNTS);
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
			this.takeApplicationFee(pi, charge, ctx);
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
			application: rec.paymentIntentData.applicationFeeAmount === null ? null : this.application,
			application_fee_amount: rec.paymentIntentData.applicationFeeAmount,
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
		this.own(id, this.ownerOf(s.id));
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
			application: pi.application,
			application_fee: null,
			application_fee_amount: null,
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
		this.own(charge.id, this.ownerOf(pi.id));
		return charge;
	}

	/**
	 * When a direct charge with an application fee succeeds, the fee moves to the platform: Stripe
	 * makes an `application_fee` object (the platform's, listed without a header) and names it on
	 * the charge.
	 */
	private takeApplicationFee(pi: PaymentIntent, charge: Charge, ctx: RequestContext): void {
		const account = this.ownerOf(pi.id);
		if (account === null || pi.application_fee_amount === null || pi.application_fee_amount <= 0) return;
		const id = newId('fee_');
		const fee: ApplicationFee = {
			id,
			object: 'application_fee',
			account,
			amount: pi.application_fee_amount,
			amount_refunded: 0,
			application: this.application,
			balance_transaction: null,
			charge: charge.id,
			created: this.nowSec(),
			currency: charge.currency,
			livemode: false,
			originating_transaction: null,
			refunded: false,
			refunds: { object: 'list', data: [], has_more: false, total_count: 0, url: `/v1/application_fees/${id}/refunds` }
		};
		this.applicationFees.set(id, fee);
		charge.application_fee = id;
		charge.application_fee_amount = fee.amount;
		this.emit('application_fee.created', fee, ctx);
	}

	// ---- Refunds ---------------------------------------------------------------------------

	createRefund(input: CreateRefundInput, ctx: RequestContext, scope: Scope): Refund {
		let charge: Charge | undefined;
		if (input.chargeId) {
			charge = this.scoped(this.charges, input.chargeId, scope);
			if (!charge) throw err.noSuch('charge', input.chargeId, 'charge');
			if (input.paymentIntentId && charge.payment_intent !== input.paymentIntentId) {
				throw err.state(`Charge ${charge.id} does not belong to PaymentIntent ${input.paymentIntentId}.`);
			}
		} else if (input.paymentIntentId) {
			const pi = this.scoped(this.paymentIntents, input.paymentIntentId, scope);
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
		this.own(refund.id, this.ownerOf(charge.id));
		// Pending and succeeded refunds both count against what is left to refund.
		charge.amount_refunded += amount;
		charge.refunded = charge.amount_refunded >= charge.amount;
		this.emit('refund.created', refund, ctx);
		if (failure) {
			this.later(failure.delayMs, () => this.failRefund(refund.id, failure.failureReason));
		} else {
			if (input.refundApplicationFee) this.refundApplicationFee(charge, amount, ctx);
			this.emit('charge.refunded', charge, ctx);
		}
		return refund;
	}

	/** The fee goes back in proportion to the part of the charge refunded (rounded to a minor unit). */
	private refundApplicationFee(charge: Charge, refunded: number, ctx: RequestContext): void {
		const fee = charge.application_fee ? this.applicationFees.get(charge.application_fee) : undefined;
		if (!fee) return;
		const share = Math.min(fee.amount - fee.amount_refunded, Math.round((fee.amount * refunded) / charge.amount));
		if (share <= 0) return;
		fee.amount_refunded += share;
		fee.refunded = fee.amount_refunded >= fee.amount;
		this.emit('application_fee.refunded', fee, ctx);
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

	// ---- Connect: accounts -------------------------------------------------------------------

	requireAccount(id: string, param?: string): Account {
		const account = this.accounts.get(id);
		if (!account) throw err.noSuch('account', id, param);
		return account;
	}

	/** A direct charge needs an account that can take charges (`charges_enabled`). */
	requireChargesEnabled(id: string): Account {
		const account = this.requireAccount(id);
		if (!account.charges_enabled) {
			throw err.state(
				`The connected account ${id} cannot take charges yet: its set-up is not complete (requirements.disabled_reason: ${account.requirements.disabled_reason ?? 'none'}).`,
				'charges_not_enabled'
			);
		}
		return account;
	}

	/**
	 * What a new account still has to give before it may take charges. Stripe decides this per
	 * country and business type; the list here is the fake's own, written from memory.
	 */
	private initialRequirements(account: Account): AccountRequirements {
		const due: string[] = [];
		if (!account.business_profile.mcc) due.push('business_profile.mcc');
		if (!account.business_profile.url) due.push('business_profile.url');
		if (!account.business_type) due.push('business_type');
		due.push('external_account');
		if (account.business_type === 'company') {
			due.push('company.address.city', 'company.address.line1', 'company.address.postal_code', 'company.name', 'company.tax_id');
		} else {
			due.push(
				'individual.address.city',
				'individual.address.line1',
				'individual.dob.day',
				'individual.first_name',
				'individual.last_name'
			);
		}
		due.push('tos_acceptance.date', 'tos_acceptance.ip');
		return {
			alternatives: [],
			current_deadline: null,
			currently_due: due,
			disabled_reason: 'requirements.past_due',
			errors: [],
			eventually_due: [...due],
			past_due: [...due],
			pending_verification: []
		};
	}

	private static doneRequirements(): AccountRequirements {
		return {
			alternatives: [],
			current_deadline: null,
			currently_due: [],
			disabled_reason: null,
			errors: [],
			eventually_due: [],
			past_due: [],
			pending_verification: []
		};
	}

	createAccount(input: CreateAccountInput, id: string = newId('acct_', 16)): Account {
		const account: Account = {
			id,
			object: 'account',
			business_profile: {
				mcc: input.businessProfile.mcc,
				name: input.businessProfile.name,
				product_description: null,
				support_email: null,
				support_phone: null,
				support_url: null,
				url: input.businessProfile.url
			},
			business_type: input.businessType,
			capabilities: { card_payments: 'inactive', transfers: 'inactive' },
			charges_enabled: false,
			country: input.country,
			created: this.nowSec(),
			default_currency: input.defaultCurrency ?? defaultCurrencyOf(input.country),
			details_submitted: false,
			email: input.email,
			external_accounts: {
				object: 'list',
				data: [],
				has_more: false,
				total_count: 0,
				url: `/v1/accounts/${id}/external_accounts`
			},
			metadata: input.metadata,
			payouts_enabled: false,
			requirements: StripeFakeState.doneRequirements(),
			tos_acceptance: { date: null },
			type: input.type
		};
		account.requirements = this.initialRequirements(account);
		this.accounts.set(id, account);
		return account;
	}

	/** The account as it is once onboarding is done: it takes charges and pays out. */
	private markComplete(account: Account): void {
		account.charges_enabled = true;
		account.payouts_enabled = true;
		account.details_submitted = true;
		account.capabilities = { card_payments: 'active', transfers: 'active' };
		account.requirements = StripeFakeState.doneRequirements();
		account.tos_acceptance = { date: account.tos_acceptance.date ?? this.nowSec() };
		account.business_type ??= 'individual';
	}

	/** Sends `account.updated` with the fields that changed, if any did. Returns whether it sent one. */
	private changed(account: Account, before: Account, ctx: RequestContext): boolean {
		const previous: Record<string, unknown> = {};
		for (const key of Object.keys(account) as (keyof Account)[]) {
			if (JSON.stringify(account[key]) !== JSON.stringify(before[key])) previous[key] = before[key];
		}
		if (Object.keys(previous).length === 0) return false;
		this.emit('account.updated', account, ctx, previous);
		return true;
	}

	completeAccount(id: string, ctx: RequestContext = NO_REQUEST): Account {
		const account = this.requireAccount(id);
		const before = clone(account);
		this.markComplete(account);
		this.changed(account, before, ctx);
		return account;
	}

	/** New requirements are due now: the account can no longer take charges or pay out until they are met. */
	setRequirements(id: string, currentlyDue: string[], ctx: RequestContext = NO_REQUEST): Account {
		const account = this.requireAccount(id);
		const before = clone(account);
		const due = [...currentlyDue];
		account.requirements = {
			alternatives: [],
			current_deadline: null,
			currently_due: due,
			disabled_reason: due.length > 0 ? 'requirements.past_due' : null,
			errors: [],
			eventually_due: [...due],
			past_due: [...due],
			pending_verification: []
		};
		if (due.length > 0) {
			account.charges_enabled = false;
			account.payouts_enabled = false;
			account.capabilities = { card_payments: 'inactive', transfers: 'inactive' };
		} else {
			this.markComplete(account);
		}
		this.changed(account, before, ctx);
		return account;
	}

	/**
	 * Makes or updates the account with exactly this id (seeds and tests). A new account sends no
	 * event; a change to an existing one sends `account.updated`, and the same PUT again sends nothing.
	 */
	putAccount(id: string, input: PutAccountInput): { account: Account; created: boolean } {
		const existing = this.accounts.get(id);
		const account =
			existing ??
			this.createAccount(
				{
					type: 'express',
					country: input.country ?? 'DE',
					email: input.email,
					defaultCurrency: input.defaultCurrency,
					businessType: null,
					businessProfile: { name: input.businessName, url: null, mcc: null },
					metadata: {}
				},
				id
			);
		const before = clone(account);
		if (input.country !== null) account.country = input.country;
		if (input.email !== null) account.email = input.email;
		if (input.defaultCurrency !== null) account.default_currency = input.defaultCurrency;
		else if (existing && input.country !== null) account.default_currency = defaultCurrencyOf(input.country);
		if (input.businessName !== null) account.business_profile.name = input.businessName;
		if (input.completed === true) this.markComplete(account);
		if (input.completed === false && (existing === undefined || account.charges_enabled || account.details_submitted)) {
			account.charges_enabled = false;
			account.payouts_enabled = false;
			account.details_submitted = false;
			account.capabilities = { card_payments: 'inactive', transfers: 'inactive' };
			account.requirements = this.initialRequirements(account);
		}
		if (existing) this.changed(account, before, NO_REQUEST);
		return { account, created: !existing };
	}

	// ---- Connect: account links (onboarding) ------------------------------------------------

	createAccountLink(account: string, refreshUrl: string, returnUrl: string): AccountLink {
		this.requireAccount(account, 'account');
		const token = randomToken(32);
		const created = this.nowSec();
		const rec: AccountLinkRecord = {
			token,
			account,
			refreshUrl,
			returnUrl,
			created,
			expiresAt: created + ACCOUNT_LINK_TTL_SECONDS,
			stage: 'fresh'
		};
		this.accountLinks.set(token, rec);
		return { object: 'account_link', created, expires_at: rec.expiresAt, url: `${this.publicUrl}/connect/onboard/${token}` };
	}

	/**
	 * Opening a link uses it up: it shows the page once, and a later visit (or a visit after it
	 * expired) goes to refresh_url, where the platform makes a new link.
	 */
	openAccountLink(token: string): { link: AccountLinkRecord; show: boolean } | undefined {
		const link = this.accountLinks.get(token);
		if (!link) return undefined;
		if (link.stage !== 'fresh' || this.nowSec() >= link.expiresAt) return { link, show: false };
		link.stage = 'opened';
		return { link, show: true };
	}

	/**
	 * A button on the page: "complete" finishes the set-up; "leave" changes nothing. Either ends the
	 * link. Answers the URL to send the browser to: return_url, or refresh_url for a link already
	 * finished (or never opened and expired).
	 */
	finishAccountLink(token: string, action: 'complete' | 'leave'): string | undefined {
		const link = this.accountLinks.get(token);
		if (!link) return undefined;
		if (link.stage === 'finished' || (link.stage === 'fresh' && this.nowSec() >= link.expiresAt)) return link.refreshUrl;
		link.stage = 'finished';
		if (action === 'complete') this.completeAccount(link.account);
		return link.returnUrl;
	}
}

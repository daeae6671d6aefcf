/**
 * Stripe object shapes the fake produces (a faithful subset of the fields in Stripe's API reference
 * for the API version below), plus errors and ids.
 */
import { randomBytes } from 'node:crypto';

/** The API version of the `stripe` package pinned by the app (stripe-node 23.x). */
export const DEFAULT_API_VERSION = '2026-10-28.endive';

export type Metadata = Record<string, string>;

export interface RequestContext {
	requestId: string | null;
	idempotencyKey: string | null;
}
/** Events caused by the customer (pay page) or by time have `request: { id: null, idempotency_key: null }`. */
export const NO_REQUEST: RequestContext = { requestId: null, idempotencyKey: null };

const BASE62 = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz';
export function randomToken(length: number): string {
	const bytes = randomBytes(length);
	let out = '';
	for (const b of bytes) out += BASE62[b % 62];
	return out;
}
export function newId(prefix: string, length = 24): string {
	return `${prefix}${randomToken(length)}`;
}

export interface CustomerDetails {
	address: null;
	email: string | null;
	name: string | null;
	phone: null;
	tax_exempt: 'none';
	tax_ids: [];
}

export interface CheckoutSession {
	id: string;
	object: 'checkout.session';
	after_expiration: null;
	allow_promotion_codes: null;
	amount_subtotal: number;
	amount_total: number;
	automatic_tax: { enabled: false; liability: null; provider: null; status: null };
	billing_address_collection: null;
	cancel_url: string | null;
	client_reference_id: string | null;
	client_secret: null;
	created: number;
	currency: string;
	custom_fields: [];
	customer: null;
	customer_creation: 'if_required';
	customer_details: CustomerDetails | null;
	customer_email: string | null;
	expires_at: number;
	invoice: null;
	livemode: false;
	locale: string | null;
	metadata: Metadata;
	mode: 'payment';
	payment_intent: string | null;
	payment_link: null;
	payment_method_collection: 'if_required';
	payment_method_types: string[];
	payment_status: 'paid' | 'unpaid';
	recovered_from: null;
	setup_intent: null;
	shipping_address_collection: null;
	shipping_cost: null;
	shipping_options: [];
	status: 'open' | 'complete' | 'expired';
	submit_type: string | null;
	subscription: null;
	success_url: string | null;
	total_details: { amount_discount: number; amount_shipping: number; amount_tax: number };
	ui_mode: 'hosted';
	url: string | null;
}

export interface Price {
	id: string;
	object: 'price';
	active: false;
	billing_scheme: 'per_unit';
	created: number;
	currency: string;
	custom_unit_amount: null;
	livemode: false;
	lookup_key: null;
	metadata: Metadata;
	nickname: null;
	product: string;
	recurring: null;
	tax_behavior: 'unspecified';
	tiers_mode: null;
	transform_quantity: null;
	type: 'one_time';
	unit_amount: number;
	unit_amount_decimal: string;
}

export interface LineItem {
	id: string;
	object: 'item';
	amount_discount: number;
	amount_subtotal: number;
	amount_tax: number;
	amount_total: number;
	currency: string;
	description: string;
	metadata: Metadata;
	price: Price;
	quantity: number;
}

export interface PaymentError {
	type: 'card_error' | 'invalid_request_error';
	code: string;
	decline_code?: string;
	message: string;
	charge?: string;
	doc_url?: string;
}

export interface PaymentIntent {
	id: string;
	object: 'payment_intent';
	amount: number;
	amount_capturable: number;
	amount_received: number;
	/** The platform's Connect application, on a PaymentIntent that carries an application fee. */
	application: string | null;
	application_fee_amount: number | null;
	automatic_payment_methods: null;
	canceled_at: number | null;
	cancellation_reason: 'abandoned' | null;
	capture_method: 'automatic_async';
	client_secret: string;
	confirmation_method: 'automatic';
	created: number;
	currency: string;
	customer: null;
	description: string | null;
	last_payment_error: PaymentError | null;
	latest_charge: string | null;
	livemode: false;
	metadata: Metadata;
	next_action: null;
	on_behalf_of: null;
	payment_method: string | null;
	payment_method_types: string[];
	processing: null;
	receipt_email: string | null;
	review: null;
	setup_future_usage: null;
	shipping: null;
	statement_descriptor: null;
	statement_descriptor_suffix: null;
	status: 'requires_payment_method' | 'processing' | 'succeeded' | 'canceled';
	transfer_data: null;
	transfer_group: null;
}

export interface Charge {
	id: string;
	object: 'charge';
	amount: number;
	amount_captured: number;
	amount_refunded: number;
	application: string | null;
	application_fee: string | null;
	application_fee_amount: number | null;
	balance_transaction: null;
	billing_details: { address: null; email: string | null; name: null; phone: null };
	captured: boolean;
	created: number;
	currency: string;
	customer: null;
	description: string | null;
	failure_code: string | null;
	failure_message: string | null;
	livemode: false;
	metadata: Metadata;
	outcome: {
		network_status: string;
		reason: string | null;
		risk_level: 'normal';
		seller_message: string;
		type: string;
	} | null;
	paid: boolean;
	payment_intent: string;
	payment_method: string;
	payment_method_details: { type: 'card' | 'sepa_debit' };
	refunded: boolean;
	status: 'succeeded' | 'pending' | 'failed';
}

export interface Refund {
	id: string;
	object: 'refund';
	amount: number;
	balance_transaction: null;
	charge: string;
	created: number;
	currency: string;
	failure_reason?: string;
	metadata: Metadata;
	payment_intent: string;
	pending_reason?: 'processing';
	reason: string | null;
	receipt_number: null;
	source_transfer_reversal: null;
	status: 'pending' | 'succeeded' | 'failed';
	transfer_reversal: null;
}

export type StripeObject = CheckoutSession | PaymentIntent | Charge | Refund | LineItem | StripeEvent | Account | ApplicationFee;

export interface StripeEvent {
	id: string;
	object: 'event';
	/** Only on events of a connected account (Connect webhooks); absent on the platform's own. */
	account?: string;
	api_version: string;
	created: number;
	data: { object: unknown; previous_attributes?: Record<string, unknown> };
	livemode: false;
	pending_webhooks: number;
	request: { id: string | null; idempotency_key: string | null };
	type: string;
}

// ---- Connect ---------------------------------------------------------------------------------

export interface AccountRequirements {
	alternatives: [];
	current_deadline: number | null;
	currently_due: string[];
	disabled_reason: string | null;
	errors: [];
	eventually_due: string[];
	past_due: string[];
	pending_verification: string[];
}

export type CapabilityStatus = 'active' | 'inactive' | 'pending';

export interface Account {
	id: string;
	object: 'account';
	business_profile: {
		mcc: string | null;
		name: string | null;
		product_description: null;
		support_email: null;
		support_phone: null;
		support_url: null;
		url: string | null;
	};
	business_type: string | null;
	capabilities: { card_payments: CapabilityStatus; transfers: CapabilityStatus };
	charges_enabled: boolean;
	country: string;
	created: number;
	default_currency: string;
	details_submitted: boolean;
	email: string | null;
	external_accounts: { object: 'list'; data: []; has_more: false; total_count: 0; url: string };
	metadata: Metadata;
	payouts_enabled: boolean;
	requirements: AccountRequirements;
	tos_acceptance: { date: number | null };
	type: 'standard' | 'express';
}

export interface AccountLink {
	object: 'account_link';
	created: number;
	expires_at: number;
	url: string;
}

export interface ApplicationFee {
	id: string;
	object: 'application_fee';
	account: string;
	amount: number;
	amount_refunded: number;
	application: string;
	balance_transaction: null;
	charge: string;
	created: number;
	currency: string;
	livemode: false;
	originating_transaction: null;
	refunded: boolean;
	refunds: { object: 'list'; data: []; has_more: false; total_count: 0; url: string };
}

export interface ListObject<T> {
	object: 'list';
	data: T[];
	has_more: boolean;
	url: string;
}

// ---------------------------------------------------------------------------------------------
// Errors, shaped like Stripe's: { error: { type, code?, param?, message, doc_url? } }

export type ErrorType = 'invalid_request_error' | 'idempotency_error' | 'api_error' | 'card_error';

export class StripeApiError extends Error {
	constructor(
		readonly status: number,
		readonly type: ErrorType,
		message: string,
		readonly code?: string,
		readonly param?: string,
		/**
		 * Stripe saves an idempotent result only once the endpoint has begun executing; requests that
		 * fail parameter validation are not saved and may be retried with the same key.
		 */
		readonly saveIdempotent = true
	) {
		super(message);
		this.name = 'StripeApiError';
	}

	toBody(): { error: Record<string, string> } {
		const error: Record<string, string> = { type: this.type, message: this.message };
		if (this.code) {
			error.code = this.code;
			error.doc_url = `https://stripe.com/docs/error-codes/${this.code.replace(/_/g, '-')}`;
		}
		if (this.param) error.param = this.param;
		return { error };
	}
}

export const err = {
	missing: (param: string) =>
		new StripeApiError(400, 'invalid_request_error', `Missing required param: ${param}.`, 'parameter_missing', param, false),
	unknown: (param: string) =>
		new StripeApiError(400, 'invalid_request_error', `Received unknown parameter: ${param}`, 'parameter_unknown', param, false),
	invalid: (param: string, message: string, code = 'parameter_invalid') =>
		new StripeApiError(400, 'invalid_request_error', message, code, param, false),
	empty: (param: string) =>
		new StripeApiError(
			400,
			'invalid_request_error',
			`You passed an empty string for '${param}'. We assume empty values are an attempt to unset a parameter; however '${param}' cannot be unset. You should remove '${param}' from your request or supply a non-empty value.`,
			'parameter_invalid_empty',
			param,
			false
		),
	noSuch: (kind: string, id: string, param?: string) =>
		new StripeApiError(param ? 400 : 404, 'invalid_request_error', `No such ${kind}: '${id}'`, 'resource_missing', param, false),
	/**
	 * A Stripe-Account header naming an account the platform does not have. The status, code and
	 * wording follow what Stripe answers as remembered, not a documented contract.
	 */
	accountInvalid: (apiKey: string, account: string) =>
		new StripeApiError(
			403,
			'invalid_request_error',
			`The key ${apiKey} has no connected account '${account}' (it may not exist, or it is not connected to this platform).`,
			'account_invalid',
			undefined,
			false
		),
	/** A request that was valid but cannot be carried out in the object's current state. */
	state: (message: string, code?: string, param?: string) =>
		new StripeApiError(400, 'invalid_request_error', message, code, param, true)
};

// ---------------------------------------------------------------------------------------------
// Currencies, by Stripe's rule (docs, "Supported currencies"), not by ISO 4217 digits alone.

/** Zero-decimal currencies: the amount is in whole units. */
export const ZERO_DECIMAL = new Set([
	'bif',
	'clp',
	'djf',
	'gnf',
	'jpy',
	'kmf',
	'krw',
	'mga',
	'pyg',
	'rwf',
	'ugx',
	'vnd',
	'vuv',
	'xaf',
	'xof',
	'xpf'
]);
/** Three-decimal currencies: amounts are in thousandths and must end in 0. */
export const THREE_DECIMAL = new Set(['bhd', 'jod', 'kwd', 'omr', 'tnd']);

export function minorUnitDigits(currency: string): number {
	if (ZERO_DECIMAL.has(currency)) return 0;
	if (THREE_DECIMAL.has(currency)) return 3;
	return 2; // ISK too: Stripe takes it as two-decimal, in multiples of 100
}

export function formatAmount(amount: number, currency: string, locale = 'en-GB'): string {
	const digits = minorUnitDigits(currency);
	const value = amount / 10 ** digits;
	try {
		return new Intl.NumberFormat(locale, {
			style: 'currency',
			currency: currency.toUpperCase()
		}).format(value);
	} catch {
		return `${value.toFixed(digits)} ${currency.toUpperCase()}`;
	}
}

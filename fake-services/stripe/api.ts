/**
 * The /v1 API: authentication, parameter validation, idempotency, expansion, lists and routing.
 * `handleApi` is synchronous once the body has been read, which makes every request atomic.
 *
 * A `Stripe-Account` header (the SDK's `stripeAccount` option) makes the call on that connected
 * account: what it creates belongs to the account, and it sees only the account's objects.
 */
import type { IncomingHttpHeaders } from 'node:http';
import { type FormObject, type FormValue, FormParseError, parseForm, stableStringify } from './form.js';
import { type ListObject, type Metadata, type RequestContext, StripeApiError, THREE_DECIMAL, err, newId } from './objects.js';
import type { CreateAccountInput, CreateSessionInput, LineItemInput, Scope, StripeFakeState } from './state.js';

export interface ApiRequest {
	method: string;
	path: string;
	query: string;
	body: string;
	headers: IncomingHttpHeaders;
}

export interface ApiResponse {
	status: number;
	body: string;
	headers: Record<string, string>;
}

/** Seconds of grace on the 30-minute lower bound of expires_at, for clock skew between app and fake. */
export const EXPIRES_AT_GRACE_SECONDS = 10;

// ---- small param readers -------------------------------------------------------------------

type Params = FormObject;

function header(headers: IncomingHttpHeaders, name: string): string | undefined {
	const v = headers[name];
	return Array.isArray(v) ? v[0] : v;
}

function isObject(v: FormValue | undefined): v is FormObject {
	return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function checkKnown(params: Params, allowed: ReadonlySet<string>, prefix = ''): void {
	for (const key of Object.keys(params)) {
		if (!allowed.has(key)) throw err.unknown(prefix ? `${prefix}[${key}]` : key);
	}
}

function str(params: Params, key: string, name = key): string | null {
	const v = params[key];
	if (v === undefined || v === '') return null;
	if (typeof v !== 'string') throw err.invalid(name, `Invalid string: ${name} must be a string.`, 'parameter_invalid_string');
	return v;
}

function requiredStr(params: Params, key: string, name = key): string {
	const v = params[key];
	if (v === undefined) throw err.missing(name);
	if (v === '') throw err.empty(name);
	const s = str(params, key, name);
	if (s === null) throw err.missing(name);
	return s;
}

function int(params: Params, key: string, name = key): number | null {
	const v = params[key];
	if (v === undefined || v === '') return null;
	if (typeof v !== 'string' || !/^-?\d+$/.test(v) || !Number.isSafeInteger(Number(v))) {
		throw err.invalid(name, `Invalid integer: ${typeof v === 'string' ? v : JSON.stringify(v)}`, 'parameter_invalid_integer');
	}
	return Number(v);
}

function bool(params: Params, key: string, name = key): boolean | null {
	const v = params[key];
	if (v === undefined || v === '') return null;
	if (v === 'true') return true;
	if (v === 'false') return false;
	throw err.invalid(name, `Invalid boolean: ${typeof v === 'string' ? v : JSON.stringify(v)}`, 'parameter_invalid_boolean');
}

function maxLength(value: string | null, max: number, name: string): void {
	if (value !== null && value.length > max) {
		throw err.invalid(name, `Invalid ${name}: must be at most ${max} characters.`, 'parameter_invalid_string');
	}
}

/** Stripe's metadata limits: 50 keys, keys up to 40 characters without brackets, values up to 500. */
function metadata(value: FormValue | undefined, name: string): Metadata {
	if (value === undefined || value === '') return {};
	const entries: [string, FormValue][] = Array.isArray(value)
		? value.map((v, i) => [String(i), v])
		: isObject(value)
			? Object.entries(value)
			: [];
	if (!Array.isArray(value) && !isObject(value)) {
		throw err.invalid(name, `Invalid ${name}: metadata must be a hash of key-value pairs.`, 'parameter_invalid');
	}
	const out: Metadata = {};
	for (const [k, v] of entries) {
		if (typeof v !== 'string') throw err.invalid(`${name}[${k}]`, `Invalid value for metadata key '${k}': must be a string.`);
		if (k.length > 40) throw err.invalid(`${name}[${k}]`, `Metadata keys can be at most 40 characters long ('${k}').`);
		if (v.length > 500) throw err.invalid(`${name}[${k}]`, `Metadata values can be at most 500 characters long (key '${k}').`);
		if (v === '') continue; // an empty value unsets the key
		out[k] = v;
	}
	if (Object.keys(out).length > 50) throw err.invalid(name, 'You can have at most 50 metadata keys.');
	return out;
}

function url(params: Params, key: string): string | null {
	const v = str(params, key);
	if (v === null) {
		if (params[key] === '') throw err.empty(key);
		return null;
	}
	maxLength(v, 5000, key);
	let parsed: URL;
	try {
		parsed = new URL(v);
	} catch {
		throw err.invalid(key, `Not a valid URL`, 'url_invalid');
	}
	if (parsed.protocol !== 'http:' && parsed.protocol !== 'https:') throw err.invalid(key, 'Not a valid URL', 'url_invalid');
	return v;
}

function expandList(params: Params): string[] {
	const v = params.expand;
	if (v === undefined || v === '') return [];
	const list = typeof v === 'string' ? [v] : Array.isArray(v) ? v : null;
	if (!list || !list.every((x): x is string => typeof x === 'string')) {
		throw err.invalid('expand', 'Invalid array: expand must be an array of strings.');
	}
	return list;
}

// ---- expansion ------------------------------------------------------------------------------

const EXPANDABLE: Record<string, ReadonlySet<string>> = {
	'checkout.session': new Set([
		'payment_intent',
		'line_items',
		'customer',
		'invoice',
		'subscription',
		'setup_intent',
		'payment_link'
	]),
	payment_intent: new Set(['latest_charge', 'customer', 'payment_method', 'application', 'on_behalf_of', 'review']),
	charge: new Set(['payment_intent', 'customer', 'balance_transaction', 'payment_method', 'application_fee', 'application']),
	refund: new Set(['charge', 'payment_intent', 'balance_transaction']),
	account: new Set([]),
	application_fee: new Set(['account', 'application', 'balance_transaction', 'charge', 'originating_transaction'])
};

function expandAt(state: StripeFakeState, scope: Scope, value: unknown, segments: string[], path: string): unknown {
	const [field, ...rest] = segments;
	if (field === undefined || value === null || typeof value !== 'object') return value;
	const obj = value as Record<string, unknown>;
	if (obj.object === 'list' && Array.isArray(obj.data)) {
		if (field !== 'data') throw err.invalid('expand', `This property cannot be expanded (${path}).`);
		obj.data = obj.data.map((item) => expandAt(state, scope, item, rest, path));
		return obj;
	}
	const kind = typeof obj.object === 'string' ? obj.object : '';
	if (!EXPANDABLE[kind]?.has(field)) throw err.invalid('expand', `This property cannot be expanded (${path}).`);
	let child = obj[field];
	if (kind === 'checkout.session' && field === 'line_items' && typeof obj.id === 'string') {
		child = lineItemsList(state, scope, obj.id, {});
	} else if (typeof child === 'string') {
		const found = state.findById(child, scope);
		if (found) child = structuredClone(found);
	}
	obj[field] = expandAt(state, scope, child, rest, path);
	return obj;
}

/** Validates `expand` before an endpoint changes anything, so a bad path cannot half-apply a request. */
function expandFor(params: Params, kind: string): string[] {
	const list = expandList(params);
	for (const path of list) {
		const first = path.split('.')[0] ?? '';
		if (!EXPANDABLE[kind]?.has(first)) throw err.invalid('expand', `This property cannot be expanded (${path}).`);
	}
	return list;
}

function render<T extends object>(state: StripeFakeState, scope: Scope, object: T, expand: string[]): T {
	let out: unknown = structuredClone(object);
	for (const path of expand) {
		const segments = path.split('.');
		if (segments.length > 4) throw err.invalid('expand', `You cannot expand more than 4 levels of a property (${path}).`);
		out = expandAt(state, scope, out, segments, path);
	}
	return out as T;
}

// ---- lists ---------------------------------------------------------------------------------

const LIST_PARAMS = ['limit', 'starting_after', 'ending_before', 'expand'];

function paginate<T extends { id: string }>(newestFirst: T[], params: Params, listUrl: string): ListObject<T> {
	const limit = int(params, 'limit') ?? 10;
	if (limit < 1 || limit > 100) throw err.invalid('limit', 'Invalid limit: must be between 1 and 100.');
	const after = str(params, 'starting_after');
	const before = str(params, 'ending_before');
	let items = newestFirst;
	if (after !== null) {
		const i = items.findIndex((x) => x.id === after);
		if (i === -1) throw err.noSuch('object', after, 'starting_after');
		items = items.slice(i + 1);
		return {
			object: 'list',
			data: items.slice(0, limit),
			has_more: items.length > limit,
			url: listUrl
		};
	}
	if (before !== null) {
		const i = items.findIndex((x) => x.id === before);
		if (i === -1) throw err.noSuch('object', before, 'ending_before');
		items = items.slice(0, i);
		return {
			object: 'list',
			data: items.slice(-limit),
			has_more: items.length > limit,
			url: listUrl
		};
	}
	return {
		object: 'list',
		data: items.slice(0, limit),
		has_more: items.length > limit,
		url: listUrl
	};
}

function lineItemsList(state: StripeFakeState, scope: Scope, sessionId: string, params: Params) {
	const rec = state.requireSession(sessionId, scope);
	// Line items keep the order they were given in.
	return paginate(structuredClone(rec.lineItems), params, `/v1/checkout/sessions/${sessionId}/line_items`);
}

function newestFirst<T extends { created: number }>(items: Iterable<T>): T[] {
	return [...items].reverse(); // Maps and arrays keep insertion order, oldest first
}

// ---- Checkout Session creation ---------------------------------------------------------------

const SESSION_PARAMS = new Set([
	'mode',
	'line_items',
	'customer_email',
	'client_reference_id',
	'metadata',
	'success_url',
	'cancel_url',
	'expires_at',
	'payment_intent_data',
	'expand',
	'locale',
	'submit_type',
	'payment_method_types',
	'ui_mode',
	// Accepted and ignored: they change only what a real hosted page asks the payer.
	'billing_address_collection',
	'phone_number_collection',
	'allow_promotion_codes',
	'custom_text',
	'consent_collection',
	'invoice_creation',
	'automatic_tax',
	'payment_method_options',
	'tax_id_collection',
	'custom_fields',
	'customer_creation',
	'payment_method_collection',
	'after_expiration',
	'name_collection'
]);
const LINE_ITEM_PARAMS = new Set(['price_data', 'quantity', 'price', 'adjustable_quantity', 'tax_rates', 'dynamic_tax_rates']);
const PRICE_DATA_PARAMS = new Set([
	'currency',
	'unit_amount',
	'unit_amount_decimal',
	'product_data',
	'product',
	'tax_behavior',
	'recurring'
]);
const PRODUCT_DATA_PARAMS = new Set(['name', 'description', 'metadata', 'images', 'tax_code', 'unit_label']);
const PI_DATA_PARAMS = new Set([
	'application_fee_amount',
	'metadata',
	'description',
	'receipt_email',
	'statement_descriptor',
	'statement_descriptor_suffix'
]);

function parseLineItem(value: FormValue, i: number): LineItemInput {
	const p = `line_items[${i}]`;
	if (!isObject(value)) throw err.invalid(p, `Invalid object: ${p} must be a hash.`);
	checkKnown(value, LINE_ITEM_PARAMS, p);
	const price = str(value, 'price', `${p}[price]`);
	if (price !== null) throw err.noSuch('price', price, `${p}[price]`); // the fake keeps no Price objects
	const quantity = int(value, 'quantity', `${p}[quantity]`);
	const pd = value.price_data;
	if (pd === undefined) throw err.missing(`${p}[price_data]`);
	if (!isObject(pd)) throw err.invalid(`${p}[price_data]`, `Invalid object: ${p}[price_data] must be a hash.`);
	const q = `${p}[price_data]`;
	checkKnown(pd, PRICE_DATA_PARAMS, q);
	if (pd.recurring !== undefined) {
		throw err.invalid(
			`${q}[recurring]`,
			'You specified `payment` mode but passed a recurring price. Either switch to `subscription` mode or use only one-time prices.'
		);
	}
	const product = str(pd, 'product', `${q}[product]`);
	if (product !== null) throw err.noSuch('product', product, `${q}[product]`);
	const currency = requiredStr(pd, 'currency', `${q}[currency]`).toLowerCase();
	if (!/^[a-z]{3}$/.test(currency)) throw err.invalid(`${q}[currency]`, `Invalid currency: ${currency}.`);
	let unitAmount = int(pd, 'unit_amount', `${q}[unit_amount]`);
	const decimal = str(pd, 'unit_amount_decimal', `${q}[unit_amount_decimal]`);
	if (unitAmount === null && decimal !== null) {
		if (!/^\d+(\.0+)?$/.test(decimal)) {
			throw err.invalid(`${q}[unit_amount_decimal]`, 'The fake supports only whole minor units in unit_amount_decimal.');
		}
		unitAmount = Number.parseInt(decimal, 10);
	}
	if (unitAmount === null) throw err.missing(`${q}[unit_amount]`);
	if (unitAmount < 0) throw err.invalid(`${q}[unit_amount]`, 'This value must be greater than or equal to 0.');
	if (THREE_DECIMAL.has(currency) && unitAmount % 10 !== 0) {
		throw err.invalid(
			`${q}[unit_amount]`,
			`Amounts in ${currency.toUpperCase()} must be divisible by 10 (Stripe rounds three-decimal currencies to two decimals).`
		);
	}
	if (currency === 'isk' && unitAmount % 100 !== 0) {
		throw err.invalid(
			`${q}[unit_amount]`,
			'Amounts in ISK must be divisible by 100 (ISK is sent as two-decimal with zero fractions).'
		);
	}
	const pdata = pd.product_data;
	if (pdata === undefined) throw err.missing(`${q}[product_data]`);
	if (!isObject(pdata)) throw err.invalid(`${q}[product_data]`, `Invalid object: ${q}[product_data] must be a hash.`);
	checkKnown(pdata, PRODUCT_DATA_PARAMS, `${q}[product_data]`);
	const name = requiredStr(pdata, 'name', `${q}[product_data][name]`);
	if (quantity === null) throw err.missing(`${p}[quantity]`);
	if (quantity < 1) throw err.invalid(`${p}[quantity]`, 'Quantity must be at least 1.');
	return {
		name,
		description: str(pdata, 'description', `${q}[product_data][description]`),
		currency,
		unitAmount,
		quantity,
		productMetadata: metadata(pdata.metadata, `${q}[product_data][metadata]`)
	};
}

function parseCreateSession(state: StripeFakeState, params: Params): CreateSessionInput {
	checkKnown(params, SESSION_PARAMS);
	const mode = requiredStr(params, 'mode');
	if (mode !== 'payment') {
		throw err.invalid('mode', `The Slateroom Stripe fake supports only mode=payment (got '${mode}').`);
	}
	const uiMode = str(params, 'ui_mode');
	if (uiMode !== null && uiMode !== 'hosted' && uiMode !== 'hosted_page') {
		throw err.invalid('ui_mode', `The Slateroom Stripe fake supports only the hosted payment page (got ui_mode '${uiMode}').`);
	}
	const rawItems = params.line_items;
	if (rawItems === undefined || rawItems === '') throw err.missing('line_items');
	if (!Array.isArray(rawItems) || rawItems.length === 0)
		throw err.invalid('line_items', 'Invalid array: line_items must be a non-empty array.');
	if (rawItems.length > 100) throw err.invalid('line_items', 'A Checkout Session can have at most 100 line items.');
	const lineItems = rawItems.map((li, i) => parseLineItem(li, i));
	const currency = lineItems[0]?.currency ?? '';
	lineItems.forEach((li, i) => {
		if (li.currency !== currency) {
			throw err.invalid(
				`line_items[${i}][price_data][currency]`,
				`All line items must use the same currency (found ${currency} and ${li.currency}).`
			);
		}
	});

	const customerEmail = str(params, 'customer_email');
	if (customerEmail !== null && !/^[^@\s]+@[^@\s]+\.[^@\s]+$/.test(customerEmail)) {
		throw err.invalid('customer_email', `Invalid email address: ${customerEmail}`, 'email_invalid');
	}
	const clientReferenceId = str(params, 'client_reference_id');
	maxLength(clientReferenceId, 200, 'client_reference_id');

	const now = state.nowSec();
	const expiresAt = int(params, 'expires_at') ?? now + 24 * 3600;
	if (expiresAt < now + 30 * 60 - EXPIRES_AT_GRACE_SECONDS) {
		throw err.invalid('expires_at', 'The `expires_at` timestamp must be at least 30 minutes from Checkout Session creation.');
	}
	if (expiresAt > now + 24 * 3600) {
		throw err.invalid('expires_at', 'The `expires_at` timestamp must be less than 24 hours from Checkout Session creation.');
	}

	const pid = params.payment_intent_data;
	let piData: CreateSessionInput['paymentIntentData'] = {
		metadata: {},
		description: null,
		receiptEmail: null,
		applicationFeeAmount: null
	};
	if (pid !== undefined && pid !== '') {
		if (!isObject(pid)) throw err.invalid('payment_intent_data', 'Invalid object: payment_intent_data must be a hash.');
		checkKnown(pid, PI_DATA_PARAMS, 'payment_intent_data');
		piData = {
			metadata: metadata(pid.metadata, 'payment_intent_data[metadata]'),
			description: str(pid, 'description', 'payment_intent_data[description]'),
			receiptEmail: str(pid, 'receipt_email', 'payment_intent_data[receipt_email]'),
			applicationFeeAmount: int(pid, 'application_fee_amount', 'payment_intent_data[application_fee_amount]')
		};
		if (piData.applicationFeeAmount !== null && piData.applicationFeeAmount < 0) {
			throw err.invalid(
				'payment_intent_data[application_fee_amount]',
				'Invalid integer: application_fee_amount must be 0 or more.',
				'parameter_invalid_integer'
			);
		}
	}
	const pmt = params.payment_method_types;
	let paymentMethodTypes = ['card'];
	if (pmt !== undefined && pmt !== '') {
		if (!Array.isArray(pmt) || !pmt.every((x): x is string => typeof x === 'string')) {
			throw err.invalid('payment_method_types', 'Invalid array: payment_method_types must be an array of strings.');
		}
		paymentMethodTypes = pmt;
	}
	return {
		lineItems,
		currency,
		customerEmail,
		clientReferenceId,
		metadata: metadata(params.metadata, 'metadata'),
		successUrl: url(params, 'success_url'),
		cancelUrl: url(params, 'cancel_url'),
		expiresAt,
		locale: str(params, 'locale'),
		submitType: str(params, 'submit_type'),
		paymentMethodTypes,
		paymentIntentData: piData
	};
}

// ---- refunds ---------------------------------------------------------------------------------

const REFUND_PARAMS = new Set([
	'payment_intent',
	'charge',
	'amount',
	'metadata',
	'reason',
	'expand',
	'instructions_email',
	'refund_application_fee',
	'reverse_transfer'
]);
const REFUND_REASONS = new Set(['duplicate', 'fraudulent', 'requested_by_customer']);

// ---- Connect: accounts and account links ----------------------------------------------------

const ACCOUNT_PARAMS = new Set([
	'type',
	'country',
	'email',
	'default_currency',
	'business_type',
	'business_profile',
	'metadata',
	'expand',
	// Accepted and ignored: the fake's accounts always ask for card payments and transfers.
	'capabilities',
	'controller'
]);
const BUSINESS_PROFILE_PARAMS = new Set(['name', 'url', 'mcc', 'product_description', 'support_email', 'support_url']);
const BUSINESS_TYPES = new Set(['individual', 'company', 'non_profit', 'government_entity']);

function parseCreateAccount(params: Params): CreateAccountInput {
	checkKnown(params, ACCOUNT_PARAMS);
	const type = str(params, 'type') ?? 'express';
	if (type !== 'standard' && type !== 'express') {
		throw err.invalid('type', `The Slateroom Stripe fake makes only standard and express accounts (got type '${type}').`);
	}
	const country = (str(params, 'country') ?? 'DE').toUpperCase();
	if (!/^[A-Z]{2}$/.test(country)) throw err.invalid('country', `Invalid country: ${country}.`, 'country_unsupported');
	const email = str(params, 'email');
	if (email !== null && !/^[^@\s]+@[^@\s]+\.[^@\s]+$/.test(email)) {
		throw err.invalid('email', `Invalid email address: ${email}`, 'email_invalid');
	}
	const currency = str(params, 'default_currency')?.toLowerCase() ?? null;
	if (currency !== null && !/^[a-z]{3}$/.test(currency)) throw err.invalid('default_currency', `Invalid currency: ${currency}.`);
	const businessType = str(params, 'business_type');
	if (businessType !== null && !BUSINESS_TYPES.has(businessType)) {
		throw err.invalid('business_type', `Invalid business_type: must be one of ${[...BUSINESS_TYPES].join(', ')}.`);
	}
	const bp = params.business_profile;
	let businessProfile: CreateAccountInput['businessProfile'] = { name: null, url: null, mcc: null };
	if (bp !== undefined && bp !== '') {
		if (!isObject(bp)) throw err.invalid('business_profile', 'Invalid object: business_profile must be a hash.');
		checkKnown(bp, BUSINESS_PROFILE_PARAMS, 'business_profile');
		const mcc = str(bp, 'mcc', 'business_profile[mcc]');
		if (mcc !== null && !/^\d{4}$/.test(mcc)) throw err.invalid('business_profile[mcc]', 'Invalid mcc: must be 4 digits.');
		businessProfile = {
			name: str(bp, 'name', 'business_profile[name]'),
			url: str(bp, 'url', 'business_profile[url]'),
			mcc
		};
	}
	return {
		type,
		country,
		email,
		defaultCurrency: currency,
		businessType,
		businessProfile,
		metadata: metadata(params.metadata, 'metadata')
	};
}

/** Accounts and account links are the platform's: made and read without a Stripe-Account header. */
function platformOnly(scope: string | null, what: string): void {
	if (scope !== null) {
		throw err.state(`${what} is a platform request: send it without a Stripe-Account header.`);
	}
}

// ---- routing ---------------------------------------------------------------------------------

/** `scope`: the connected account named by the Stripe-Account header, or null for the platform. */
type Handler = (state: StripeFakeState, params: Params, ctx: RequestContext, id: string, scope: string | null) => object;
interface Route {
	method: 'GET' | 'POST';
	pattern: RegExp;
	handler: Handler;
}

const ID = '([A-Za-z0-9_]+)';
const RETRIEVE_PARAMS = new Set(['expand']);

function eventMatches(type: string, filter: string): boolean {
	return filter.endsWith('*') ? type.startsWith(filter.slice(0, -1)) : type === filter;
}

function createdFilter(params: Params): (created: number) => boolean {
	const c = params.created;
	if (c === undefined || c === '') return () => true;
	if (typeof c === 'string') {
		const v = int(params, 'created');
		return (x) => x === v;
	}
	if (!isObject(c)) throw err.invalid('created', 'Invalid created filter.');
	checkKnown(c, new Set(['gt', 'gte', 'lt', 'lte']), 'created');
	const gt = int(c, 'gt', 'created[gt]');
	const gte = int(c, 'gte', 'created[gte]');
	const lt = int(c, 'lt', 'created[lt]');
	const lte = int(c, 'lte', 'created[lte]');
	return (x) => (gt === null || x > gt) && (gte === null || x >= gte) && (lt === null || x < lt) && (lte === null || x <= lte);
}

const routes: Route[] = [
	{
		method: 'POST',
		pattern: /^\/v1\/checkout\/sessions$/,
		handler: (state, params, _ctx, _id, scope) => {
			const input = parseCreateSession(state, params);
			const expand = expandFor(params, 'checkout.session');
			return render(state, scope, state.createSession(input, scope), expand);
		}
	},
	{
		method: 'GET',
		pattern: /^\/v1\/checkout\/sessions$/,
		handler: (state, params, _ctx, _id, scope) => {
			checkKnown(params, new Set([...LIST_PARAMS, 'payment_intent', 'status', 'client_reference_id', 'created']));
			const pi = str(params, 'payment_intent');
			const status = str(params, 'status');
			const ref = str(params, 'client_reference_id');
			const inCreated = createdFilter(params);
			state.sweep();
			const all = newestFirst([...state.sessions.values()].map((r) => r.session)).filter(
				(s) =>
					state.inScope(s.id, scope) &&
					(pi === null || s.payment_intent === pi) &&
					(status === null || s.status === status) &&
					(ref === null || s.client_reference_id === ref) &&
					inCreated(s.created)
			);
			return render(state, scope, paginate(all, params, '/v1/checkout/sessions'), expandList(params));
		}
	},
	{
		method: 'GET',
		pattern: new RegExp(`^/v1/checkout/sessions/${ID}$`),
		handler: (state, params, _ctx, id, scope) => {
			checkKnown(params, RETRIEVE_PARAMS);
			return render(state, scope, state.requireSession(id, scope).session, expandList(params));
		}
	},
	{
		method: 'GET',
		pattern: new RegExp(`^/v1/checkout/sessions/${ID}/line_items$`),
		handler: (state, params, _ctx, id, scope) => {
			checkKnown(params, new Set(LIST_PARAMS));
			return render(state, scope, lineItemsList(state, scope, id, params), expandList(params));
		}
	},
	{
		method: 'POST',
		pattern: new RegExp(`^/v1/checkout/sessions/${ID}/expire$`),
		handler: (state, params, ctx, id, scope) => {
			checkKnown(params, RETRIEVE_PARAMS);
			const expand = expandFor(params, 'checkout.session');
			return render(state, scope, state.expireSession(id, ctx, scope), expand);
		}
	},
	{
		method: 'GET',
		pattern: new RegExp(`^/v1/payment_intents/${ID}$`),
		handler: (state, params, _ctx, id, scope) => {
			checkKnown(params, new Set(['expand', 'client_secret']));
			const pi = state.scoped(state.paymentIntents, id, scope);
			if (!pi) throw err.noSuch('payment_intent', id);
			return render(state, scope, pi, expandList(params));
		}
	},
	{
		method: 'GET',
		pattern: new RegExp(`^/v1/charges/${ID}$`),
		handler: (state, params, _ctx, id, scope) => {
			checkKnown(params, RETRIEVE_PARAMS);
			const charge = state.scoped(state.charges, id, scope);
			if (!charge) throw err.noSuch('charge', id);
			return render(state, scope, charge, expandList(params));
		}
	},
	{
		method: 'POST',
		pattern: /^\/v1\/refunds$/,
		handler: (state, params, ctx, _id, scope) => {
			checkKnown(params, REFUND_PARAMS);
			const paymentIntentId = str(params, 'payment_intent');
			const chargeId = str(params, 'charge');
			if (paymentIntentId === null && chargeId === null) {
				throw new StripeApiError(
					400,
					'invalid_request_error',
					'One of the following params should be provided for this request: payment_intent or charge.',
					'parameter_missing',
					'payment_intent',
					false
				);
			}
			const amount = int(params, 'amount');
			if (amount !== null && amount < 1) throw err.invalid('amount', 'Invalid positive integer', 'parameter_invalid_integer');
			const reason = str(params, 'reason');
			if (reason !== null && !REFUND_REASONS.has(reason)) {
				throw err.invalid('reason', 'Invalid reason: must be one of duplicate, fraudulent, or requested_by_customer');
			}
			const expand = expandFor(params, 'refund');
			const refund = state.createRefund(
				{
					paymentIntentId,
					chargeId,
					amount,
					metadata: metadata(params.metadata, 'metadata'),
					reason,
					refundApplicationFee: bool(params, 'refund_application_fee') ?? false
				},
				ctx,
				scope
			);
			return render(state, scope, refund, expand);
		}
	},
	{
		method: 'GET',
		pattern: /^\/v1\/refunds$/,
		handler: (state, params, _ctx, _id, scope) => {
			checkKnown(params, new Set([...LIST_PARAMS, 'payment_intent', 'charge', 'created']));
			const pi = str(params, 'payment_intent');
			const charge = str(params, 'charge');
			const inCreated = createdFilter(params);
			const all = newestFirst(state.refunds.values()).filter(
				(r) =>
					state.inScope(r.id, scope) &&
					(pi === null || r.payment_intent === pi) &&
					(charge === null || r.charge === charge) &&
					inCreated(r.created)
			);
			return render(state, scope, paginate(all, params, '/v1/refunds'), expandList(params));
		}
	},
	{
		method: 'GET',
		pattern: new RegExp(`^/v1/refunds/${ID}$`),
		handler: (state, params, _ctx, id, scope) => {
			checkKnown(params, RETRIEVE_PARAMS);
			const refund = state.scoped(state.refunds, id, scope);
			if (!refund) throw err.noSuch('refund', id);
			return render(state, scope, refund, expandList(params));
		}
	},
	{
		method: 'GET',
		pattern: /^\/v1\/events$/,
		handler: (state, params, _ctx, _id, scope) => {
			checkKnown(params, new Set([...LIST_PARAMS, 'type', 'types', 'created', 'delivery_success']));
			const type = str(params, 'type');
			const typesRaw = params.types;
			let types: string[] | null = null;
			if (typesRaw !== undefined && typesRaw !== '') {
				const list = typeof typesRaw === 'string' ? [typesRaw] : typesRaw;
				if (!Array.isArray(list) || !list.every((x): x is string => typeof x === 'string')) {
					throw err.invalid('types', 'Invalid array: types must be an array of strings.');
				}
				types = list;
			}
			if (type !== null && types !== null) {
				throw err.invalid('type', 'You may pass either type or types, but not both.', 'parameters_exclusive');
			}
			const inCreated = createdFilter(params);
			const all = newestFirst(state.events).filter(
				(e) =>
					state.inScope(e.id, scope) &&
					(type === null || eventMatches(e.type, type)) &&
					(types === null || types.some((t) => eventMatches(e.type, t))) &&
					inCreated(e.created)
			);
			return paginate(all, params, '/v1/events');
		}
	},
	{
		method: 'GET',
		pattern: new RegExp(`^/v1/events/${ID}$`),
		handler: (state, params, _ctx, id, scope) => {
			checkKnown(params, RETRIEVE_PARAMS);
			const event = state.scoped(state.eventsById, id, scope);
			if (!event) throw err.noSuch('event', id);
			return structuredClone(event);
		}
	},
	{
		method: 'POST',
		pattern: /^\/v1\/accounts$/,
		handler: (state, params, _ctx, _id, scope) => {
			platformOnly(scope, 'Creating a connected account');
			const input = parseCreateAccount(params);
			const expand = expandFor(params, 'account');
			return render(state, scope, state.createAccount(input), expand);
		}
	},
	{
		method: 'GET',
		pattern: /^\/v1\/accounts$/,
		handler: (state, params, _ctx, _id, scope) => {
			platformOnly(scope, 'Listing connected accounts');
			checkKnown(params, new Set([...LIST_PARAMS, 'created']));
			const inCreated = createdFilter(params);
			const all = newestFirst(state.accounts.values()).filter((a) => inCreated(a.created));
			return render(state, scope, paginate(all, params, '/v1/accounts'), expandList(params));
		}
	},
	{
		method: 'GET',
		pattern: new RegExp(`^/v1/accounts/${ID}$`),
		handler: (state, params, _ctx, id, scope) => {
			checkKnown(params, RETRIEVE_PARAMS);
			// With a header, an account can read only itself.
			if (scope !== null && scope !== id) throw err.noSuch('account', id);
			return render(state, scope, state.requireAccount(id), expandList(params));
		}
	},
	{
		method: 'GET',
		pattern: /^\/v1\/account$/,
		handler: (state, params, _ctx, _id, scope) => {
			checkKnown(params, RETRIEVE_PARAMS);
			if (scope === null) {
				throw err.state(
					'The Slateroom Stripe fake keeps no account for the platform itself: send a Stripe-Account header to read a connected account.'
				);
			}
			return render(state, scope, state.requireAccount(scope), expandList(params));
		}
	},
	{
		method: 'POST',
		pattern: /^\/v1\/account_links$/,
		handler: (state, params, _ctx, _id, scope) => {
			platformOnly(scope, 'Creating an account link');
			checkKnown(params, new Set(['account', 'refresh_url', 'return_url', 'type', 'collect', 'collection_options', 'expand']));
			const account = requiredStr(params, 'account');
			const type = requiredStr(params, 'type');
			if (type !== 'account_onboarding') {
				throw err.invalid('type', `The Slateroom Stripe fake makes only account_onboarding links (got type '${type}').`);
			}
			const refreshUrl = url(params, 'refresh_url');
			if (refreshUrl === null) throw err.missing('refresh_url');
			const returnUrl = url(params, 'return_url');
			if (returnUrl === null) throw err.missing('return_url');
			return state.createAccountLink(account, refreshUrl, returnUrl);
		}
	},
	{
		method: 'GET',
		pattern: /^\/v1\/application_fees$/,
		handler: (state, params, _ctx, _id, scope) => {
			checkKnown(params, new Set([...LIST_PARAMS, 'charge', 'created']));
			const charge = str(params, 'charge');
			const inCreated = createdFilter(params);
			const all = newestFirst(state.applicationFees.values()).filter(
				(f) => state.inScope(f.id, scope) && (charge === null || f.charge === charge) && inCreated(f.created)
			);
			return render(state, scope, paginate(all, params, '/v1/application_fees'), expandList(params));
		}
	},
	{
		method: 'GET',
		pattern: new RegExp(`^/v1/application_fees/${ID}$`),
		handler: (state, params, _ctx, id, scope) => {
			checkKnown(params, RETRIEVE_PARAMS);
			const fee = state.scoped(state.applicationFees, id, scope);
			if (!fee) throw err.noSuch('application_fee', id);
			return render(state, scope, fee, expandList(params));
		}
	}
];

// ---- the request pipeline --------------------------------------------------------------------

function apiKeyOf(headers: IncomingHttpHeaders): string | null {
	const auth = header(headers, 'authorization');
	if (!auth) return null;
	const bearer = /^Bearer\s+(\S+)$/i.exec(auth);
	if (bearer?.[1]) return bearer[1];
	const basic = /^Basic\s+(\S+)$/i.exec(auth);
	if (basic?.[1]) return Buffer.from(basic[1], 'base64').toString('utf8').split(':')[0] ?? null;
	return null;
}

function redact(key: string): string {
	return key.length <= 12 ? `${key.slice(0, 3)}***` : `${key.slice(0, 8)}${'*'.repeat(key.length - 12)}${key.slice(-4)}`;
}

function json(status: number, body: unknown, headers: Record<string, string>): ApiResponse {
	return { status, body: JSON.stringify(body, null, 2), headers };
}

export function handleApi(state: StripeFakeState, req: ApiRequest): ApiResponse {
	const requestId = newId('req_', 14);
	const headers: Record<string, string> = {
		'Request-Id': requestId,
		'Stripe-Version': header(req.headers, 'stripe-version') ?? state.apiVersion
	};
	const fail = (e: StripeApiError) => json(e.status, e.toBody(), headers);

	const apiKey = apiKeyOf(req.headers);
	if (!apiKey || !apiKey.startsWith('sk_test_')) {
		headers['WWW-Authenticate'] = 'Bearer realm="Stripe"';
		const message = apiKey
			? `Invalid API Key provided: ${redact(apiKey)}. The Slateroom Stripe fake accepts only test secret keys (sk_test_...).`
			: "You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY').";
		return fail(new StripeApiError(401, 'invalid_request_error', message));
	}

	// Connect: the call is made on this connected account (Stripe documents the header; the 403 for
	// an account the platform does not have is its answer as remembered).
	const stripeAccount = header(req.headers, 'stripe-account') ?? null;
	if (stripeAccount !== null) {
		headers['Stripe-Account'] = stripeAccount;
		if (!state.accounts.has(stripeAccount)) return fail(err.accountInvalid(redact(apiKey), stripeAccount));
	}

	let match: { route: Route; id: string } | null = null;
	for (const route of routes) {
		const m = route.pattern.exec(req.path);
		if (m && route.method === req.method) {
			match = { route, id: m[1] ?? '' };
			break;
		}
	}
	if (!match) {
		return fail(
			new StripeApiError(
				404,
				'invalid_request_error',
				`Unrecognized request URL (${req.method}: ${req.path}). The Slateroom Stripe fake implements only the endpoints listed in fake-services/stripe/README.md.`,
				'resource_missing'
			)
		);
	}

	let params: Params;
	try {
		const contentType = header(req.headers, 'content-type') ?? '';
		if (req.method === 'POST' && req.body.length > 0 && !contentType.startsWith('application/x-www-form-urlencoded')) {
			throw err.invalid(
				'',
				`Stripe's v1 API takes application/x-www-form-urlencoded bodies, not '${contentType}'.`,
				'parameter_invalid'
			);
		}
		params = parseForm(req.method === 'POST' ? req.body : req.query);
	} catch (e) {
		if (e instanceof StripeApiError) return fail(e);
		if (e instanceof FormParseError) {
			return fail(new StripeApiError(400, 'invalid_request_error', e.message, 'parameter_invalid', e.param, false));
		}
		throw e;
	}

	// Idempotency (POST only; Stripe ignores the header on GET). Keys are scoped to the API key and
	// to the account the call is made on: one key may be used once per connected account.
	const idempotencyKey = req.method === 'POST' ? (header(req.headers, 'idempotency-key') ?? null) : null;
	let storeKey: string | null = null;
	let fingerprint = '';
	if (idempotencyKey !== null) {
		headers['Idempotency-Key'] = idempotencyKey;
		if (idempotencyKey.length > 255) {
			return fail(
				new StripeApiError(
					400,
					'invalid_request_error',
					'Idempotency keys can be at most 255 characters long.',
					'parameter_invalid',
					undefined,
					false
				)
			);
		}
		storeKey = `${apiKey}\u0000${stripeAccount ?? ''}\u0000${idempotencyKey}`;
		fingerprint = `${req.method} ${req.path} ${stableStringify(params)}`;
		const saved = state.idempotency.get(storeKey);
		if (saved && saved.createdAtMs >= state.nowMs() - 24 * 3600 * 1000) {
			if (saved.fingerprint !== fingerprint) {
				return fail(
					new StripeApiError(
						400,
						'idempotency_error',
						`Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${idempotencyKey}' if you meant to execute a different request.`
					)
				);
			}
			return {
				status: saved.status,
				body: saved.body,
				headers: { ...headers, 'Idempotent-Replayed': 'true', 'Original-Request': saved.requestId }
			};
		}
	}

	const ctx: RequestContext = { requestId, idempotencyKey };
	let response: ApiResponse;
	let save = true;
	try {
		response = json(200, match.route.handler(state, params, ctx, match.id, stripeAccount), headers);
	} catch (e) {
		if (e instanceof StripeApiError) {
			save = e.saveIdempotent;
			response = fail(e);
		} else {
			const message = e instanceof Error ? e.message : String(e);
			response = fail(new StripeApiError(500, 'api_error', `The Stripe fake failed: ${message}`));
		}
	}
	if (storeKey !== null && save) {
		state.idempotency.set(storeKey, {
			fingerprint,
			status: response.status,
			body: response.body,
			requestId,
			createdAtMs: state.nowMs()
		});
	}
	return response;
}

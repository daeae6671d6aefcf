/**
 * The Stripe fake's HTTP server: /v1 (the API), /pay (the hosted page), /connect/onboard (the
 * onboarding page of account links) and /_control (test controls).
 * Start it in-process with `startStripeFake({ port: 0, ... })`; server.ts is the CLI entry.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { handleApi } from './api.js';
import { FormParseError, parseForm } from './form.js';
import { DEFAULT_API_VERSION, NO_REQUEST, StripeApiError, err } from './objects.js';
import { renderOnboardPage } from './onboardpage.js';
import { type PayNotice, renderNotFound, renderPayPage } from './paypage.js';
import { ALL_ACCOUNTS, type PayMethod, type PutAccountInput, type SessionRecord, StripeFakeState } from './state.js';
import { DEFAULT_RETRY_DELAYS_MS, WebhookDispatcher } from './webhooks.js';

export interface StripeFakeOptions {
	/** Default 12111; 0 picks a free port. */
	port?: number;
	/** Default 127.0.0.1. */
	host?: string;
	/** Base of the `url` of Checkout Sessions; default: the address the server listens on. */
	publicUrl?: string;
	/** Where events are POSTed; null or '' records events without sending them. */
	webhookUrl?: string | null;
	/** Default 'whsec_slateroom_local'. */
	webhookSecret?: string;
	/** Where events of connected accounts are POSTed (the Connect endpoint); default null (recorded, not sent). */
	connectWebhookUrl?: string | null;
	/** Default 'whsec_slateroom_connect_local'. */
	connectWebhookSecret?: string;
	/** Delay before each retry of a failed delivery; default 0.5 s, 1 s, 2 s, ... 30 s (8 retries). */
	retryDelaysMs?: number[];
	/** Per-attempt timeout of a webhook delivery; default 10 s. */
	deliveryTimeoutMs?: number;
	/** Event types sent to the webhook URL: '*' (default), exact types or 'prefix.*'. */
	enabledEvents?: string[];
	/** api_version written into events; default the version of the pinned stripe-node SDK. */
	apiVersion?: string;
	/** How often open sessions are checked against expires_at; default 1000 ms. */
	sweepIntervalMs?: number;
	/** Clock in ms for object timestamps and expiry (tests can move time); default Date.now. */
	now?: () => number;
}

export interface StripeFake {
	url: string;
	port: number;
	state: StripeFakeState;
	webhooks: WebhookDispatcher;
	close(): Promise<void>;
}

const MAX_BODY_BYTES = 1024 * 1024;

class HttpError extends Error {
	constructor(
		readonly status: number,
		message: string
	) {
		super(message);
	}
}

function readBody(req: http.IncomingMessage): Promise<string> {
	return new Promise((resolve, reject) => {
		const chunks: Buffer[] = [];
		let size = 0;
		req.on('data', (chunk: Buffer) => {
			size += chunk.length;
			if (size > MAX_BODY_BYTES) {
				reject(new HttpError(413, 'Request body too large'));
				req.destroy();
				return;
			}
			chunks.push(chunk);
		});
		req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
		req.on('error', reject);
	});
}

function send(res: http.ServerResponse, status: number, body: string, headers: Record<string, string>): void {
	res.writeHead(status, { 'Content-Length': String(Buffer.byteLength(body)), ...headers });
	res.end(body);
}

function sendJson(res: http.ServerResponse, status: number, value: unknown): void {
	send(res, status, JSON.stringify(value, null, 2), { 'Content-Type': 'application/json' });
}

function sendHtml(res: http.ServerResponse, status: number, html: string): void {
	send(res, status, html, {
		'Content-Type': 'text/html; charset=utf-8',
		'Content-Security-Policy': "default-src 'none'; style-src 'unsafe-inline'",
		'Cache-Control': 'no-store'
	});
}

function redirect(res: http.ServerResponse, location: string): void {
	send(res, 303, '', { Location: location });
}

function isLoopback(address: string | undefined): boolean {
	if (!address) return false;
	return address === '::1' || address.startsWith('127.') || address.startsWith('::ffff:127.');
}

/** success_url with Stripe's template variable filled in. */
export function successRedirect(rec: SessionRecord): string | null {
	return rec.session.success_url?.replaceAll('{CHECKOUT_SESSION_ID}', rec.session.id) ?? null;
}

function parseJsonBody(body: string): Record<string, unknown> {
	if (body.trim() === '') return {};
	let value: unknown;
	try {
		value = JSON.parse(body);
	} catch {
		throw new HttpError(400, 'Control routes take a JSON body');
	}
	if (typeof value !== 'object' || value === null || Array.isArray(value))
		throw new HttpError(400, 'The JSON body must be an object');
	return value as Record<string, unknown>;
}

function optionalNumber(body: Record<string, unknown>, key: string): number | undefined {
	const v = body[key];
	if (v === undefined) return undefined;
	if (typeof v !== 'number' || !Number.isFinite(v)) throw new HttpError(400, `${key} must be a number`);
	return v;
}

function optionalString(body: Record<string, unknown>, key: string): string | null {
	const v = body[key];
	if (v === undefined || v === null) return null;
	if (typeof v !== 'string' || v === '') throw new HttpError(400, `${key} must be a non-empty string`);
	return v;
}

function putAccountInput(body: Record<string, unknown>): PutAccountInput {
	const country = optionalString(body, 'country')?.toUpperCase() ?? null;
	if (country !== null && !/^[A-Z]{2}$/.test(country)) throw new HttpError(400, 'country must be two letters');
	const currency = optionalString(body, 'default_currency')?.toLowerCase() ?? null;
	if (currency !== null && !/^[a-z]{3}$/.test(currency)) throw new HttpError(400, 'default_currency must be three letters');
	const completed = body.completed;
	if (completed !== undefined && typeof completed !== 'boolean') throw new HttpError(400, 'completed must be true or false');
	return {
		country,
		email: optionalString(body, 'email'),
		defaultCurrency: currency,
		businessName: optionalString(body, 'business_name'),
		completed: completed ?? null
	};
}

export async function startStripeFake(options: StripeFakeOptions = {}): Promise<StripeFake> {
	const host = options.host ?? '127.0.0.1';
	const state = new StripeFakeState({
		now: options.now ?? Date.now,
		publicUrl: options.publicUrl ?? '',
		apiVersion: options.apiVersion ?? DEFAULT_API_VERSION,
		onEvent: (event) => dispatcher.enqueue(event),
		willDeliver: (type, account) => dispatcher.willDeliver(type, account)
	});
	const dispatcher: WebhookDispatcher = new WebhookDispatcher(state, {
		url: options.webhookUrl === undefined ? 'http://127.0.0.1:3000/api/stripe/webhook' : options.webhookUrl || null,
		secret: options.webhookSecret ?? 'whsec_slateroom_local',
		connectUrl: options.connectWebhookUrl || null,
		connectSecret: options.connectWebhookSecret ?? 'whsec_slateroom_connect_local',
		retryDelaysMs: options.retryDelaysMs ?? DEFAULT_RETRY_DELAYS_MS,
		timeoutMs: options.deliveryTimeoutMs ?? 10_000,
		enabledEvents: options.enabledEvents ?? ['*']
	});

	// ---- hosted pay page -------------------------------------------------------------------
	async function handlePay(req: http.IncomingMessage, res: http.ServerResponse, path: string, query: URLSearchParams) {
		const m = /^\/pay\/([A-Za-z0-9_]+)(?:\/(pay|decline|pay-later|abandon))?$/.exec(path);
		const id = m?.[1];
		if (!m || !id) return sendHtml(res, 404, renderNotFound(path));
		const rec = state.getSessionRecord(id);
		if (!rec) return sendHtml(res, 404, renderNotFound(id));
		const action = m[2];
		const base = `/pay/${id}`;
		if (!action) {
			if (req.method !== 'GET' && req.method !== 'HEAD') return send(res, 405, '', { Allow: 'GET' });
			const n = query.get('notice');
			const notice: PayNotice = n === 'declined' || n === 'not-open' || n === 'refused' ? n : null;
			const account = state.ownerOf(id);
			const payee = account === null ? null : (state.accounts.get(account) ?? null);
			return sendHtml(res, 200, renderPayPage(rec, notice, successRedirect(rec), payee));
		}
		if (req.method !== 'POST') return send(res, 405, '', { Allow: 'POST' });
		const form = parseForm(await readBody(req));
		const email = typeof form.email === 'string' && form.email.includes('@') ? form.email : null;
		if (rec.session.status !== 'open') return redirect(res, `${base}?notice=not-open`);
		if (action === 'abandon') {
			state.expireSession(id, NO_REQUEST, ALL_ACCOUNTS);
			return redirect(res, rec.session.cancel_url ?? base);
		}
		const method: PayMethod = action === 'decline' ? 'decline' : action === 'pay-later' ? 'delayed' : 'card';
		try {
			state.pay(id, method, email);
		} catch (e) {
			// The studio's account lost the right to take charges after the session was made.
			if (e instanceof StripeApiError && e.code === 'charges_not_enabled') return redirect(res, `${base}?notice=refused`);
			throw e;
		}
		if (method === 'decline') return redirect(res, `${base}?notice=declined`);
		return redirect(res, successRedirect(rec) ?? base);
	}

	// ---- onboarding page of account links -----------------------------------------------------
	async function handleOnboard(req: http.IncomingMessage, res: http.ServerResponse, path: string) {
		const m = /^\/connect\/onboard\/([A-Za-z0-9]+)(?:\/(complete|leave))?$/.exec(path);
		const token = m?.[1];
		if (!m || !token || !state.accountLinks.has(token)) return sendHtml(res, 404, renderNotFound(path));
		const action = m[2];
		if (!action) {
			// Only GET: opening uses the link up, so a HEAD must not.
			if (req.method !== 'GET') return send(res, 405, '', { Allow: 'GET' });
			const opened = state.openAccountLink(token);
			if (!opened) return sendHtml(res, 404, renderNotFound(path));
			if (!opened.show) return redirect(res, opened.link.refreshUrl);
			return sendHtml(res, 200, renderOnboardPage(state.requireAccount(opened.link.account), `/connect/onboard/${token}`));
		}
		if (req.method !== 'POST') return send(res, 405, '', { Allow: 'POST' });
		await readBody(req);
		const to = state.finishAccountLink(token, action === 'complete' ? 'complete' : 'leave');
		if (!to) return sendHtml(res, 404, renderNotFound(path));
		return redirect(res, to);
	}

	// ---- test controls ---------------------------------------------------------------------
	async function handleControl(req: http.IncomingMessage, res: http.ServerResponse, path: string, query: URLSearchParams) {
		if (!isLoopback(req.socket.remoteAddress)) throw new HttpError(403, 'Test controls answer on loopback only');
		const body = req.method === 'POST' || req.method === 'PUT' ? parseJsonBody(await readBody(req)) : {};
		const route = `${req.method} ${path}`;

		if (route === 'GET /_control/health') return sendJson(res, 200, { ok: true });
		if (route === 'POST /_control/reset') {
			dispatcher.reset();
			state.reset();
			return sendJson(res, 200, { ok: true });
		}
		if (route === 'GET /_control/deliveries') {
			const event = query.get('event');
			const type = query.get('type');
			const endpoint = query.get('endpoint');
			const data = state.deliveries.filter(
				(d) => (!event || d.eventId === event) && (!type || d.type === type) && (!endpoint || d.endpoint === endpoint)
			);
			return sendJson(res, 200, { object: 'list', data, held: dispatcher.heldCount });
		}
		if (route === 'GET /_control/sessions') {
			state.sweep();
			const account = query.get('account');
			const data = [...state.sessions.values()]
				.reverse()
				.map((r) => r.session)
				.filter((s) => account === null || state.ownerOf(s.id) === (account === 'platform' ? null : account));
			return sendJson(res, 200, { object: 'list', data });
		}
		if (route === 'GET /_control/accounts') {
			return sendJson(res, 200, { object: 'list', data: [...state.accounts.values()].reverse() });
		}
		const accountRoute = /^(GET|PUT|POST) \/_control\/accounts\/([A-Za-z0-9_]+)(?:\/(complete|requirements))?$/.exec(route);
		if (accountRoute?.[2]) {
			const [, method, id, action] = accountRoute;
			if (method === 'GET' && !action) return sendJson(res, 200, state.requireAccount(id));
			if (method === 'PUT' && !action) {
				if (!/^acct_[A-Za-z0-9]+$/.test(id)) throw new HttpError(400, 'An account id is acct_ followed by letters and digits');
				const { account, created } = state.putAccount(id, putAccountInput(body));
				return sendJson(res, created ? 201 : 200, account);
			}
			if (method === 'POST' && action === 'complete') return sendJson(res, 200, state.completeAccount(id));
			if (method === 'POST' && action === 'requirements') {
				const due = body.currently_due;
				if (!Array.isArray(due) || !due.every((x): x is string => typeof x === 'string' && x !== '')) {
					throw new HttpError(400, 'currently_due must be an array of requirement names');
				}
				return sendJson(res, 200, state.setRequirements(id, due));
			}
			throw new HttpError(404, `No control route ${route}`);
		}
		if (route === 'POST /_control/hold-deliveries') {
			dispatcher.hold();
			return sendJson(res, 200, { held: true });
		}
		if (route === 'POST /_control/release-deliveries') {
			const order =
				(query.get('order') ?? (typeof body.order === 'string' ? body.order : 'fifo')) === 'reverse' ? 'reverse' : 'fifo';
			const released = await dispatcher.release(order);
			return sendJson(res, 200, { released, order });
		}
		if (route === 'POST /_control/next-refund-fails') {
			const failureReason = typeof body.failureReason === 'string' ? body.failureReason : 'expired_or_canceled_card';
			const delayMs = optionalNumber(body, 'delayMs') ?? 200;
			state.nextRefundFailure = { failureReason, delayMs };
			return sendJson(res, 200, { ok: true, failure_reason: failureReason, delay_ms: delayMs });
		}

		const resend = /^POST \/_control\/events\/([A-Za-z0-9_]+)\/resend$/.exec(route);
		if (resend?.[1]) {
			const event = state.eventsById.get(resend[1]);
			if (!event) throw err.noSuch('event', resend[1]);
			const endpoint = dispatcher.endpointOf(event);
			if (!endpoint.url) throw new HttpError(409, `No ${endpoint.name} webhook URL is configured`);
			const signature = body.signature === 'bad' ? 'bad' : 'valid';
			const timestampOffsetSeconds = optionalNumber(body, 'timestampOffsetSeconds') ?? 0;
			const delayMs = optionalNumber(body, 'delayMs') ?? 0;
			dispatcher.resend(event, { signature, timestampOffsetSeconds, delayMs });
			return sendJson(res, 202, {
				event: event.id,
				signature,
				timestamp_offset_seconds: timestampOffsetSeconds,
				delay_ms: delayMs
			});
		}

		const sessionRoute =
			/^(GET|POST) \/_control\/sessions\/([A-Za-z0-9_]+)(?:\/(pay|decline|pay-later|abandon|expire|settle))?$/.exec(route);
		if (sessionRoute?.[2]) {
			const [, method, id, action] = sessionRoute;
			const describe = (rec: SessionRecord, redirectUrl: string | null) => ({
				account: state.ownerOf(rec.session.id),
				session: rec.session,
				line_items: rec.lineItems,
				payment_intent: rec.session.payment_intent ? (state.paymentIntents.get(rec.session.payment_intent) ?? null) : null,
				redirect_url: redirectUrl
			});
			if (method === 'GET' && !action) return sendJson(res, 200, describe(state.requireSession(id, ALL_ACCOUNTS), null));
			if (method !== 'POST' || !action) throw new HttpError(404, `No control route ${route}`);
			const email = typeof body.email === 'string' ? body.email : null;
			switch (action) {
				case 'pay':
					return sendJson(
						res,
						200,
						describe(state.pay(id, 'card', email), successRedirect(state.requireSession(id, ALL_ACCOUNTS)))
					);
				case 'decline':
					return sendJson(res, 200, describe(state.pay(id, 'decline', email), null));
				case 'pay-later':
					return sendJson(
						res,
						200,
						describe(state.pay(id, 'delayed', email), successRedirect(state.requireSession(id, ALL_ACCOUNTS)))
					);
				case 'abandon':
				case 'expire': {
					state.expireSession(id, NO_REQUEST, ALL_ACCOUNTS);
					const rec = state.requireSession(id, ALL_ACCOUNTS);
					return sendJson(res, 200, describe(rec, action === 'abandon' ? rec.session.cancel_url : null));
				}
				case 'settle': {
					const outcome = body.outcome === 'fail' || body.outcome === 'failed' ? 'fail' : 'succeed';
					return sendJson(res, 200, describe(state.settle(id, outcome), null));
				}
			}
		}
		throw new HttpError(404, `No control route ${route}`);
	}

	// ---- the server ------------------------------------------------------------------------
	async function handle(req: http.IncomingMessage, res: http.ServerResponse): Promise<void> {
		const parsed = new URL(req.url ?? '/', 'http://fake.invalid');
		const path = parsed.pathname;
		const method = req.method ?? 'GET';
		try {
			if (path.startsWith('/v1/')) {
				const body = method === 'POST' ? await readBody(req) : '';
				const out = handleApi(state, {
					method,
					path,
					query: parsed.search.slice(1),
					body,
					headers: req.headers
				});
				return send(res, out.status, out.body, {
					'Content-Type': 'application/json',
					...out.headers
				});
			}
			if (path === '/pay' || path.startsWith('/pay/')) return await handlePay(req, res, path, parsed.searchParams);
			if (path.startsWith('/connect/onboard/')) return await handleOnboard(req, res, path);
			if (path.startsWith('/_control/')) return await handleControl(req, res, path, parsed.searchParams);
			throw err.noSuch('route', `${method} ${path}`);
		} catch (e) {
			if (res.headersSent) return;
			if (e instanceof StripeApiError) return sendJson(res, e.status, e.toBody());
			if (e instanceof HttpError) {
				const error = { type: 'invalid_request_error', message: e.message };
				return sendJson(res, e.status, { error });
			}
			if (e instanceof FormParseError)
				return sendJson(res, 400, { error: { type: 'invalid_request_error', message: e.message } });
			const message = e instanceof Error ? e.message : String(e);
			return sendJson(res, 500, {
				error: { type: 'api_error', message: `The Stripe fake failed: ${message}` }
			});
		}
	}

	const server = http.createServer((req, res) => void handle(req, res));
	server.keepAliveTimeout = 1000;
	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(options.port ?? 12111, host, () => {
			server.off('error', reject);
			resolve();
		});
	});
	const port = (server.address() as AddressInfo).port;
	const url = `http://${host.includes(':') ? `[${host}]` : host}:${port}`;
	if (!options.publicUrl) state.publicUrl = url;

	const sweep = setInterval(() => state.sweep(), options.sweepIntervalMs ?? 1000);
	sweep.unref();

	let closing: Promise<void> | null = null;
	return {
		url,
		port,
		state,
		webhooks: dispatcher,
		close() {
			closing ??= new Promise<void>((resolve) => {
				clearInterval(sweep);
				dispatcher.reset();
				state.clearTimers();
				server.close(() => resolve());
				server.closeAllConnections();
			});
			return closing;
		}
	};
}

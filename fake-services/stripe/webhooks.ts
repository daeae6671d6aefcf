/**
 * Webhook delivery, as Stripe documents it: signed POSTs of the event JSON, at least once, in no
 * guaranteed order, retried with back-off on any non-2xx answer or connection error.
 *
 * Two endpoints, as a Connect platform has them: the platform's own (events of the platform's
 * objects) and the Connect endpoint (events of connected accounts, which carry `account`), each
 * with its own signing secret.
 */
import http from 'node:http';
import https from 'node:https';
import type { StripeEvent } from './objects.js';
import { signatureHeader } from './signing.js';
import type { DeliveryRecord, StripeFakeState } from './state.js';

export const DEFAULT_RETRY_DELAYS_MS = [500, 1000, 2000, 4000, 8000, 16000, 30000, 30000];

export interface DispatcherOptions {
	/** The platform endpoint; null: its events are recorded but not sent anywhere. */
	url: string | null;
	secret: string;
	/** The Connect endpoint, for events of connected accounts; null: recorded, not sent. */
	connectUrl: string | null;
	connectSecret: string;
	/** Delay before each automatic retry; its length bounds the retries (tries = length + 1). */
	retryDelaysMs: number[];
	/** How long one attempt may take before it counts as a connection error. */
	timeoutMs: number;
	/** Event types sent to the endpoint: '*' for all, exact types, or 'prefix.*'. */
	enabledEvents: string[];
}

export interface ResendOptions {
	signature?: 'valid' | 'bad';
	timestampOffsetSeconds?: number;
	delayMs?: number;
}

interface Attempt {
	event: StripeEvent;
	kind: DeliveryRecord['kind'];
	/** 1-based position in the automatic chain (initial + retries); resends are always 1. */
	tries: number;
	retry: boolean;
	signature: 'valid' | 'bad';
	timestampOffsetSeconds: number;
	generation: number;
}

type PostResult = { statusCode: number; error: null } | { statusCode: null; error: string };

export class WebhookDispatcher {
	private held = false;
	private heldQueue: Attempt[] = [];
	private readonly timers = new Set<NodeJS.Timeout>();
	private readonly inflight = new Set<http.ClientRequest>();
	private readonly attemptCounts = new Map<string, number>();
	private generation = 0;

	constructor(
		private readonly state: StripeFakeState,
		private readonly options: DispatcherOptions
	) {}

	get url(): string | null {
		return this.options.url;
	}

	get connectUrl(): string | null {
		return this.options.connectUrl;
	}

	/** The endpoint an event goes to: Connect for a connected account's event, else the platform's. */
	endpointOf(event: Pick<StripeEvent, 'account'>): { name: DeliveryRecord['endpoint']; url: string | null; secret: string } {
		return event.account === undefined
			? { name: 'platform', url: this.options.url, secret: this.options.secret }
			: { name: 'connect', url: this.options.connectUrl, secret: this.options.connectSecret };
	}

	get heldCount(): number {
		return this.heldQueue.length;
	}

	willDeliver(type: string, account: string | null = null): boolean {
		if (!this.endpointOf(account === null ? {} : { account }).url) return false;
		return this.options.enabledEvents.some(
			(p) => p === '*' || p === type || (p.endsWith('.*') && type.startsWith(p.slice(0, -1)))
		);
	}

	enqueue(event: StripeEvent): void {
		if (!this.willDeliver(event.type, event.account ?? null)) return;
		this.schedule(this.attempt(event, 'initial', true, 'valid', 0), 0);
	}

	resend(event: StripeEvent, opts: ResendOptions = {}): void {
		if (!this.endpointOf(event).url) throw new Error(`No ${this.endpointOf(event).name} webhook URL is configured`);
		this.schedule(
			this.attempt(event, 'resend', false, opts.signature ?? 'valid', opts.timestampOffsetSeconds ?? 0),
			Math.max(0, opts.delayMs ?? 0)
		);
	}

	hold(): void {
		this.held = true;
	}

	/** Stops holding and sends what was held, one after another, in the order asked for. */
	async release(order: 'fifo' | 'reverse'): Promise<number> {
		this.held = false;
		const queue = this.heldQueue.splice(0);
		if (order === 'reverse') queue.reverse();
		for (const a of queue) await this.send(a);
		return queue.length;
	}

	/** Forgets every pending and held delivery; answers to in-flight ones are ignored. */
	reset(): void {
		this.generation++;
		for (const t of this.timers) clearTimeout(t);
		this.timers.clear();
		for (const req of this.inflight) req.destroy();
		this.inflight.clear();
		this.heldQueue = [];
		this.held = false;
		this.attemptCounts.clear();
	}

	private attempt(
		event: StripeEvent,
		kind: Attempt['kind'],
		retry: boolean,
		signature: 'valid' | 'bad',
		timestampOffsetSeconds: number
	): Attempt {
		return {
			event,
			kind,
			tries: 1,
			retry,
			signature,
			timestampOffsetSeconds,
			generation: this.generation
		};
	}

	private schedule(a: Attempt, delayMs: number): void {
		const timer = setTimeout(() => {
			this.timers.delete(timer);
			if (a.generation !== this.generation) return;
			if (this.held) this.heldQueue.push(a);
			else void this.send(a);
		}, delayMs);
		this.timers.add(timer);
	}

	private async send(a: Attempt): Promise<void> {
		const endpoint = this.endpointOf(a.event);
		const url = endpoint.url;
		if (!url || a.generation !== this.generation) return;
		const body = JSON.stringify(a.event, null, 2);
		// Signatures use the real clock even when the fake runs on a test clock: the receiver
		// checks the timestamp against its own clock (Stripe's default tolerance is 300 s).
		const timestamp = Math.floor(Date.now() / 1000) + a.timestampOffsetSeconds;
		const secret = a.signature === 'bad' ? `${endpoint.secret}_wrong` : endpoint.secret;
		const attemptNo = (this.attemptCounts.get(a.event.id) ?? 0) + 1;
		this.attemptCounts.set(a.event.id, attemptNo);
		const started = Date.now();
		const result = await this.post(url, body, signatureHeader(body, secret, timestamp));
		if (a.generation !== this.generation) return;
		const record: DeliveryRecord = {
			eventId: a.event.id,
			type: a.event.type,
			endpoint: endpoint.name,
			attempt: attemptNo,
			kind: a.kind,
			url,
			statusCode: result.statusCode,
			error: result.error,
			signature: a.signature,
			timestamp,
			at: new Date(started).toISOString(),
			durationMs: Date.now() - started
		};
		this.state.deliveries.push(record);
		const ok = result.statusCode !== null && result.statusCode >= 200 && result.statusCode < 300;
		if (ok && a.kind !== 'resend') a.event.pending_webhooks = 0;
		if (!ok && a.retry && a.tries <= this.options.retryDelaysMs.length) {
			const delay = this.options.retryDelaysMs[a.tries - 1] ?? 0;
			this.schedule({ ...a, kind: 'retry', tries: a.tries + 1 }, delay);
		}
	}

	private post(url: string, body: string, signature: string): Promise<PostResult> {
		return new Promise((resolve) => {
			let settled = false;
			const done = (r: PostResult) => {
				if (settled) return;
				settled = true;
				this.inflight.delete(req);
				resolve(r);
			};
			const target = new URL(url);
			const lib = target.protocol === 'https:' ? https : http;
			const req = lib.request(
				target,
				{
					method: 'POST',
					agent: false,
					timeout: this.options.timeoutMs,
					headers: {
						'Content-Type': 'application/json; charset=utf-8',
						'Content-Length': Buffer.byteLength(body),
						'Stripe-Signature': signature,
						'User-Agent': 'Stripe/1.0 (+https://stripe.com/docs/webhooks)',
						Accept: '*/*; q=0.5, application/xml',
						'Cache-Control': 'no-cache',
						Connection: 'close'
					}
				},
				(res) => {
					const statusCode = res.statusCode ?? 0;
					res.resume();
					res.on('end', () => done({ statusCode, error: null }));
					res.on('error', () => done({ statusCode, error: null }));
				}
			);
			this.inflight.add(req);
			req.on('timeout', () => req.destroy(new Error(`timed out after ${this.options.timeoutMs} ms`)));
			req.on('error', (e) => done({ statusCode: null, error: e.message || String(e) }));
			req.on('close', () => done({ statusCode: null, error: 'connection closed' }));
			req.end(body);
		});
	}
}

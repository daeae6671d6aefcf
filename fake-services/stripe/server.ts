/**
 * CLI entry: `node --import tsx fake-services/stripe/server.ts`
 *
 *   STRIPE_FAKE_PORT          default 12111
 *   STRIPE_FAKE_HOST          default 127.0.0.1
 *   STRIPE_FAKE_PUBLIC_URL    base of Checkout Session urls; default http://<host>:<port>
 *   STRIPE_WEBHOOK_URL        default http://127.0.0.1:3000/api/stripe/webhook ('none' or '' sends nothing)
 *   STRIPE_WEBHOOK_SECRET     default whsec_slateroom_local
 *   STRIPE_CONNECT_WEBHOOK_URL     events of connected accounts; default none (recorded, not sent)
 *   STRIPE_CONNECT_WEBHOOK_SECRET  default whsec_slateroom_connect_local
 *   STRIPE_WEBHOOK_EVENTS     comma-separated event types to deliver, '*' (default) or 'prefix.*'
 *   STRIPE_FAKE_RETRY_DELAYS_MS  comma-separated retry delays, e.g. 500,1000,2000
 */
import { startStripeFake } from './app.js';

function intEnv(name: string, fallback: number): number {
	const raw = process.env[name];
	if (raw === undefined || raw === '') return fallback;
	const n = Number(raw);
	if (!Number.isInteger(n) || n < 0 || n > 65535) throw new Error(`${name} must be a port number, got '${raw}'`);
	return n;
}

function listEnv(name: string): string[] | undefined {
	const raw = process.env[name];
	if (raw === undefined || raw.trim() === '') return undefined;
	return raw
		.split(',')
		.map((s) => s.trim())
		.filter(Boolean);
}

const port = intEnv('STRIPE_FAKE_PORT', 12111);
const host = process.env.STRIPE_FAKE_HOST || '127.0.0.1';
const rawWebhook = process.env.STRIPE_WEBHOOK_URL;
const webhookUrl =
	rawWebhook === undefined
		? 'http://127.0.0.1:3000/api/stripe/webhook'
		: rawWebhook === '' || rawWebhook === 'none'
			? null
			: rawWebhook;
const rawConnect = process.env.STRIPE_CONNECT_WEBHOOK_URL;
const connectWebhookUrl = rawConnect === undefined || rawConnect === '' || rawConnect === 'none' ? null : rawConnect;
const retryDelaysMs = listEnv('STRIPE_FAKE_RETRY_DELAYS_MS')?.map((s) => {
	const n = Number(s);
	if (!Number.isFinite(n) || n < 0) throw new Error(`STRIPE_FAKE_RETRY_DELAYS_MS has a bad delay '${s}'`);
	return n;
});

const fake = await startStripeFake({
	port,
	host,
	publicUrl: process.env.STRIPE_FAKE_PUBLIC_URL || undefined,
	webhookUrl,
	webhookSecret: process.env.STRIPE_WEBHOOK_SECRET || 'whsec_slateroom_local',
	connectWebhookUrl,
	connectWebhookSecret: process.env.STRIPE_CONNECT_WEBHOOK_SECRET || 'whsec_slateroom_connect_local',
	enabledEvents: listEnv('STRIPE_WEBHOOK_EVENTS'),
	retryDelaysMs
});

console.log(
	`stripe fake listening on ${fake.url} (pay pages at ${fake.state.publicUrl}/pay/:id, webhooks to ${webhookUrl ?? 'nowhere'}, Connect webhooks to ${connectWebhookUrl ?? 'nowhere'})`
);

let stopping = false;
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
	process.on(signal, () => {
		if (stopping) return;
		stopping = true;
		void fake.close().then(() => process.exit(0));
	});
}

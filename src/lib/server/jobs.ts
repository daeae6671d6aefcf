// Work that happens on its own, without anyone visiting a page, every one of it named here and
// started from start-up (hooks.server.ts) and stopped on shutdown. It runs on pg-boss, a job
// queue kept in PostgreSQL (schema `pgboss`, created by pg-boss itself when it starts), so that
// with several app instances each piece runs once at a time, a failure is retried with back-off,
// and what was scheduled survives a restart:
// - holds whose time ran out free their slot;
// - Checkout Sessions of holds that lapsed are expired, and sessions no webhook told us about are
//   reconciled; refunds recorded but not sent are sent (payments/jobs.ts, payments/refunds.ts);
// - the e-mail outbox is sent;
// - files a crash left behind are removed;
// - scheduled e-mails (reminders, balance requests, receipts) are sent at their time, one job per
//   message (messages/), and a safety sweep plans what a lost step left unplanned.
//
// How the sweeps repeat: pg-boss's cron (`schedule`) has a one-minute granularity, and holds and
// the outbox want about 15 s. So each sweep is a queue with the `stately` policy (at most one job
// waiting and one running per key, across every instance: a second `send` while one waits is
// dropped by pg-boss's unique index), and each run ends by sending the next one 15 s ahead
// (`startAfter`). A chain broken by an outage (the next `send` failed) is picked up again by a
// once-a-minute `schedule` of the same job, which the stately policy also drops while a run is
// already waiting. Start-up sends one at once. The outbox is also nudged in-process right after a
// message is queued (mail/outbox.ts flushSoon); its row locks keep a message from going twice.
import PgBoss from 'pg-boss';
import { env } from '$env/dynamic/private';
import { expireLapsedHolds } from './bookings/occupancy';
import { sweepCheckouts } from './payments/jobs';
import { sweepRefunds } from './payments/refunds';
import { flushOutbox } from './mail/outbox';
import { sweepStraysNow } from './uploads';
import { deliverMessage, sweepMessages, type MessageJob } from './messages';
import { MESSAGE_QUEUE, setQueue } from './queue';

interface Sweep {
	name: string;
	run: () => Promise<unknown>;
}

/** Every sweep; each is a queue of its own, so a failure of one never keeps the others from running. */
const SWEEPS: Sweep[] = [
	{ name: 'sweep-holds', run: () => expireLapsedHolds() },
	{ name: 'sweep-checkouts', run: () => sweepCheckouts() },
	{ name: 'sweep-refunds', run: () => sweepRefunds() },
	{ name: 'sweep-outbox', run: () => flushOutbox() },
	{ name: 'sweep-uploads', run: () => sweepStraysNow() },
	{ name: 'sweep-messages', run: () => sweepMessages() }
];

/** Seconds between the end of one sweep and the start of the next. */
const SWEEP_EVERY_SECONDS = 15;
/** The one key of a sweep's jobs (the stately policy keeps one waiting and one running per key). */
const TICK = 'tick';
/** How often an idle worker asks for work; a job waits at most this long after its time. */
const POLL_SECONDS = 1;
/** After a failed start (the database is down), try again this much later. */
const RESTART_AFTER_MS = 5_000;

const SWEEP_QUEUE: Omit<PgBoss.Queue, 'name'> = {
	policy: 'stately',
	// A sweep that fails is tried again with back-off (and the next tick comes anyway).
	retryLimit: 2,
	retryDelay: 5,
	retryBackoff: true,
	// A sweep that hangs (a lock pile-up) is given up after this and retried.
	expireInSeconds: 300
};

const MESSAGE_QUEUE_OPTIONS: Omit<PgBoss.Queue, 'name'> = {
	policy: 'stately',
	// A message whose send fails (the database busy) is tried again: 30 s, 1 min, 2 min… (back-off).
	retryLimit: 8,
	retryDelay: 30,
	retryBackoff: true,
	expireInSeconds: 120
};

let started = false;
let stopping = false;
let boss: PgBoss | null = null;
let restartTimer: ReturnType<typeof setTimeout> | null = null;

/** Logs a queue error at most once a minute per message: an outage repeats the same one every poll. */
const lastLogged = new Map<string, number>();
function logError(e: unknown) {
	const message = String((e as Error)?.message ?? e);
	const now = Date.now();
	if (now - (lastLogged.get(message) ?? 0) < 60_000) return;
	lastLogged.set(message, now);
	console.warn('[jobs]', message);
}

async function startQueue(): Promise<void> {
	const url = env.DATABASE_URL;
	if (!url) return;
	const b = new PgBoss({
		connectionString: url,
		schema: 'pgboss',
		application_name: 'slateroom-jobs',
		// Its own few connections, apart from the requests' pool.
		max: 4
	});
	// pg-boss reports a failed poll (the database down) as an 'error' event; without a listener
	// Node would treat it as an uncaught error and stop the app.
	b.on('error', logError);
	try {
		await b.start();
		for (const s of SWEEPS) await b.createQueue(s.name, { name: s.name, ...SWEEP_QUEUE });
		await b.createQueue(MESSAGE_QUEUE, { name: MESSAGE_QUEUE, ...MESSAGE_QUEUE_OPTIONS });
		// Open for scheduling before the first sweep runs (it may plan messages).
		setQueue(b);
		for (const s of SWEEPS) {
			await b.schedule(s.name, '* * * * *', {}, { singletonKey: TICK });
			await b.work(s.name, { pollingIntervalSeconds: POLL_SECONDS }, async () => {
				try {
					await s.run();
				} finally {
					if (!stopping) {
						await b.send(s.name, {}, { singletonKey: TICK, startAfter: SWEEP_EVERY_SECONDS }).catch(logError);
					}
				}
			});
			await b.send(s.name, {}, { singletonKey: TICK });
		}
		await b.work<MessageJob>(MESSAGE_QUEUE, { pollingIntervalSeconds: POLL_SECONDS, batchSize: 1 }, async (jobs) => {
			for (const job of jobs) await deliverMessage(job.data);
		});
		if (stopping) {
			setQueue(null);
			await b.stop({ graceful: false, timeout: 1000 }).catch(logError);
			return;
		}
		boss = b;
	} catch (e) {
		logError(e);
		setQueue(null);
		// A start that failed half-way leaves its pool open: close it, and start afresh later.
		await b.stop({ graceful: false, timeout: 1000 }).catch(() => {});
		if (!stopping) {
			restartTimer = setTimeout(() => void startQueue(), RESTART_AFTER_MS);
			restartTimer.unref();
		}
	}
}

/** Starts the queue and its workers (once per process); a database that is down is tried again later. */
export function startBackgroundJobs() {
	if (started) return;
	started = true;
	stopping = false;
	void startQueue();
}

/**
 * Stops the workers on shutdown: a job running gets a moment to finish, then pg-boss closes its
 * connections. Jobs waiting stay in the database for the next start (this instance's or another's).
 */
export async function stopBackgroundJobs(): Promise<void> {
	stopping = true;
	started = false;
	if (restartTimer) clearTimeout(restartTimer);
	restartTimer = null;
	const b = boss;
	boss = null;
	setQueue(null);
	if (b) await b.stop({ graceful: true, timeout: 2000, close: true }).catch(logError);
}

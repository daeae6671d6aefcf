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
// (`startAfter`). A chain broken by an outage (the next `send` failed) is picked up again by every
// instance sending each sweep once a minute, which the stately policy drops while one waits.
//
// How jobs are taken: each instance asks every queue for its next job (`fetch`) once a second
// when idle, runs it, and marks it done (`complete`) or failed (`fail`, which retries it with
// back-off), each awaited and its failure caught. pg-boss's own `work` loop and its cron
// timekeeper are not used: in 10.4 they mark a job done without awaiting it, and a connection
// the database ends at that moment (tests/outage/ stops it) would be an unhandled rejection that
// stops the whole app. The outbox is also nudged in-process right after a message is queued
// (mail/outbox.ts flushSoon); its row locks keep a message from going twice.
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
let reviveTimer: ReturnType<typeof setInterval> | null = null;
const pollTimers = new Set<ReturnType<typeof setTimeout>>();
/** Jobs running now, awaited (briefly) on shutdown. */
const running = new Set<Promise<unknown>>();

/** Logs a queue error at most once a minute per message: an outage repeats the same one every poll. */
const lastLogged = new Map<string, number>();
function logError(e: unknown) {
	const message = String((e as Error)?.message ?? e);
	const now = Date.now();
	if (now - (lastLogged.get(message) ?? 0) < 60_000) return;
	lastLogged.set(message, now);
	console.warn('[jobs]', message);
}

/** Takes the jobs of one queue, one at a time, for as long as the process runs; see the top of this file. */
function poll<T extends object>(b: PgBoss, name: string, handle: (data: T) => Promise<unknown>) {
	const runOne = async (): Promise<boolean> => {
		const [job] = await b.fetch<T>(name, { batchSize: 1 });
		if (!job) return false;
		try {
			await handle(job.data);
		} catch (e) {
			logError(e);
			await b.fail(name, job.id, { message: String((e as Error)?.message ?? e) });
			return true;
		}
		await b.complete(name, job.id);
		return true;
	};
	const loop = async () => {
		if (stopping) return;
		let worked = false;
		const turn = runOne();
		running.add(turn);
		try {
			worked = await turn;
		} catch (e) {
			logError(e);
		} finally {
			running.delete(turn);
		}
		if (stopping) return;
		const timer = setTimeout(
			() => {
				pollTimers.delete(timer);
				void loop();
			},
			worked ? 0 : POLL_SECONDS * 1000
		);
		timer.unref();
		pollTimers.add(timer);
	};
	void loop();
}

/** Sends the next run of each sweep unless one waits already (the stately policy drops the copy). */
async function sendSweeps(b: PgBoss) {
	for (const s of SWEEPS) await b.send(s.name, {}, { singletonKey: TICK }).catch(logError);
}

async function startQueue(): Promise<void> {
	const url = env.DATABASE_URL;
	if (!url) return;
	const b = new PgBoss({
		connectionString: url,
		schema: 'pgboss',
		application_name: 'slateroom-jobs',
		// Its own few connections, apart from the requests' pool.
		max: 4,
		// No cron timekeeper (see the top of this file); maintenance (expiring, archiving) stays on.
		schedule: false
	});
	// pg-boss reports a failed maintenance run (the database down) as an 'error' event; without a
	// listener Node would treat it as an uncaught error and stop the app.
	b.on('error', logError);
	try {
		await b.start();
		for (const s of SWEEPS) await b.createQueue(s.name, { name: s.name, ...SWEEP_QUEUE });
		await b.createQueue(MESSAGE_QUEUE, { name: MESSAGE_QUEUE, ...MESSAGE_QUEUE_OPTIONS });
		if (stopping) {
			await b.stop({ graceful: false, timeout: 1000 }).catch(logError);
			return;
		}
		// Open for scheduling before the first sweep runs (it may plan messages).
		boss = b;
		setQueue(b);
		for (const s of SWEEPS) {
			poll(b, s.name, async () => {
				try {
					await s.run();
				} finally {
					if (!stopping) {
						await b.send(s.name, {}, { singletonKey: TICK, startAfter: SWEEP_EVERY_SECONDS }).catch(logError);
					}
				}
			});
		}
		poll<MessageJob>(b, MESSAGE_QUEUE, (data) => deliverMessage(data));
		await sendSweeps(b);
		reviveTimer = setInterval(() => void sendSweeps(b), 60_000);
		reviveTimer.unref();
	} catch (e) {
		logError(e);
		setQueue(null);
		boss = null;
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
 * Stops taking jobs on shutdown: a job running gets a moment to finish, then pg-boss closes its
 * connections. Jobs waiting stay in the database for the next start (this instance's or another's).
 */
export async function stopBackgroundJobs(): Promise<void> {
	stopping = true;
	started = false;
	if (restartTimer) clearTimeout(restartTimer);
	restartTimer = null;
	if (reviveTimer) clearInterval(reviveTimer);
	reviveTimer = null;
	for (const t of pollTimers) clearTimeout(t);
	pollTimers.clear();
	const b = boss;
	boss = null;
	setQueue(null);
	const grace = new Promise((r) => setTimeout(r, 2000).unref());
	await Promise.race([Promise.allSettled([...running]), grace]);
	if (b) await b.stop({ graceful: false, timeout: 1000, close: true }).catch(logError);
}

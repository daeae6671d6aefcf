// Work that happens on its own, without anyone visiting a page, every one of it named here and
// started from start-up (hooks.server.ts) and stopped on shutdown:
// - holds whose time ran out free their slot;
// - Checkout Sessions of holds that lapsed are expired, and sessions no webhook told us about are
//   reconciled; refunds recorded but not sent are sent (payments/jobs.ts, payments/refunds.ts);
// - the e-mail outbox is sent;
// - files a crash left behind are removed.
import { databaseTrouble } from './db/trouble';
import { expireLapsedHolds } from './bookings/occupancy';
import { sweepCheckouts } from './payments/jobs';
import { sweepRefunds } from './payments/refunds';
import { flushOutbox } from './mail/outbox';
import { sweepStraysNow } from './uploads';

/** In order; each is tried on its own, so a failure of one never keeps the others from running. */
const PERIODIC_JOBS: Array<() => Promise<unknown>> = [
	() => expireLapsedHolds(),
	() => sweepCheckouts(),
	() => sweepRefunds(),
	() => flushOutbox(),
	() => sweepStraysNow()
];

let started = false;
let timer: ReturnType<typeof setInterval> | null = null;

export function startBackgroundJobs(intervalMs = 15_000) {
	if (started) return;
	started = true;
	let running = false;
	const tick = async () => {
		// A tick that outlasts the interval (a slow or busy database) is not joined by another, so
		// the jobs never pile up and take connections from requests; while the database is down
		// the rest of a tick is skipped.
		if (running) return;
		running = true;
		try {
			for (const job of PERIODIC_JOBS) {
				try {
					await job();
				} catch (e) {
					// The database may be down or busy for a while; the next tick tries again.
					console.warn('[jobs]', (e as Error).message);
					if (databaseTrouble(e) === 'down') break;
				}
			}
		} finally {
			running = false;
		}
	};
	timer = setInterval(() => void tick(), intervalMs);
	timer.unref();
	void tick();
}

/** Stops the periodic work (on shutdown); a tick already running finishes on its own. */
export function stopBackgroundJobs() {
	if (timer) clearInterval(timer);
	timer = null;
	started = false;
}

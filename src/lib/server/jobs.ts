// Work that happens on its own, without anyone visiting a page: expired holds free their slot.
import { and, eq, lt } from 'drizzle-orm';
import { db } from './db';
import { booking } from './db/schema';
import { databaseTrouble } from './db/trouble';

let started = false;
let timer: ReturnType<typeof setInterval> | null = null;

export async function expireStaleHolds(now = new Date()): Promise<number> {
	const rows = await db
		.update(booking)
		.set({ status: 'expired' })
		.where(and(eq(booking.status, 'held'), lt(booking.holdExpiresAt, now)))
		.returning({ id: booking.id });
	return rows.length;
}

const extraJobs: Array<() => Promise<unknown>> = [];

/** Other modules add their periodic work here (the mail outbox, for one). */
export function addPeriodicJob(job: () => Promise<unknown>) {
	extraJobs.push(job);
}

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
			for (const job of [expireStaleHolds, ...extraJobs]) {
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

// The job queue (pg-boss, in the `pgboss` schema of the app's own database): the running
// instance, once jobs.ts has started it, for modules that put work on it at a given time.
// Nothing here starts or stops it; jobs.ts does, from start-up.
import type PgBoss from 'pg-boss';

/** The queue of scheduled e-mails: one job per message and due time (messages/). */
export const MESSAGE_QUEUE = 'booking-message';

let current: PgBoss | null = null;

export function setQueue(boss: PgBoss | null) {
	current = boss;
}

/** The running queue, or null while it is not started (the database was down at start-up, or a script). */
export function queue(): PgBoss | null {
	return current;
}

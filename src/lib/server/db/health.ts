// What the app says when the database is down or busy, and asking whether it answers. The app
// recovers by itself when the server comes back: postgres.js reconnects on demand (client.ts).
import { pool, sqlClient } from './index';
import { databaseTrouble, type DatabaseTrouble } from './trouble';

export { databaseTrouble, type DatabaseTrouble } from './trouble';

export const DATABASE_UNAVAILABLE =
	'The studio’s database is not answering right now. Nothing was lost; please try again in a minute.';

export const DATABASE_BUSY =
	'The studio is very busy right now and could not get to this request in time. Please try again in a few seconds.';

/** The JSON error code, the words and the Retry-After seconds (RFC 9110, section 10.2.3) of each kind of trouble. */
export const TROUBLE_ANSWER: Record<DatabaseTrouble, { error: string; message: string; retryAfter: number }> = {
	down: { error: 'unavailable', message: DATABASE_UNAVAILABLE, retryAfter: 10 },
	busy: { error: 'busy', message: DATABASE_BUSY, retryAfter: 2 }
};

/** The server cannot be reached (refused, reset, shutting down…); a busy server is not down. */
export function isDatabaseDown(e: unknown): boolean {
	return databaseTrouble(e) === 'down';
}

/**
 * 'up', 'busy' or 'down', within `timeoutMs`: busy when no connection came free in that time (the
 * server is there, every connection is at work), down when the server refused or did not answer.
 */
export async function databaseState(timeoutMs = 3000): Promise<'up' | DatabaseTrouble> {
	const deadline = Date.now() + timeoutMs;
	let release = () => {};
	try {
		if (pool) release = await pool.acquire(timeoutMs);
	} catch (e) {
		return databaseTrouble(e) ?? 'busy';
	}
	let timer: ReturnType<typeof setTimeout> | undefined;
	const query = sqlClient`select 1`.execute();
	// The turn ends when the query does, even if the answer below has been given already.
	query.then(release, release);
	try {
		await Promise.race([
			query,
			new Promise((_, reject) => {
				timer = setTimeout(() => reject(new Error('no answer in time')), Math.max(0, deadline - Date.now()));
			})
		]);
		return 'up';
	} catch (e) {
		return databaseTrouble(e) ?? 'down';
	} finally {
		clearTimeout(timer);
	}
}

/** Does the database answer (up, or up and busy) within the time allowed? */
export async function databaseAnswers(timeoutMs = 3000): Promise<boolean> {
	return (await databaseState(timeoutMs)) !== 'down';
}

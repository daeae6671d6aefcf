// Telling "the database is down" apart from other failures, so the app can say so plainly
// (503) and recover by itself when the server comes back: postgres.js reconnects on demand.
import { sql } from 'drizzle-orm';
import { db } from './index';

export const DATABASE_UNAVAILABLE =
	'The studio’s database is not answering right now. Nothing was lost; please try again in a minute.';

const DOWN_CODES = new Set([
	'ECONNREFUSED',
	'ECONNRESET',
	'ETIMEDOUT',
	'CONNECT_TIMEOUT',
	'CONNECTION_CLOSED',
	'CONNECTION_ENDED',
	'CONNECTION_DESTROYED',
	'57P01',
	'57P03',
	'08006',
	'08001',
	'08004'
]);

export function isDatabaseDown(e: unknown): boolean {
	for (let cur: unknown = e, depth = 0; cur && depth < 5; depth++) {
		const code = (cur as { code?: unknown }).code;
		if (typeof code === 'string' && DOWN_CODES.has(code)) return true;
		const errno = (cur as { errno?: unknown }).errno;
		if (typeof errno === 'string' && DOWN_CODES.has(errno)) return true;
		cur = (cur as { cause?: unknown }).cause;
	}
	return false;
}

/** Does the database answer a trivial query within the time allowed? */
export async function databaseAnswers(timeoutMs = 3000): Promise<boolean> {
	let timer: ReturnType<typeof setTimeout> | undefined;
	try {
		await Promise.race([
			db.execute(sql`select 1`),
			new Promise((_, reject) => {
				timer = setTimeout(() => reject(new Error('timeout')), timeoutMs);
			})
		]);
		return true;
	} catch {
		return false;
	} finally {
		clearTimeout(timer);
	}
}

// Telling "the database is down" apart from other failures, so the app can say so plainly
// (503) and recover by itself when the server comes back: postgres.js reconnects on demand.
const DOWN_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'CONNECT_TIMEOUT', 'CONNECTION_CLOSED', 'CONNECTION_ENDED', 'CONNECTION_DESTROYED', '57P01', '57P03', '08006', '08001', '08004']);

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

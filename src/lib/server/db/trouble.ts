// Telling the two kinds of database trouble apart, with no framework imports so that the client,
// scripts and unit specs can use it:
// - "down": the server cannot be reached or is shutting down or starting up;
// - "busy": the server is up, but this request could not get a connection, a lock or its
//   statement's time in time.
// Codes are PostgreSQL's SQLSTATEs (PostgreSQL manual, Appendix A) and Node's socket errors, plus
// the codes postgres.js gives its own connection errors.

export type DatabaseTrouble = 'down' | 'busy';

const DOWN_CODES = new Set([
	// Node's socket errors
	'ECONNREFUSED',
	'ECONNRESET',
	'ETIMEDOUT',
	'EPIPE',
	'EHOSTUNREACH',
	'ENETUNREACH',
	'ENOTFOUND',
	'EAI_AGAIN',
	// postgres.js
	'CONNECT_TIMEOUT',
	'CONNECTION_CLOSED',
	'CONNECTION_ENDED',
	'CONNECTION_DESTROYED',
	// Class 57, operator intervention: admin_shutdown, crash_shutdown, cannot_connect_now
	'57P01',
	'57P02',
	'57P03',
	// Class 08, connection exception
	'08000',
	'08003',
	'08006',
	'08001',
	'08004'
]);

const BUSY_CODES = new Set([
	// gate.ts: no connection came free in time
	'POOL_BUSY',
	// SlowConnectError below
	'CONNECT_SLOW',
	// query_canceled: statement_timeout ran out
	'57014',
	// lock_not_available: lock_timeout ran out
	'55P03',
	// too_many_connections: the server's own connection limit
	'53300',
	// serialization_failure and deadlock_detected that outlasted the retries
	'40001',
	'40P01'
]);

/** The codes on an error and its causes, outermost first. */
function codesOf(e: unknown): string[] {
	const codes: string[] = [];
	for (let cur: unknown = e, depth = 0; cur && typeof cur === 'object' && depth < 5; depth++) {
		const { code, errno, cause } = cur as { code?: unknown; errno?: unknown; cause?: unknown };
		if (typeof code === 'string') codes.push(code);
		if (typeof errno === 'string') codes.push(errno);
		cur = cause;
	}
	return codes;
}

/** 'down', 'busy', or null when the failure is not the database's availability (a bug, bad data…). */
export function databaseTrouble(e: unknown): DatabaseTrouble | null {
	const codes = codesOf(e);
	// Busy first: a connection that timed out while others kept answering is marked busy (client.ts)
	// and still carries CONNECT_TIMEOUT as its cause.
	if (codes.some((c) => BUSY_CODES.has(c))) return 'busy';
	if (codes.some((c) => DOWN_CODES.has(c))) return 'down';
	return null;
}

/** The server was up, but opening a connection took longer than connect_timeout (client.ts). */
export class SlowConnectError extends Error {
	readonly code = 'CONNECT_SLOW';
	constructor(cause: unknown) {
		super('opening a database connection took too long while the server kept answering other work', { cause });
		this.name = 'SlowConnectError';
	}
}

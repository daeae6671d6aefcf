// A database handle from a URL, with no SvelteKit imports so that scripts and tests can use it too.
import postgres from 'postgres';
import { drizzle } from 'drizzle-orm/postgres-js';
import * as schema from './schema';
import { Gate } from './gate';
import { databaseTrouble, SlowConnectError, type DatabaseTrouble } from './trouble';

export type Database = ReturnType<typeof createDb>['db'];

export interface DbOptions {
	/** Connections in the pool. */
	max?: number;
	/**
	 * How long one operation (a query, or a whole transaction) may wait for a free connection, in
	 * milliseconds. Set, it puts a Gate in front of the pool; unset (scripts, tests), work waits as
	 * long as postgres.js makes it.
	 */
	poolWaitMs?: number;
	/** Seconds to open a connection before giving up (postgres.js connect_timeout). */
	connectTimeoutSeconds?: number;
	/** Set on every connection: PostgreSQL ends a statement that runs longer (statement_timeout). */
	statementTimeoutMs?: number;
	/** Set on every connection: a statement waits no longer for a lock (lock_timeout). */
	lockTimeoutMs?: number;
	/** Set on every connection: a transaction left idle this long is ended (idle_in_transaction_session_timeout). */
	idleInTransactionTimeoutMs?: number;
	/** Told of every operation that failed because the database was down or busy. */
	onTrouble?: (kind: DatabaseTrouble, error: unknown) => void;
}

/**
 * Waits between attempts to reconnect, in seconds. postgres.js's own default grows with every
 * failed attempt up to 20 s and only resets on success, so after an outage the first requests
 * waited many seconds for a connection although the server was back. Attempts are made on demand
 * only (a request that needs a connection, at most one per pooled connection at a time), so a
 * short cap costs the server little, and while it is down requests fail at once instead of
 * queueing behind the delay.
 */
export const reconnectDelaySeconds = (failures: number) => Math.min(0.005 * 2 ** failures, 0.05);

export function createDb(url: string, options: DbOptions = {}) {
	const runtime: Record<string, string> = {};
	if (options.statementTimeoutMs) runtime.statement_timeout = String(Math.round(options.statementTimeoutMs));
	if (options.lockTimeoutMs) runtime.lock_timeout = String(Math.round(options.lockTimeoutMs));
	if (options.idleInTransactionTimeoutMs)
		runtime.idle_in_transaction_session_timeout = String(Math.round(options.idleInTransactionTimeoutMs));
	const max = options.max ?? 10;
	const client = postgres(url, {
		max,
		connect_timeout: options.connectTimeoutSeconds ?? 5,
		idle_timeout: 30,
		backoff: reconnectDelaySeconds,
		// Runtime parameters sent when each connection starts (PostgreSQL manual, "Client Connection Defaults").
		connection: runtime,
		onnotice: () => {}
	});
	const turns = options.poolWaitMs ? new Gate(max, options.poolWaitMs) : null;
	const db = drizzle(turns ? gate(client, turns, options.onTrouble) : client, { schema, casing: undefined });
	return { db, client, gate: turns };
}

/**
 * The client as drizzle sees it, with every query and transaction taking a turn at the gate.
 * drizzle uses only `unsafe` (awaited, or `.values()` awaited) and `begin`; queries inside a
 * transaction run on the transaction's own connection and take no further turn.
 */
function gate(client: postgres.Sql, turns: Gate, onTrouble?: DbOptions['onTrouble']): postgres.Sql {
	// When the server last answered anything: a connection that times out while others keep
	// answering is a busy server, not a missing one.
	let lastAnswerAt = 0;
	const guarded = async <T>(work: () => PromiseLike<T>): Promise<T> => {
		const startedAt = performance.now();
		try {
			const result = await turns.run(work);
			lastAnswerAt = performance.now();
			return result;
		} catch (e) {
			let error = e;
			if ((e as { code?: unknown }).code === 'CONNECT_TIMEOUT' && lastAnswerAt > startedAt) error = new SlowConnectError(e);
			const kind = databaseTrouble(error);
			if (kind && onTrouble) onTrouble(kind, error);
			throw error;
		}
	};

	class GatedQuery<T> implements PromiseLike<T> {
		private arrays = false;
		private running: Promise<T> | null = null;
		constructor(private readonly args: Parameters<postgres.Sql['unsafe']>) {}
		values() {
			this.arrays = true;
			return this;
		}
		then<A = T, B = never>(
			onfulfilled?: ((v: T) => A | PromiseLike<A>) | null,
			onrejected?: ((r: unknown) => B | PromiseLike<B>) | null
		) {
			this.running ??= guarded(() => {
				const query = client.unsafe(...this.args);
				return (this.arrays ? query.values() : query) as unknown as PromiseLike<T>;
			});
			return this.running.then(onfulfilled, onrejected);
		}
	}

	return new Proxy(client, {
		get(target, property) {
			if (property === 'unsafe') return (...args: Parameters<postgres.Sql['unsafe']>) => new GatedQuery(args);
			if (property === 'begin')
				return (...args: unknown[]) => guarded(() => (target.begin as (...a: unknown[]) => Promise<unknown>)(...args));
			return Reflect.get(target, property, target) as unknown;
		}
	});
}

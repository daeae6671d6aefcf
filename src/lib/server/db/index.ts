import { building } from '$app/environment';
import { getRequestEvent } from '$app/server';
import { env } from '$env/dynamic/private';
import { createDb } from './client';
import type { DatabaseTrouble } from './trouble';

// postgres.js connects lazily, so the build (which imports this module to analyse routes) needs no database.
const url = env.DATABASE_URL ?? (building ? 'postgres://build@127.0.0.1:1/build' : undefined);
if (!url) throw new Error('DATABASE_URL is not set (see .env.example)');

/** A setting in whole numbers from the environment, or its default. */
function setting(name: string, fallback: number): number {
	const raw = env[name];
	if (raw === undefined || raw.trim() === '') return fallback;
	const value = Number(raw);
	if (!Number.isFinite(value) || value <= 0) throw new Error(`${name} must be a positive number, not "${raw}"`);
	return value;
}

/** Marks the request being served (if any) as having met the database down or busy; hooks.server.ts answers 503. */
function markRequest(kind: DatabaseTrouble) {
	let locals: App.Locals;
	try {
		locals = getRequestEvent().locals;
	} catch {
		return; // background work (the periodic jobs), outside any request
	}
	if (locals.databaseTrouble !== 'down') locals.databaseTrouble = kind;
}

const handle = createDb(url, {
	max: setting('DATABASE_POOL_SIZE', 10),
	// A request waits this long for a free connection, then answers 503 "busy".
	poolWaitMs: setting('DATABASE_POOL_WAIT_MS', 10_000),
	// An unreachable server is given up on quickly: requests answer 503 instead of hanging.
	connectTimeoutSeconds: setting('DATABASE_CONNECT_TIMEOUT', 3),
	// A lock pile-up or a runaway statement ends in a 503 "busy", never in a request that hangs.
	// Work that already holds a connection may wait for a lock longer than work waits for a
	// connection: in a pile-up, the requests still queueing for a connection give up first.
	statementTimeoutMs: setting('DATABASE_STATEMENT_TIMEOUT_MS', 30_000),
	lockTimeoutMs: setting('DATABASE_LOCK_TIMEOUT_MS', 15_000),
	idleInTransactionTimeoutMs: 60_000,
	onTrouble: markRequest
});

export const db = handle.db;
export const sqlClient = handle.client;
/** The turns in front of the pool (gate.ts). */
export const pool = handle.gate;
export * as tables from './schema';

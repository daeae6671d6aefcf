import { building } from '$app/environment';
import { env } from '$env/dynamic/private';
import { createDb } from './client';

// postgres.js connects lazily, so the build (which imports this module to analyse routes) needs no database.
const url = env.DATABASE_URL ?? (building ? 'postgres://build@127.0.0.1:1/build' : undefined);
if (!url) throw new Error('DATABASE_URL is not set (see .env.example)');

const handle = createDb(url, { max: Number(env.DATABASE_POOL_SIZE ?? 10) });

export const db = handle.db;
export const sqlClient = handle.client;
export * as tables from './schema';

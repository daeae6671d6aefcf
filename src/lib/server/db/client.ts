// A database handle from a URL, with no SvelteKit imports so that scripts and tests can use it too.
import postgres from 'postgres';
import { drizzle } from 'drizzle-orm/postgres-js';
import * as schema from './schema';

export type Database = ReturnType<typeof createDb>['db'];

export function createDb(url: string, options: { max?: number } = {}) {
	const client = postgres(url, {
		max: options.max ?? 10,
		// Keep start-up fast and quiet; reconnects happen on their own when the server returns.
		connect_timeout: 5,
		idle_timeout: 30,
		onnotice: () => {}
	});
	const db = drizzle(client, { schema, casing: undefined });
	return { db, client };
}

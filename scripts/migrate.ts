// Applies the committed Drizzle migrations in drizzle/ to DATABASE_URL.
import { migrate } from 'drizzle-orm/postgres-js/migrator';
import { createDb } from '../src/lib/server/db/client';

const url = process.env.DATABASE_URL;
if (!url) throw new Error('DATABASE_URL is not set');
const { db, client } = createDb(url, { max: 1 });
try {
	await migrate(db, { migrationsFolder: new URL('../drizzle', import.meta.url).pathname });
	console.log('migrations applied');
} finally {
	await client.end();
}

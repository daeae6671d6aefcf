// Direct database access for integration tests: the same schema and client the app uses.
import { createDb } from '../../src/lib/server/db/client';
import { DATABASE_URL } from './env';

export function testDb() {
	return createDb(DATABASE_URL, { max: 4 });
}

// Direct database access for integration tests: the same schema and client the app uses.
import { and, eq, inArray, sql } from 'drizzle-orm';
import { createDb, type Database } from '../../src/lib/server/db/client';
import * as t from '../../src/lib/server/db/schema';
import { DATABASE_URL } from './env';
import { TZ } from './dates';

export function testDb() {
	return createDb(DATABASE_URL, { max: 4 });
}

/**
 * Cancels every active booking on these studio days (YYYY-MM-DD), so that a file that owns them
 * starts them clean when it runs again against the same database.
 */
export async function clearDays(db: ReturnType<typeof testDb>['db'], days: readonly string[]): Promise<void> {
	await db
		.update(t.booking)
		.set({ status: 'cancelled' })
		.where(
			and(
				inArray(t.booking.status, ['held', 'pending', 'confirmed']),
				sql`(${t.booking.startsAt} at time zone ${TZ}::text)::date::text in ${days}`
			)
		);
}

/** The short name of the demo studio the seed makes. */
export const DEMO_STUDIO_SLUG = 'hollow-pine';

/** The id of a studio by its short name (the demo studio's by default). */
export async function studioIdOf(db: Database, slug = DEMO_STUDIO_SLUG): Promise<string> {
	const [row] = await db.select({ id: t.organization.id }).from(t.organization).where(eq(t.organization.slug, slug));
	if (!row) throw new Error(`no studio "${slug}": is the demo seeded?`);
	return row.id;
}

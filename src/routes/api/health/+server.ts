import { json } from '@sveltejs/kit';
import { sql } from 'drizzle-orm';
import { db } from '$lib/server/db';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async () => {
	let dbOk = false;
	try {
		await Promise.race([
			db.execute(sql`select 1`),
			new Promise((_, reject) => setTimeout(() => reject(new Error('timeout')), 3000))
		]);
		dbOk = true;
	} catch {
		dbOk = false;
	}
	return json({ ok: dbOk, db: dbOk ? 'up' : 'down' }, { status: dbOk ? 200 : 503, headers: { 'cache-control': 'no-store' } });
};

import { json } from '@sveltejs/kit';
import { databaseAnswers } from '$lib/server/db/health';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async () => {
	const dbOk = await databaseAnswers();
	return json({ ok: dbOk, db: dbOk ? 'up' : 'down' }, { status: dbOk ? 200 : 503, headers: { 'cache-control': 'no-store' } });
};

import { json } from '@sveltejs/kit';
import { databaseState, TROUBLE_ANSWER } from '$lib/server/db/health';
import type { RequestHandler } from './$types';

// ok while the database answers: 'up', or 'busy' when every connection is at work (the app still
// serves, requests wait their turn). 503 only when it is down.
export const GET: RequestHandler = async () => {
	const db = await databaseState();
	const headers: Record<string, string> = { 'cache-control': 'no-store' };
	if (db === 'down') headers['retry-after'] = String(TROUBLE_ANSWER.down.retryAfter);
	return json({ ok: db !== 'down', db }, { status: db === 'down' ? 503 : 200, headers });
};

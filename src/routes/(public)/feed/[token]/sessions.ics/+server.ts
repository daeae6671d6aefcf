// GET: the calendar feed behind a secret address (src/lib/server/feed.ts). No cookies: calendar
// programs poll it on their own. An unknown or replaced address is a plain 404.
import { error } from '@sveltejs/kit';
import { feedFor } from '$lib/server/feed';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params }) => {
	const body = await feedFor(params.token);
	if (body === null) error(404, { message: 'No such calendar feed.', error: 'not_found' });
	return new Response(body, {
		headers: {
			'content-type': 'text/calendar; charset=utf-8',
			'content-disposition': 'inline; filename="sessions.ics"',
			'cache-control': 'private, max-age=300',
			'referrer-policy': 'no-referrer'
		}
	});
};

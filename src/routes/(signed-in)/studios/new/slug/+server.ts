import { json } from '@sveltejs/kit';
import { requireUser } from '$lib/server/guard';
import { slugProblem } from '$lib/domain/studio-slug';
import * as setup from '$lib/server/studio-setup';
import type { RequestHandler } from './$types';

/** Whether a short name can be taken now, with the reason when not (the set-up form asks as the person types). */
export const GET: RequestHandler = async ({ url, locals }) => {
	requireUser(locals);
	const slug = (url.searchParams.get('slug') ?? '').slice(0, 100);
	const problem = slugProblem(slug) ?? ((await setup.slugTaken(slug)) ? setup.SLUG_TAKEN : null);
	return json({ slug, problem }, { headers: { 'cache-control': 'no-store' } });
};

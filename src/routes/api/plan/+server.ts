import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { dayPlan, isPlanDate, todayInStudio } from '$lib/server/plan';
import { DATE_MESSAGE, dateProblem } from '$lib/schemas/input';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, url }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	if (!locals.studio || (locals.user.role !== 'engineer' && locals.user.role !== 'owner')) {
		return apiError(403, 'forbidden', 'The day plan is for engineers and the owner.');
	}
	const { studioId } = locals.studio;
	const date = url.searchParams.get('date') ?? (await todayInStudio(studioId));
	if (!isPlanDate(date)) {
		const problem = dateProblem(date) ?? DATE_MESSAGE;
		return apiError(422, 'invalid', problem, { fields: { date: [problem] } });
	}
	return json(await dayPlan(studioId, date), { headers: { 'cache-control': 'private, no-store' } });
};

import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { apiStaffStudio } from '$lib/server/storefront';
import { dayPlan, isPlanDate, todayInStudio } from '$lib/server/plan';
import { DATE_MESSAGE, dateProblem } from '$lib/schemas/input';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params, locals, url }) => {
	const found = await apiStaffStudio(
		params.studio,
		locals,
		['engineer', 'owner'],
		'The day plan is for engineers and the owner.'
	);
	if (!found.ok) return found.response;
	const studioId = found.at.studio.id;
	const date = url.searchParams.get('date') ?? (await todayInStudio(studioId));
	if (!isPlanDate(date)) {
		const problem = dateProblem(date) ?? DATE_MESSAGE;
		return apiError(422, 'invalid', problem, { fields: { date: [problem] } });
	}
	return json(await dayPlan(studioId, date), { headers: { 'cache-control': 'private, no-store' } });
};

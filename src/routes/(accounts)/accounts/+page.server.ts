import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { staffStudio } from '$lib/server/studio';
import { MONTH_PATTERN, currentMonth, monthRange, monthReport } from '$lib/server/invoices/month';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	requireRole(locals, 'owner', 'accountant');
	const studio = await staffStudio(locals);
	const month = url.searchParams.get('month') ?? currentMonth(studio.timeZone);
	if (!MONTH_PATTERN.test(month)) error(400, { message: 'Use a month such as 2027-03.' });
	const { prev, next } = monthRange(month, studio.timeZone);
	const report = await monthReport(studio.id, month, studio.timeZone, studio.currency);
	// The files come from the API of the studio these accounts are kept for.
	return { ...report, prev, next, api: `/api/studios/${locals.studio!.slug}` };
};

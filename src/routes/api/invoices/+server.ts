// GET ?month=YYYY-MM (accountant, owner): the month's documents, payments, refunds, what is still
// owed and VAT by rate. Months are calendar months in the studio's zone.
import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { getStudio } from '$lib/server/studio';
import { MONTH_PATTERN, currentMonth, monthReport } from '$lib/server/invoices/month';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, url }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	if (locals.user.role !== 'accountant' && locals.user.role !== 'owner') {
		return apiError(403, 'forbidden', 'The accounts are for the accountant and the owner.');
	}
	const studio = await getStudio();
	const month = url.searchParams.get('month') ?? currentMonth(studio.timeZone);
	if (!MONTH_PATTERN.test(month))
		return apiError(422, 'invalid', 'Use a month such as 2027-03.', { fields: { month: ['Use a month such as 2027-03.'] } });
	return json(await monthReport(month, studio.timeZone, studio.currency), { headers: { 'cache-control': 'private, no-store' } });
};

// GET ?month=YYYY-MM (accountant, owner): the month's documents, payments, refunds, what is still
// owed and VAT by rate. Months are calendar months in the studio's zone.
import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { monthReport } from '$lib/server/invoices/month';
import { MONTH_MESSAGE, accountsRequest, isMonth } from '$lib/server/invoices/request';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params, locals, url }) => {
	const req = await accountsRequest(params.studio, locals, url);
	if (!req.ok) return req.response;
	if (!isMonth(req.month)) return apiError(422, 'invalid', MONTH_MESSAGE, { fields: { month: [MONTH_MESSAGE] } });
	return json(await monthReport(req.studio.id, req.month, req.studio.timeZone, req.studio.currency), {
		headers: { 'cache-control': 'private, no-store' }
	});
};

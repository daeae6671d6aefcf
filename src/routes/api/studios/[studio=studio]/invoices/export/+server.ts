// GET ?month=YYYY-MM&format=csv|zip|ubl[&register=documents|payments|refunds|vat] (accountant,
// owner): the month as files. csv: one register (the documents unless another is named); zip:
// every register with each document's PDF and UBL e-invoice; ubl: a ZIP of the e-invoices alone.
import { apiError } from '$lib/server/api';
import { monthReport } from '$lib/server/invoices/month';
import { MONTH_MESSAGE, accountsRequest, isMonth } from '$lib/server/invoices/request';
import { monthArchive, monthRegisters } from '$lib/server/invoices/export';
import type { RequestHandler } from './$types';

const FORMATS = ['csv', 'zip', 'ubl'] as const;
const REGISTERS = ['documents', 'payments', 'refunds', 'vat'] as const;

export const GET: RequestHandler = async ({ params, locals, url }) => {
	const req = await accountsRequest(params.studio, locals, url);
	if (!req.ok) return req.response;
	const { studio, month, user } = req;
	const format = url.searchParams.get('format') ?? 'csv';
	const register = url.searchParams.get('register') ?? 'documents';
	const fields: Record<string, string[]> = {};
	if (!isMonth(month)) fields.month = [MONTH_MESSAGE];
	if (!(FORMATS as readonly string[]).includes(format)) fields.format = [`Choose one of: ${FORMATS.join(', ')}.`];
	if (!(REGISTERS as readonly string[]).includes(register)) fields.register = [`Choose one of: ${REGISTERS.join(', ')}.`];
	if (Object.keys(fields).length) return apiError(422, 'invalid', 'Some of the export’s settings are not valid.', { fields });

	const report = await monthReport(studio.id, month, studio.timeZone, studio.currency);
	const headers = { 'cache-control': 'private, no-store', 'x-content-type-options': 'nosniff' };
	if (format === 'zip' || format === 'ubl') {
		const zip = await monthArchive(report, studio.timeZone, user, format === 'ubl' ? 'ubl' : 'all');
		return new Response(zip as Uint8Array<ArrayBuffer>, {
			headers: {
				...headers,
				'content-type': 'application/zip',
				'content-disposition': `attachment; filename="${format === 'ubl' ? 'e-invoices' : 'accounts'}-${month}.zip"`,
				'content-length': String(zip.length)
			}
		});
	}
	const name = `${register}-${month}.csv`;
	const csv = monthRegisters(report, studio.timeZone)[name]!;
	return new Response(csv, {
		headers: {
			...headers,
			// RFC 4180 §3: text/csv, with the header line present.
			'content-type': 'text/csv; charset=utf-8; header=present',
			'content-disposition': `attachment; filename="${name}"`
		}
	});
};

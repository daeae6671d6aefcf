// GET: the document as a PDF, for the booking's artist and its studio's owner and accountant;
// its times in that studio's zone.
import { apiError } from '$lib/server/api';
import { documentForViewer } from '$lib/server/invoices/access';
import { renderInvoicePdf } from '$lib/server/invoices/pdf';
import { getStudio } from '$lib/server/studio';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, params }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	const found = await documentForViewer(locals.user, params.id);
	if (!found.ok) {
		return found.status === 404
			? apiError(404, 'not_found', 'No such document.')
			: apiError(403, 'forbidden', 'Invoices are for the artist, the owner and the accountant.');
	}
	const studio = await getStudio(found.invoice.studioId);
	const pdf = await renderInvoicePdf({ ...found, timeZone: studio.timeZone });
	return new Response(new Uint8Array(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `attachment; filename="${found.invoice.displayNumber}.pdf"`,
			'content-length': String(pdf.length),
			'cache-control': 'private, no-store'
		}
	});
};

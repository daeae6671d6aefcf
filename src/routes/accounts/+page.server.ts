import { error } from '@sveltejs/kit';
import { TZDate } from '@date-fns/tz';
import { addMonths, format } from 'date-fns';
import { and, asc, gte, lt } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { invoice } from '$lib/server/db/schema';
import { requireRole } from '$lib/server/guard';
import { getStudio } from '$lib/server/studio';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	requireRole(locals, 'owner', 'accountant');
	const studio = await getStudio();
	const month = url.searchParams.get('month') ?? format(TZDate.tz(studio.timeZone), 'yyyy-MM');
	if (!/^\d{4}-(0[1-9]|1[0-2])$/.test(month)) error(400, { message: 'Use a month such as 2027-03.' });
	const [y, m] = month.split('-').map(Number) as [number, number];
	const from = new TZDate(y, m - 1, 1, studio.timeZone);
	const to = addMonths(from, 1);
	const docs = await db
		.select()
		.from(invoice)
		.where(and(gte(invoice.issuedAt, from), lt(invoice.issuedAt, to)))
		.orderBy(asc(invoice.issuedAt));
	return {
		month,
		prev: format(addMonths(from, -1), 'yyyy-MM'),
		next: format(addMonths(from, 1), 'yyyy-MM'),
		documents: docs.map((d) => ({
			id: d.id,
			number: d.displayNumber,
			typeCode: d.typeCode,
			issuedAt: d.issuedAt.toISOString(),
			customer: (d.customer as { name?: string }).name ?? '',
			net: d.net,
			vat: d.vatTotal,
			gross: d.gross,
			currency: d.currency
		}))
	};
};

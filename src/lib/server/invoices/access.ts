// Who may read a document: the booking's artist, and the owner and the accountant of the
// document's studio (OWASP ASVS 8.2.2). Another artist, or anyone outside that studio's team, gets
// the same answer as for a document that does not exist.
import { eq } from 'drizzle-orm';
import { db } from '../db';
import { booking, invoice } from '../db/schema';
import type { SessionUser } from '../auth';
import { roleAt } from '../bookings/read';
import { linesOf, type InvoiceLineRow, type InvoiceRow } from './issue';

export type DocumentAccess =
	| {
			ok: true;
			invoice: InvoiceRow;
			lines: InvoiceLineRow[];
			bookingReference: string | null;
			preceding: { number: string; issuedAt: Date } | null;
	  }
	| { ok: false; status: 403 | 404 };

export async function documentForViewer(viewer: SessionUser, id: string): Promise<DocumentAccess> {
	const [row] = await db
		.select({ invoice, artistId: booking.artistId, reference: booking.reference })
		.from(invoice)
		.leftJoin(booking, eq(booking.id, invoice.bookingId))
		.where(eq(invoice.id, id));
	if (!row) return { ok: false, status: 404 };
	const role = await roleAt(viewer.id, row.invoice.studioId);
	if (role === 'artist') {
		if (row.artistId !== viewer.id) return { ok: false, status: 404 };
	} else if (role !== 'owner' && role !== 'accountant') {
		return { ok: false, status: 403 };
	}
	const [lines, preceding] = await Promise.all([
		linesOf(db, row.invoice.id),
		row.invoice.precedingInvoiceId
			? db
					.select({ number: invoice.displayNumber, issuedAt: invoice.issuedAt })
					.from(invoice)
					.where(eq(invoice.id, row.invoice.precedingInvoiceId))
			: Promise.resolve([])
	]);
	return { ok: true, invoice: row.invoice, lines, bookingReference: row.reference, preceding: preceding[0] ?? null };
}

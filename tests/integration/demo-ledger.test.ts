// The demo studio's money history (src/lib/server/demo-ledger.ts), as the app writes it at start-up
// into the seeded test database: checked against the demo policy of src/lib/domain/demo.ts (deposit 30 % of
// the gross rounded up to whole euros, at least 50.00) and EN 16931 BR-CO-16 (amount due = gross −
// paid on account + rounding).
import { afterAll, describe, expect, it } from 'vitest';
import { and, asc, eq, inArray, like } from 'drizzle-orm';
import { testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { signedIn } from '../support/http';
import { DEMO } from '../support/env';
import * as t from '../../src/lib/server/db/schema';

const { db, client } = testDb();
afterAll(() => client.end());

describe('the demo ledger', () => {
	it('gives every demo session a paid deposit and its invoice, and the finished ones their final invoice', async () => {
		const demo = await db.select().from(t.booking).where(like(t.booking.reference, 'HP-DEMO%')).orderBy(asc(t.booking.startsAt));
		expect(demo.length).toBeGreaterThanOrEqual(4);
		const ids = demo.map((b) => b.id);
		// The app writes the ledger once at start-up: wait until every demo session has its deposit.
		const payments = await waitFor(async () => {
			const rows = await db.select().from(t.payment).where(inArray(t.payment.bookingId, ids));
			return rows.filter((p) => p.kind === 'deposit').length === demo.length ? rows : undefined;
		}, 'the demo deposits');
		const invoices = await db.select().from(t.invoice).where(inArray(t.invoice.bookingId, ids)).orderBy(asc(t.invoice.issuedAt));

		for (const b of demo) {
			const deposits = payments.filter((p) => p.bookingId === b.id && p.kind === 'deposit');
			expect(deposits, b.reference).toHaveLength(1);
			expect(deposits[0]!.status).toBe('paid');
			expect(deposits[0]!.amount).toBe(b.deposit);
			// The demo policy: 30 % of the gross rounded up to whole euros, at least 50.00, never above the total.
			expect(b.deposit).toBe(Math.min(b.total, Math.max(5000, Math.ceil((b.total * 30) / 10_000) * 100)));
			expect(deposits[0]!.paidAt!.getTime()).toBeLessThan(b.startsAt.getTime());
			const docs = invoices.filter((d) => d.bookingId === b.id);
			expect(
				docs.filter((d) => d.typeCode === 386),
				b.reference
			).toHaveLength(1);
			const finals = docs.filter((d) => d.typeCode === 380);
			if (b.status === 'completed') {
				expect(finals, b.reference).toHaveLength(1);
				const f = finals[0]!;
				expect(f.gross + f.rounding).toBe(b.total);
				expect(f.prepaid).toBe(b.deposit);
				expect(f.amountDue).toBe(f.gross - f.prepaid + f.rounding); // BR-CO-16
			} else {
				expect(finals, b.reference).toHaveLength(0);
			}
		}

		// The first finished session is paid in full; the second still owes its balance.
		const [first, second] = demo.filter((b) => b.status === 'completed');
		const balance = (id: string) => payments.filter((p) => p.bookingId === id && p.kind === 'balance');
		expect(balance(first!.id).map((p) => p.amount)).toEqual([first!.total - first!.deposit]);
		expect(balance(second!.id)).toHaveLength(0);

		// Issued in date order, the demo documents of each series carry rising numbers, counted
		// afresh each year (DEP-2026-0002 is followed by DEP-2027-0001 when the demo spans New Year).
		for (const series of ['DEP', 'INV']) {
			for (const year of new Set(invoices.map((d) => d.year))) {
				const numbers = invoices.filter((d) => d.series === series && d.year === year).map((d) => d.number);
				expect(numbers, `${series} ${year}`).toEqual([...numbers].sort((a, b) => a - b));
			}
		}
		const [row] = await db
			.select()
			.from(t.booking)
			.where(and(eq(t.booking.id, first!.id), eq(t.booking.status, 'completed')));
		expect(row?.actualEndsAt?.getTime()).toBe(first!.endsAt.getTime());
	});

	it('puts the balance still owed on the owner’s desk', async () => {
		const owner = await signedIn(DEMO.owner);
		const res = await owner.fetch('/studio', { headers: { accept: 'text/html' } });
		expect(res.status).toBe(200);
		const html = await res.text();
		const desk = html.slice(html.indexOf('data-testid="attention"'));
		expect(desk).toContain('Needs you');
		// HP-DEMO2's final invoice is left unpaid by the demo ledger.
		expect(desk).toMatch(/Balance owed:.*?HP-DEMO2/s);
		// HP-DEMO1 is paid in full, so no item of the list names it.
		const items = desk.slice(0, desk.indexOf('</ul>')).split('<li').slice(1);
		expect(items.some((li) => li.includes('Balance owed') && li.includes('HP-DEMO2'))).toBe(true);
		expect(items.some((li) => li.includes('HP-DEMO1'))).toBe(false);
	});
});

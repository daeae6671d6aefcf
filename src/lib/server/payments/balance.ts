// What is still owed on a booking, the one figure the money panel, the booking's JSON, the
// balance Checkout, the receipts and the month's outstanding balances all read: the rule is
// $lib/domain/recorded-payments.ts balanceOwed, fed here from the payments, the recorded entries and
// the final invoice. Inside a transaction that holds the booking's row lock it is exact; outside
// one it is what was committed when it was read.
import { asc, eq } from 'drizzle-orm';
import { invoice, recordedPayment } from '../db/schema';
import { prepaidOf } from '../invoices/documents';
import { amountOwed, recordedNet } from '$lib/domain/recorded-payments';
import { payableTotal } from '$lib/domain/invoice';
import { loadMoneyState, type BookingRow, type MoneyState, type Tx } from './core';

export type RecordedRow = typeof recordedPayment.$inferSelect;
type InvoiceRow = typeof invoice.$inferSelect;

export async function recordedOf(tx: Pick<Tx, 'select'>, bookingId: string): Promise<RecordedRow[]> {
	return tx
		.select()
		.from(recordedPayment)
		.where(eq(recordedPayment.bookingId, bookingId))
		.orderBy(asc(recordedPayment.createdAt), asc(recordedPayment.id));
}

export interface Owed {
	/** Minor units still owed, never below 0. */
	owed: number;
	/** The same before it is held at 0: negative when more came in than is owed. */
	shortfall: number;
	/** The final invoice (380), once issued. */
	final: InvoiceRow | null;
	recorded: RecordedRow[];
	/** Σ recorded entries (payments less reversals). */
	recordedTotal: number;
	state: MoneyState;
}

/** What is still owed on a booking (see balanceOwed for the rule). */
export async function owedOn(tx: Pick<Tx, 'select'>, b: Pick<BookingRow, 'id' | 'total'>): Promise<Owed> {
	const [state, recorded, [final]] = await Promise.all([
		loadMoneyState(tx, b.id),
		recordedOf(tx, b.id),
		tx
			.select()
			.from(invoice)
			.where(eq(invoice.sourceKey, `final:${b.id}`))
	]);
	const recordedTotal = recordedNet(recorded);
	let shortfall: number;
	if (final) {
		const deposits = (await prepaidOf(tx, b.id)).amount;
		// Card payments of the balance, less what went back of them (an overpayment refunded).
		const cardBalance = state.payments
			.filter((p) => p.kind === 'balance' && p.status === 'paid')
			.reduce((s, p) => s + (state.refundable.get(p.id) ?? p.amount), 0);
		shortfall = amountOwed({ final: { payable: payableTotal(final), deposits }, cardBalance, recorded: recordedTotal });
	} else {
		shortfall = amountOwed({ final: null, total: b.total, held: state.held, recorded: recordedTotal });
	}
	return { owed: Math.max(0, shortfall), shortfall, final: final ?? null, recorded, recordedTotal, state };
}

// Shared pieces of the money flows: transactions that retry on deadlock, the booking row lock that
// orders every change to one booking's money, and sums of what was paid and refunded.
import { and, asc, eq } from 'drizzle-orm';
import { db } from '../db';
import { booking, payment, refund, type BookingStatus } from '../db/schema';
import { canMove } from '$lib/domain/lifecycle';
import type { Tx } from '../invoices/issue';

export type { Tx };
export type BookingRow = typeof booking.$inferSelect;
export type PaymentRow = typeof payment.$inferSelect;
export type RefundRow = typeof refund.$inferSelect;

/** Work to do once the transaction has committed (calls to Stripe never run inside one). */
export type AfterCommit = (() => Promise<unknown>)[];

export function pgCode(e: unknown): { code?: string; constraint?: string } {
	for (let cur: unknown = e, i = 0; cur && i < 5; i++) {
		const c = cur as { code?: string; constraint_name?: string; cause?: unknown };
		if (typeof c.code === 'string' && /^[0-9A-Z]{5}$/.test(c.code)) return { code: c.code, constraint: c.constraint_name };
		cur = c.cause;
	}
	return {};
}

/**
 * A transaction retried on deadlock or serialization failure (PostgreSQL manual, Appendix A:
 * 40P01, 40001), then the after-commit work. `lockTimeoutMs` bounds waiting for a row lock, so a
 * webhook answers within Stripe's timeout and lets Stripe retry rather than hang.
 */
export async function inTransaction<T>(
	work: (tx: Tx, after: AfterCommit) => Promise<T>,
	options: { lockTimeoutMs?: number } = {}
): Promise<T> {
	for (let attempt = 0; ; attempt++) {
		const after: AfterCommit = [];
		try {
			const result = await db.transaction(async (tx) => {
				if (options.lockTimeoutMs) await tx.execute(`set local lock_timeout = '${Math.round(options.lockTimeoutMs)}ms'`);
				return work(tx, after);
			});
			for (const task of after) {
				try {
					await task();
				} catch (e) {
					// The payments job finishes what an after-commit step could not (refunds not sent, sessions not expired).
					console.warn('[payments] after-commit step failed:', (e as Error).message);
				}
			}
			return result;
		} catch (e) {
			const { code } = pgCode(e);
			if ((code === '40P01' || code === '40001') && attempt < 5) {
				await new Promise((r) => setTimeout(r, 10 + Math.random() * 40 * (attempt + 1)));
				continue;
			}
			throw e;
		}
	}
}

/**
 * Locks the booking row for the rest of the transaction. Every change to a booking's payments,
 * refunds, status or documents takes this lock first, so concurrent webhooks, clicks and jobs on
 * one booking run one after another and check-then-act is atomic (OWASP ASVS 15.4.2).
 */
export async function lockBooking(tx: Tx, bookingId: string): Promise<BookingRow | undefined> {
	const [row] = await tx.select().from(booking).where(eq(booking.id, bookingId)).for('update');
	return row;
}

export async function paymentsOf(tx: Pick<Tx, 'select'>, bookingId: string): Promise<PaymentRow[]> {
	return tx.select().from(payment).where(eq(payment.bookingId, bookingId)).orderBy(asc(payment.createdAt));
}

export async function refundsOf(tx: Pick<Tx, 'select'>, bookingId: string): Promise<RefundRow[]> {
	return tx.select().from(refund).where(eq(refund.bookingId, bookingId)).orderBy(asc(refund.createdAt));
}

export interface MoneyState {
	payments: PaymentRow[];
	refunds: RefundRow[];
	/** Σ paid payments. */
	paid: number;
	/** Σ refunds that went through or are on their way (failed ones are not money returned). */
	refunded: number;
	/** paid − refunded: what the studio holds for this booking. */
	held: number;
	/** Per paid payment: what may still be refunded from it. */
	refundable: Map<string, number>;
}

export function moneyState(payments: PaymentRow[], refunds: RefundRow[]): MoneyState {
	const paidRows = payments.filter((p) => p.status === 'paid');
	const live = refunds.filter((r) => r.status !== 'failed');
	const refundable = new Map<string, number>();
	for (const p of paidRows) {
		const back = live.filter((r) => r.paymentId === p.id).reduce((s, r) => s + r.amount, 0);
		refundable.set(p.id, p.amount - back);
	}
	const paid = paidRows.reduce((s, p) => s + p.amount, 0);
	const refunded = live.reduce((s, r) => s + r.amount, 0);
	return { payments, refunds, paid, refunded, held: paid - refunded, refundable };
}

export async function loadMoneyState(tx: Pick<Tx, 'select'>, bookingId: string): Promise<MoneyState> {
	const [p, r] = await Promise.all([paymentsOf(tx, bookingId), refundsOf(tx, bookingId)]);
	return moneyState(p, r);
}

/** A payment that may still turn into money for this booking's deposit. */
export function isLiveDeposit(p: PaymentRow, now = new Date()): boolean {
	if (p.kind !== 'deposit') return false;
	if (p.status === 'paid' || p.status === 'processing') return true;
	return p.status === 'open' && (!p.expiresAt || p.expiresAt > now);
}

/** Moves a locked booking on in its life; a move the lifecycle does not allow is a bug, never done. */
export async function setBookingStatus(
	tx: Tx,
	b: Pick<BookingRow, 'id' | 'status'>,
	status: BookingStatus,
	extra: Partial<BookingRow> = {}
) {
	if (!canMove(b.status, status)) throw new Error(`A booking cannot go from ${b.status} to ${status}.`);
	await tx
		.update(booking)
		.set({ ...extra, status })
		.where(and(eq(booking.id, b.id)));
}

/** Runs work for each item on its own: a failure is logged and the next item still runs. */
/** Stripe's answer for an object it does not know (a 404, code resource_missing). */
export function isMissing(e: unknown): boolean {
	const err = e as { statusCode?: number; code?: string };
	return err?.statusCode === 404 || err?.code === 'resource_missing';
}

export async function eachIsolated<T>(items: readonly T[], what: string, work: (item: T) => Promise<unknown>): Promise<number> {
	let failed = 0;
	for (const item of items) {
		try {
			await work(item);
		} catch (e) {
			failed++;
			console.warn(`[payments] ${what} ${JSON.stringify(item)}:`, (e as Error).message);
		}
	}
	return failed;
}

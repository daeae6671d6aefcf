/**
 * Payments the owner records by hand: money taken outside Checkout, in cash at the desk or by bank
 * transfer. Pure rules, no framework or database: which bookings take one, what an entry may say,
 * how a mistake is undone, and what is still owed once they count.
 *
 * An entry is never edited or deleted (the database's trigger refuses it, SQLSTATE 55000); a
 * mistake is undone by a reversal: a negative entry for exactly the original's amount, with a
 * reason, at most once per entry. A reversal is not itself reversed.
 *
 * A recorded payment is not a VAT event of its own: VAT falls due with the supply, on the invoice
 * of the session (Directive 2006/112/EC, Articles 63 and 66), and a deposit's VAT on its own
 * deposit invoice (Article 65). Money received in cash or by transfer only settles what is owed;
 * on the final invoice, the part received before it is issued is shown as paid (EN 16931 BT-113).
 */
import type { BookingStatus } from './lifecycle';

export const RECORDED_METHODS = ['cash', 'bank_transfer'] as const;
export type RecordedMethod = (typeof RECORDED_METHODS)[number];
/** How a payment reached the studio: a recorded method, or a card through Checkout. */
export type PaymentMethod = RecordedMethod | 'card';

export function isRecordedMethod(m: unknown): m is RecordedMethod {
	return typeof m === 'string' && (RECORDED_METHODS as readonly string[]).includes(m);
}

const METHOD_LABELS: Record<PaymentMethod, string> = { cash: 'Cash', bank_transfer: 'Bank transfer', card: 'Card' };

/** 'Cash', 'Bank transfer', 'Card'. */
export function methodLabel(m: string): string {
	return METHOD_LABELS[m as PaymentMethod] ?? m;
}

/**
 * A payment is recorded on a confirmed session (money taken at the desk before or on the day) or a
 * completed one (the balance). Not on a held, pending or expired booking (its deposit goes through
 * Checkout, which confirms it), nor on a cancelled one (the cancellation settled its money), nor on
 * a no-show: the deposit is kept and nothing beyond it is billed, so nothing is owed.
 */
export const RECORDABLE_STATUSES: readonly BookingStatus[] = ['confirmed', 'completed'];

export function acceptsRecordedPayment(status: string): boolean {
	return (RECORDABLE_STATUSES as readonly string[]).includes(status);
}

/** How a final invoice's note begins the list of payments recorded before it (the PDF names its paid amount by it). */
export const RECEIVED_BEFORE_INVOICE = 'Received before this invoice';

/** The longest note or reason kept with an entry. */
export const NOTE_MAX = 500;

export interface RecordedEntry {
	id: string;
	/** Minor units; negative on a reversal. */
	amount: number;
	reversesId: string | null;
}

/** The net of a booking's entries (payments less their reversals). */
export function recordedNet(entries: readonly Pick<RecordedEntry, 'amount'>[]): number {
	return entries.reduce((s, e) => s + e.amount, 0);
}

/** Whether an entry has been reversed already. */
export function isReversed(entry: Pick<RecordedEntry, 'id'>, entries: readonly Pick<RecordedEntry, 'reversesId'>[]): boolean {
	return entries.some((e) => e.reversesId === entry.id);
}

export type RecordRefusal =
	| { field: 'amount'; code: 'not_positive' | 'overpayment'; owed: number }
	| { field: 'paidOn'; code: 'future' | 'before_booking' };

/**
 * Checks a payment to record against what is owed and the calendar: an amount of whole minor units
 * above 0 and at most what is still owed (an overpayment is refused, never kept as credit), paid on
 * a day no later than today and no earlier than the day the booking was made, both in the studio's
 * calendar ('YYYY-MM-DD' compares in calendar order). Returns every problem found.
 */
export function recordRefusals(input: {
	amount: number;
	paidOn: string;
	owed: number;
	today: string;
	bookedOn: string;
}): RecordRefusal[] {
	const out: RecordRefusal[] = [];
	if (!Number.isSafeInteger(input.amount) || input.amount <= 0) {
		out.push({ field: 'amount', code: 'not_positive', owed: input.owed });
	} else if (input.amount > input.owed) {
		out.push({ field: 'amount', code: 'overpayment', owed: input.owed });
	}
	if (input.paidOn > input.today) out.push({ field: 'paidOn', code: 'future' });
	else if (input.paidOn < input.bookedOn) out.push({ field: 'paidOn', code: 'before_booking' });
	return out;
}

export type ReversalRefusal = 'is_reversal' | 'already_reversed';

/**
 * What reversing an entry records: minus its whole amount. A reversal cannot be reversed (record
 * the payment again instead), and an entry is reversed once.
 */
export function reversalOf(
	original: RecordedEntry,
	entries: readonly Pick<RecordedEntry, 'reversesId'>[]
): { ok: true; amount: number } | { ok: false; code: ReversalRefusal } {
	if (original.reversesId !== null || original.amount < 0) return { ok: false, code: 'is_reversal' };
	if (isReversed(original, entries)) return { ok: false, code: 'already_reversed' };
	return { ok: true, amount: -original.amount };
}

/**
 * What is still owed on a booking, never below 0.
 *
 * Before its final invoice: the quoted total, less the money the studio holds from Checkout
 * (payments less refunds), less the recorded entries. Once the final invoice is issued: its total
 * (BT-112 + BT-114), less the deposits it deducts (deposit invoices less their credit notes), less
 * balance payments through Checkout, less every recorded entry, whether it was made before the
 * invoice (then the invoice already shows it as paid) or after.
 */
export function balanceOwed(input: OwedInput): number {
	return Math.max(0, amountOwed(input));
}

export type OwedInput =
	| { final: null; total: number; held: number; recorded: number }
	| { final: { payable: number; deposits: number }; cardBalance: number; recorded: number };

/** The same figure before it is held at 0: negative when more came in than is owed (to refund). */
export function amountOwed(input: OwedInput): number {
	return input.final === null
		? input.total - input.held - input.recorded
		: input.final.payable - input.final.deposits - input.cardBalance - input.recorded;
}

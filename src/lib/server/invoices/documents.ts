// The three documents a booking can carry, built from what the database holds and issued in the
// caller's transaction (no SvelteKit imports: tests issue with their own handle):
//
// - deposit invoice, UNTDID 1001 code 386, when a deposit is received: Directive 2006/112/EC,
//   Article 65 makes VAT chargeable on a payment on account when it is received;
// - final invoice, code 380, when the session is closed: every line of the quote plus overtime
//   and gear added on the day, the deposit shown as paid (EN 16931 BT-113) and referred to
//   (BT-25), with the payments the owner recorded before it (cash, bank transfer) counted in the
//   paid amount too, amount due = gross − paid + rounding (BR-CO-16);
// - credit note, code 381, when a refund has gone through: positive amounts (the type says they
//   are credited), referring to the invoice it corrects (BT-25; Article 219).
//
// Each is issued once per business fact (invoice.source_key), so a webhook delivered twice or two
// events carrying one payment never make a second document.
//
// The buyer is the booking's billing details when the artist gave them (name, postal address,
// country, an organisation's VAT ID), else the artist by name and e-mail; each document keeps a
// copy of the buyer as it was when issued, and a credit note keeps its invoice's. Every document
// of a booking follows the VAT treatment its quote was made with ($lib/domain/vat-treatment.ts):
// a reverse-charged booking's deposit invoice, final invoice and credit notes carry no VAT,
// category AE, and say "Reverse charge" (Directive 2006/112/EC, Article 226(11a)).
import { and, eq, inArray } from 'drizzle-orm';
import { booking, invoice, payment, recordedPayment, refund, room, studio, user } from '../db/schema';
import { findBySource, issueDocument, type InvoiceRow, type Party, type Tx } from './issue';
import {
	DOCUMENT_TYPE,
	documentTotals,
	grossByRate,
	linesFromPriceLines,
	lumpSumLines,
	payableTotal,
	vatCategoryOf,
	type DocumentLineInput,
	type VatRow
} from '$lib/domain/invoice';
import type { PriceLine, Quote } from '$lib/domain/pricing';
import { formatCalendarDate, formatDate, formatTimes, localDateOf } from '$lib/domain/time';
import { formatMoney } from '$lib/domain/money';
import type { BillingDetails } from '$lib/domain/billing';
import { methodLabel, RECEIVED_BEFORE_INVOICE, recordedNet } from '$lib/domain/recorded-payments';
import { REVERSE_CHARGE_WORDS, treatmentOf, type VatTreatment } from '$lib/domain/vat-treatment';

type StudioRow = typeof studio.$inferSelect;

export function supplierOf(s: StudioRow): Party {
	return {
		name: s.name,
		street: s.street,
		postalCode: s.postalCode,
		city: s.city,
		country: s.country,
		vatId: s.vatId,
		email: s.email
	};
}

export interface BookingForDocuments {
	/** The booking's studio: the seller on its documents. */
	studio: StudioRow;
	id: string;
	reference: string;
	startsAt: Date;
	endsAt: Date;
	currency: string;
	quote: Quote;
	roomName: string;
	customer: Party;
	/** Fixed when the booking was made (its quote): every document of the booking follows it. */
	vatTreatment: VatTreatment;
}

/**
 * The buyer as a document names them (Article 226(5); EN 16931 BG-7): the billing details when the
 * artist gave them, with the artist's e-mail as the buyer's electronic address (BT-49); else the
 * artist's full name and e-mail, and no address (none is invented).
 */
export function buyerOf(billing: BillingDetails | null | undefined, artist: { name: string; email: string }): Party {
	if (!billing) return { name: artist.name, email: artist.email };
	return {
		name: billing.name,
		street: billing.street,
		postalCode: billing.postalCode,
		city: billing.city,
		country: billing.country,
		...(billing.kind === 'organisation' && billing.vatId ? { vatId: billing.vatId } : {}),
		email: artist.email
	};
}

const REVERSE_CHARGE_NOTE =
	`${REVERSE_CHARGE_WORDS}: no VAT is charged; the customer accounts for the VAT ` +
	'(Council Directive 2006/112/EC, Articles 44 and 196). ';

/** The VAT category a booking's documents carry beside the rate: 'AE' under reverse charge. */
const categoryOf = (treatment: VatTreatment) => (treatment === 'reverse-charge' ? ('AE' as const) : undefined);

export async function bookingForDocuments(tx: Tx, bookingId: string): Promise<BookingForDocuments> {
	const [row] = await tx
		.select({
			studio,
			id: booking.id,
			reference: booking.reference,
			startsAt: booking.startsAt,
			endsAt: booking.endsAt,
			currency: booking.currency,
			quote: booking.quote,
			roomName: room.name,
			billing: booking.billing,
			artistName: user.name,
			artistEmail: user.email
		})
		.from(booking)
		.innerJoin(studio, eq(studio.id, booking.studioId))
		.innerJoin(room, eq(room.id, booking.roomId))
		.innerJoin(user, eq(user.id, booking.artistId))
		.where(eq(booking.id, bookingId));
	if (!row) throw new Error(`no booking ${bookingId}`);
	const { billing, artistName, artistEmail, ...rest } = row;
	const quote = row.quote as Quote;
	return {
		...rest,
		quote,
		customer: buyerOf(billing, { name: artistName, email: artistEmail }),
		vatTreatment: treatmentOf(quote)
	};
}

/** "Live room, Tuesday 2 March 2027, 10:00–15:00 (booking 7K3Q-XM2P)". */
export function sessionWords(
	b: Pick<BookingForDocuments, 'roomName' | 'startsAt' | 'endsAt' | 'reference'>,
	timeZone: string
): string {
	return `${b.roomName}, ${formatDate(b.startsAt, timeZone)}, ${formatTimes(b.startsAt, b.endsAt, timeZone)} (booking ${b.reference})`;
}

/** The deposit invoice (386) for a paid deposit payment; the existing one if already issued. */
export async function issueDepositInvoice(tx: Tx, input: { paymentId: string; issuedAt?: Date }): Promise<InvoiceRow> {
	const sourceKey = `deposit:${input.paymentId}`;
	const existing = await findBySource(tx, sourceKey);
	if (existing) return existing;
	const [pay] = await tx.select().from(payment).where(eq(payment.id, input.paymentId));
	if (!pay || pay.status !== 'paid') throw new Error(`payment ${input.paymentId} is not paid`);
	const b = await bookingForDocuments(tx, pay.bookingId);
	const s = b.studio;
	const tz = s.timeZone;
	const paidAt = pay.paidAt ?? new Date();
	const what = pay.kind === 'move' ? 'Deposit on account, added when the session was moved,' : 'Deposit on account';
	const lines = lumpSumLines(pay.amount, 'deposit', `${what} for ${sessionWords(b, tz)}`, grossByRate(b.quote.vat));
	// Money received is an amount incl. VAT; it is paid in full, so nothing is due (BR-CO-16).
	const totals = documentTotals(lines, {
		currency: pay.currency,
		amountsIncludeVat: true,
		prepaid: pay.amount,
		vatCategory: categoryOf(b.vatTreatment)
	});
	const { invoice: row } = await issueDocument(tx, {
		typeCode: DOCUMENT_TYPE.prepayment,
		issuedAt: input.issuedAt,
		studioId: s.id,
		timeZone: tz,
		supplyDate: localDateOf(paidAt, tz),
		supplier: supplierOf(s),
		customer: b.customer,
		bookingId: b.id,
		paymentId: pay.id,
		sourceKey,
		totals,
		note:
			(b.vatTreatment === 'reverse-charge' ? REVERSE_CHARGE_NOTE : '') +
			`Payment on account of ${formatMoney(pay.amount, pay.currency)} received on ${formatDate(paidAt, tz)} by card. ` +
			'VAT is due on a payment on account when it is received (Directive 2006/112/EC, Article 65); ' +
			'the invoice issued after the session deducts it.'
	});
	return row;
}

/** Deposit invoices of a booking and what is left of them after credit notes: the prepaid amount and its VAT. */
export async function prepaidOf(tx: Pick<Tx, 'select'>, bookingId: string) {
	const docs = await tx
		.select()
		.from(invoice)
		.where(
			and(eq(invoice.bookingId, bookingId), inArray(invoice.typeCode, [DOCUMENT_TYPE.prepayment, DOCUMENT_TYPE.creditNote]))
		);
	const deposits = docs.filter((d) => d.typeCode === DOCUMENT_TYPE.prepayment);
	const depositIds = new Set(deposits.map((d) => d.id));
	const credits = docs.filter(
		(d) => d.typeCode === DOCUMENT_TYPE.creditNote && d.precedingInvoiceId && depositIds.has(d.precedingInvoiceId)
	);
	let amount = 0;
	// By category and rate: a reverse-charged deposit (AE, 0 %) is deducted as AE, not as zero rated.
	const vat = new Map<string, VatRow>();
	const add = (rows: readonly VatRow[], sign: number) => {
		for (const g of rows) {
			const key = `${vatCategoryOf(g)}:${g.rateBp}`;
			const r = vat.get(key) ?? { rateBp: g.rateBp, base: 0, amount: 0, ...(g.category ? { category: g.category } : {}) };
			r.base += sign * g.base;
			r.amount += sign * g.amount;
			vat.set(key, r);
		}
	};
	for (const d of deposits) {
		amount += payableTotal(d);
		add(d.vatBreakdown, 1);
	}
	for (const c of credits) {
		amount -= payableTotal(c);
		add(c.vatBreakdown, -1);
	}
	return { amount, vat: [...vat.values()].filter((r) => r.base !== 0 || r.amount !== 0), deposits };
}

export interface FinalInvoiceInput {
	bookingId: string;
	/** Overtime lines from the pricing engine (overtimeCharge), if any. */
	overtimeLines?: readonly Omit<PriceLine, 'net'>[];
	/** Gear hire lines added on the day, from the pricing engine. */
	extraLines?: readonly Omit<PriceLine, 'net'>[];
	issuedAt?: Date;
}

/** The final invoice (380) of a booking; the existing one if already issued. */
export async function issueFinalInvoice(tx: Tx, input: FinalInvoiceInput): Promise<InvoiceRow> {
	const sourceKey = `final:${input.bookingId}`;
	const existing = await findBySource(tx, sourceKey);
	if (existing) return existing;
	const b = await bookingForDocuments(tx, input.bookingId);
	const s = b.studio;
	const tz = s.timeZone;
	const prepaid = await prepaidOf(tx, b.id);
	// Payments the owner recorded so far (the caller holds the booking's row lock, so none comes in
	// meanwhile). They are not VAT events of their own: the VAT of the whole supply is on this
	// invoice, and the money received only lowers what is due, as paid amount (EN 16931 BT-113).
	const recorded = await tx
		.select()
		.from(recordedPayment)
		.where(eq(recordedPayment.bookingId, input.bookingId))
		.orderBy(recordedPayment.createdAt);
	const recordedPaid = recordedNet(recorded);
	const lines: DocumentLineInput[] = linesFromPriceLines([
		...b.quote.lines,
		...(input.overtimeLines ?? []),
		...(input.extraLines ?? [])
	]);
	const totals = documentTotals(lines, {
		currency: b.currency,
		amountsIncludeVat: b.quote.pricesIncludeVat,
		prepaid: prepaid.amount + recordedPaid,
		vatCategory: categoryOf(b.vatTreatment)
	});
	const reversed = new Set(recorded.map((r) => r.reversesId).filter(Boolean));
	const kept = recorded.filter((r) => r.amount > 0 && !reversed.has(r.id));
	const recordedWords =
		recordedPaid > 0
			? `${RECEIVED_BEFORE_INVOICE}: ${kept
					.map(
						(r) =>
							`${methodLabel(r.method).toLowerCase()} ${formatMoney(r.amount, r.currency)} on ${formatCalendarDate(r.paidOn, { day: 'numeric', month: 'long', year: 'numeric' })}`
					)
					.join(', ')}; counted as paid. `
			: '';
	const depositWords = prepaid.deposits.length
		? `Paid on account: ${prepaid.deposits.map((d) => `${d.displayNumber} (${formatMoney(payableTotal(d), d.currency)})`).join(', ')}; ` +
			'the VAT on it was declared on that deposit invoice. '
		: '';
	const { invoice: row } = await issueDocument(tx, {
		typeCode: DOCUMENT_TYPE.invoice,
		issuedAt: input.issuedAt,
		studioId: s.id,
		timeZone: tz,
		supplyDate: localDateOf(b.startsAt, tz),
		supplier: supplierOf(s),
		customer: b.customer,
		bookingId: b.id,
		precedingInvoiceId: prepaid.deposits[0]?.id ?? null,
		sourceKey,
		totals,
		prepaidVat: prepaid.vat,
		note:
			(b.vatTreatment === 'reverse-charge' ? REVERSE_CHARGE_NOTE : '') +
			`Session: ${sessionWords(b, tz)}. ${depositWords}${recordedWords}Amount due: ${formatMoney(totals.amountDue, b.currency)}.`
	});
	return row;
}

const REFUND_WORDS: Record<string, string> = {
	cancellation: 'refund after cancellation',
	slot_unavailable: 'refund: the slot was no longer free when the payment arrived',
	cancelled_before_payment: 'refund: the booking was cancelled before the payment arrived',
	duplicate: 'refund of a second payment',
	move: 'refund of deposit after the session was moved to a lower price'
};

/**
 * The credit note (381) for a refund that has gone through, referring to the invoice of the
 * refunded payment; null when that payment was never invoiced (then nothing needs correcting).
 */
export async function issueCreditNote(tx: Tx, input: { refundId: string; issuedAt?: Date }): Promise<InvoiceRow | null> {
	const sourceKey = `credit:${input.refundId}`;
	const existing = await findBySource(tx, sourceKey);
	if (existing) return existing;
	const [r] = await tx.select().from(refund).where(eq(refund.id, input.refundId));
	if (!r || r.status !== 'succeeded' || r.amount <= 0 || !r.paymentId) return null;
	const [pay] = await tx.select().from(payment).where(eq(payment.id, r.paymentId));
	if (!pay) return null;
	const [preceding] =
		// A move's payment adds to the deposit and has its own prepayment invoice, under the same key.
		pay.kind === 'deposit' || pay.kind === 'move'
			? await tx
					.select()
					.from(invoice)
					.where(eq(invoice.sourceKey, `deposit:${pay.id}`))
			: await tx
					.select()
					.from(invoice)
					.where(eq(invoice.sourceKey, `final:${pay.bookingId}`));
	if (!preceding) return null;
	const b = await bookingForDocuments(tx, pay.bookingId);
	const s = b.studio;
	const tz = s.timeZone;
	const issuedAt = input.issuedAt ?? new Date();
	const what = REFUND_WORDS[r.reason] ?? 'refund';
	const lines = lumpSumLines(
		r.amount,
		'refund',
		`${what.charAt(0).toUpperCase()}${what.slice(1)}, ${sessionWords(b, tz)}`,
		grossByRate(preceding.vatBreakdown)
	);
	// The refund has been paid out already: shown as paid, nothing left to settle (BR-CO-16). It
	// corrects the invoice under that invoice's VAT treatment, whatever the booking says now.
	const reverseCharged = preceding.vatBreakdown.some((g) => vatCategoryOf(g) === 'AE');
	const totals = documentTotals(lines, {
		currency: r.currency,
		amountsIncludeVat: true,
		prepaid: r.amount,
		vatCategory: reverseCharged ? 'AE' : undefined
	});
	const { invoice: row } = await issueDocument(tx, {
		typeCode: DOCUMENT_TYPE.creditNote,
		issuedAt,
		studioId: s.id,
		timeZone: tz,
		supplyDate: localDateOf(issuedAt, tz),
		supplier: supplierOf(s),
		customer: preceding.customer as Party,
		bookingId: b.id,
		precedingInvoiceId: preceding.id,
		paymentId: pay.id,
		refundId: r.id,
		sourceKey,
		totals,
		note:
			(reverseCharged ? REVERSE_CHARGE_NOTE : '') +
			`Credit note for ${preceding.displayNumber} of ${formatDate(preceding.issuedAt, tz)}: ${formatMoney(r.amount, r.currency)} ` +
			'refunded to the card that paid. It reduces the taxable amount of that invoice (Directive 2006/112/EC, Articles 90 and 219).'
	});
	return row;
}

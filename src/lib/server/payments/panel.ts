// What the booking page shows about money, scoped to the viewer (OWASP ASVS 8.2.2): the artist
// sees their own booking's payments, refunds and documents; the owner also sees why a refund
// failed and may try it again; the owner and engineers record the end of a session. Engineers see
// the money (they read bookings with their price) and which documents exist, but not the
// documents themselves (those are for the artist, the owner and the accountant). Payments recorded
// by hand are lines everyone who sees the panel sees; only the owner records and reverses them.
import { and, asc, eq } from 'drizzle-orm';
import { db } from '../db';
import { booking, bookingGear, gearItem, invoice } from '../db/schema';
import { getPolicy, getStudio } from '../studio';
import { actorAt } from '../bookings/read';
import type { SessionUser } from '../auth';
import { owedOn } from './balance';
import { entryView } from './recorded';
import { unresolvedFailures } from './state';
import { cancelAccess, previewCancellation } from './refunds';
import { documentKindLabel, payableTotal } from '$lib/domain/invoice';
import { closeRefusal, holdLive, isCancellable, noShowPolicyMoment, noShowRefusal } from '$lib/domain/lifecycle';
import { refundForCancellation } from '$lib/domain/pricing';
import { localDateOf, wallDateTime } from '$lib/domain/time';
import { acceptsRecordedPayment } from '$lib/domain/recorded-payments';
import type { MoneyPanelData } from '$lib/types/money';

const OPEN_LINK_MARGIN_MS = 60_000;

export async function loadMoneyPanel(
	person: SessionUser,
	b: { id: string; status?: string; currency?: string; total?: number; deposit?: number }
): Promise<MoneyPanelData | null> {
	const [row] = await db.select().from(booking).where(eq(booking.id, b.id));
	if (!row) return null;
	// Everything here is decided by the person's role at the booking's own studio.
	const viewer = await actorAt(person, row.studioId);
	const isArtist = viewer.role === 'artist';
	if (isArtist && row.artistId !== viewer.id) return null;
	const now = new Date();
	const [studioRow, owing, docs] = await Promise.all([
		getStudio(row.studioId),
		owedOn(db, row),
		db.select().from(invoice).where(eq(invoice.bookingId, row.id)).orderBy(asc(invoice.issuedAt))
	]);
	const { state } = owing;
	const isOwner = viewer.role === 'owner';
	// The same rule as the PDF route (invoices/access.ts): the booking's artist, the owner and the
	// accountant open documents; an engineer sees that they exist, not a link that would answer 403.
	const mayOpenDocuments = isOwner || viewer.role === 'accountant' || (isArtist && row.artistId === viewer.id);
	const mayPay = isOwner || (isArtist && row.artistId === viewer.id);
	const final = docs.find((d) => d.typeCode === 380);
	// The one balance of a booking (payments/balance.ts): its final invoice less what was paid
	// against it by card or recorded by hand; before that invoice only once a payment was recorded
	// by hand (the quote's balance stands until then), and none to pay on a cancelled booking.
	const balanceDue =
		row.status !== 'cancelled' && (final || (owing.recorded.length > 0 && acceptsRecordedPayment(row.status)))
			? owing.owed
			: null;
	const unresolved = new Set(unresolvedFailures(state.refunds).map((r) => r.id));
	const openLink = (kind: 'deposit' | 'balance') => {
		const open = state.payments
			.filter(
				(p) =>
					p.kind === kind &&
					p.status === 'open' &&
					p.checkoutUrl &&
					p.expiresAt &&
					p.expiresAt.getTime() > now.getTime() + OPEN_LINK_MARGIN_MS
			)
			.at(-1);
		return open?.checkoutUrl ?? null;
	};

	const depositPaid = state.payments.some((p) => p.kind === 'deposit' && (p.status === 'paid' || p.status === 'processing'));
	const canCancel = mayPay && isCancellable(row.status) && cancelAccess(viewer, row) === 'ok';
	const preview = canCancel ? await previewCancellation(row, now) : null;

	let recordEnd: MoneyPanelData['actions']['recordEnd'] = null;
	if ((isOwner || viewer.role === 'engineer') && row.status === 'confirmed') {
		const [items, booked] = await Promise.all([
			db
				.select({ id: gearItem.id, name: gearItem.name, hireFee: gearItem.hireFee, hireable: gearItem.hireable })
				.from(gearItem)
				.where(and(eq(gearItem.studioId, row.studioId), eq(gearItem.active, true)))
				.orderBy(asc(gearItem.name)),
			db.select({ id: bookingGear.gearItemId }).from(bookingGear).where(eq(bookingGear.bookingId, row.id))
		]);
		const bookedIds = new Set(booked.map((g) => g.id));
		recordEnd = {
			bookedEnd: wallDateTime(row.endsAt, studioRow.timeZone),
			opensAt: row.startsAt.toISOString(),
			open: closeRefusal(row, now) === null,
			gear: items.map((g) => ({ id: g.id, name: g.name, booked: bookedIds.has(g.id), hireFee: g.hireable ? g.hireFee : 0 }))
		};
	}

	// "Nobody came": for those who record the end, once the start has passed (the same rule the server applies).
	let noShow: MoneyPanelData['actions']['noShow'] = null;
	if ((isOwner || viewer.role === 'engineer') && noShowRefusal(row, now) === null) {
		const { policy } = await getPolicy(row.studioId);
		const r = refundForCancellation({
			paid: state.held,
			deposit: row.deposit,
			bookingStart: row.startsAt,
			cancelledAt: noShowPolicyMoment(row),
			policy
		});
		noShow = { refund: r.refund, keeps: r.retained, rule: r.rungLabel };
	}

	return {
		bookingId: row.id,
		status: row.status,
		currency: row.currency,
		timeZone: studioRow.timeZone,
		viewerRole: viewer.role,
		total: row.total,
		deposit: row.deposit,
		paid: state.paid,
		refunded: state.refunded,
		held: state.held,
		recordedTotal: owing.recordedTotal,
		invoicedTotal: final ? payableTotal(final) : null,
		balanceDue,
		awaitingPayment: state.payments.some((p) => p.kind === 'deposit' && p.status === 'processing'),
		payments: state.payments
			.filter((p) => p.status !== 'open' || p.checkoutSessionId)
			.map((p) => ({
				id: p.id,
				kind: p.kind === 'balance' ? 'balance' : 'deposit',
				amount: p.amount,
				status: p.status,
				paidAt: p.paidAt?.toISOString() ?? null,
				createdAt: p.createdAt.toISOString(),
				problem: isOwner && p.status === 'failed' ? p.failureReason : null
			})),
		refunds: state.refunds.map((r) => ({
			id: r.id,
			amount: r.amount,
			status: r.status,
			reason: r.reason,
			failureReason: isOwner ? r.failureReason : null,
			unresolved: unresolved.has(r.id),
			createdAt: r.createdAt.toISOString()
		})),
		recorded: owing.recorded.map((r) => {
			const v = entryView(r, owing.recorded);
			return {
				id: v.id,
				amount: v.amount,
				method: v.method,
				paidOn: v.paidOn,
				note: v.note,
				reversesId: v.reversesId,
				reason: v.reason,
				reversed: v.reversed
			};
		}),
		invoices: docs.map((d) => ({
			id: d.id,
			number: d.displayNumber,
			typeCode: d.typeCode,
			kind: documentKindLabel(d.typeCode),
			issuedAt: d.issuedAt.toISOString(),
			total: payableTotal(d),
			amountDue: d.amountDue,
			pdfUrl: mayOpenDocuments ? `/invoices/${d.id}/pdf` : null
		})),
		actions: {
			payDeposit:
				mayPay && holdLive(row, now) && !depositPaid && row.deposit > 0
					? { amount: row.deposit, checkoutUrl: openLink('deposit') }
					: null,
			payBalance:
				mayPay &&
				row.status === 'completed' &&
				balanceDue !== null &&
				balanceDue > 0 &&
				!state.payments.some((p) => p.kind === 'balance' && p.status === 'processing')
					? { amount: balanceDue, checkoutUrl: openLink('balance') }
					: null,
			cancel: preview
				? {
						refund: preview.refund,
						rule: preview.rule,
						noticeHours: preview.noticeHours,
						paid: preview.paid,
						onArrival: preview.onArrival
					}
				: null,
			recordEnd,
			noShow,
			retryRefunds: isOwner && unresolved.size > 0,
			recordPayment:
				isOwner && acceptsRecordedPayment(row.status) && owing.owed > 0
					? {
							owed: owing.owed,
							today: localDateOf(now, studioRow.timeZone),
							earliest: localDateOf(row.createdAt, studioRow.timeZone)
						}
					: null,
			reverseRecorded: isOwner
		}
	};
}

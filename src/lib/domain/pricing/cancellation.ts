/**
 * Refund on cancellation, by the notice given: the studio's own ladder of rungs (a ladder by
 * notice — 7 days, 48 h, 24 h — is common practice in studios).
 *
 * The ladder decides how much of the DEPOSIT comes back: the rung with the largest
 * minNoticeHours that the notice reaches. Anything paid beyond the deposit (a balance paid in
 * advance) is for a session that will not happen and is refunded in full (Slateroom's choice; the
 * deposit is what protects the studio's day). The refund is rounded half-up to minor units and is
 * never more than what was paid. A cancellation after the start reaches no rung of ≥ 0 h.
 */
import { mulDivRoundHalfUp } from '../money';
import type { CancellationRung, Minor, StudioPolicy } from '../types';

export interface RefundInput {
	/** Everything the artist has paid for the booking so far. */
	paid: Minor;
	/** The booking's deposit (the part the ladder applies to). */
	deposit: Minor;
	bookingStart: Date;
	cancelledAt: Date;
	policy: Pick<StudioPolicy, 'cancellation'>;
}

export interface RefundResult {
	refund: Minor;
	/** The rung that applied, in words: "48 hours to 7 days' notice: half the deposit refunded". */
	rungLabel: string;
	/** Notice in hours (may be fractional or negative), floored to 2 decimals for display. */
	noticeHours: number;
	/** Share of the deposit refunded, basis points. */
	refundBp: number;
	/** Part of `refund` that is deposit. */
	depositRefund: Minor;
	/** Part of `refund` that is money paid beyond the deposit. */
	balanceRefund: Minor;
	/** paid − refund: what the studio keeps. */
	retained: Minor;
}

function formatNotice(hours: number): string {
	if (hours % 24 === 0 && hours >= 72) {
		const days = hours / 24;
		return `${days} ${days === 1 ? 'day' : 'days'}`;
	}
	return `${hours} ${hours === 1 ? 'hour' : 'hours'}`;
}

function formatShare(bp: number): string {
	if (bp >= 10_000) return 'whole deposit refunded';
	if (bp === 5_000) return 'half the deposit refunded';
	if (bp <= 0) return 'no refund of the deposit';
	return `${bp / 100} % of the deposit refunded`;
}

/** Words for a rung, given the next higher rung's threshold (if any). */
export function rungLabel(rung: CancellationRung, higher?: CancellationRung): string {
	const from = formatNotice(rung.minNoticeHours);
	const notice =
		higher === undefined
			? `${from}' notice or more`
			: rung.minNoticeHours <= 0
				? `Under ${formatNotice(higher.minNoticeHours)}' notice`
				: `${from} to ${formatNotice(higher.minNoticeHours)}' notice`;
	return `${notice.charAt(0).toUpperCase()}${notice.slice(1)}: ${formatShare(rung.refundBp)}`;
}

export function refundForCancellation(input: RefundInput): RefundResult {
	const { paid, deposit, bookingStart, cancelledAt, policy } = input;
	const noticeMs = bookingStart.getTime() - cancelledAt.getTime();
	const noticeHours = Math.floor(noticeMs / 36_000) / 100;
	const ladder = [...policy.cancellation].sort((a, b) => b.minNoticeHours - a.minNoticeHours);
	const index = ladder.findIndex((rung) => noticeMs >= rung.minNoticeHours * 3_600_000);
	const rung = ladder[index];
	const lowest = ladder[ladder.length - 1];

	const refundBp = rung ? Math.min(10_000, Math.max(0, rung.refundBp)) : 0;
	const safePaid = Math.max(0, paid);
	const depositPaid = Math.min(safePaid, Math.max(0, deposit));
	const depositRefund = mulDivRoundHalfUp(depositPaid, refundBp, 10_000);
	const balanceRefund = safePaid - depositPaid;
	const refund = Math.min(safePaid, depositRefund + balanceRefund);

	const label = rung
		? rungLabel(rung, ladder[index - 1])
		: noticeMs < 0
			? 'Cancelled after the start: no refund of the deposit'
			: lowest
				? `Under ${formatNotice(lowest.minNoticeHours)}' notice: no refund of the deposit`
				: 'No cancellation ladder: no refund of the deposit';
	return {
		refund,
		rungLabel: label,
		noticeHours,
		refundBp,
		depositRefund,
		balanceRefund,
		retained: safePaid - refund
	};
}

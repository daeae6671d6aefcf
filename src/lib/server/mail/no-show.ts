// The note an artist gets when the studio records that nobody came to their session: when and
// where it was, what happens to the deposit by the studio's cancellation terms, and how to book
// again. No calendar file: the session's time has passed and stays on the studio's calendar.
import { formatMoney } from '$lib/domain/money';
import { formatDate, formatTimes } from '$lib/domain/time';
import type { ConfirmationFacts } from './confirmation';

export interface NoShowFacts extends ConfirmationFacts {
	/** What goes back by the last rung of the ladder (minor units), and what the studio keeps. */
	refund: number;
	retained: number;
	/** The rung of the ladder that decided, in words. */
	rule: string;
	/** Where the artist books again: the studio's booking page. */
	bookAgainUrl: string;
}

export function composeNoShow(f: NoShowFacts): { subject: string; text: string } {
	const { timeZone, locale } = f.studio;
	const money = (minor: number) => formatMoney(minor, f.currency, locale);
	const when = `${formatDate(f.startsAt, timeZone, locale)}, ${formatTimes(f.startsAt, f.endsAt, timeZone, locale)}`;
	const deposit =
		f.refund > 0
			? [
					`Of your deposit, ${money(f.refund)} goes back to the card you paid with, as the studio's cancellation terms say (${f.rule}); a credit note follows once it has gone through.`,
					f.retained > 0 ? `The studio keeps ${money(f.retained)}.` : null
				]
			: [`Your deposit of ${money(f.retained)} is kept, as the studio's cancellation terms say (${f.rule}).`];
	const text = [
		`Hello ${f.artistName},`,
		'',
		`we recorded that nobody came to your session at ${f.studio.name}.`,
		'',
		`  When:      ${when} (${timeZone} time)`,
		`  Room:      ${f.roomName}`,
		`  Reference: ${f.reference}`,
		'',
		...deposit,
		'Nothing more is charged for this session.',
		'',
		`If this is a mistake, reply to this e-mail. To book another session: ${f.bookAgainUrl}`,
		`Your booking and its documents: ${f.bookingUrl}`,
		'',
		f.studio.name,
		f.studio.email
	]
		.filter((line) => line !== null)
		.join('\n');
	return { subject: `Nobody came: ${f.roomName} on ${when}`, text };
}

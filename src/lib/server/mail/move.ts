// The e-mails of a moved session: to the artist (the new time, room, engineer and gear, and the
// price after the move) and to the engineer (the new time, no prices), each with the updated
// calendar file: the same UID as the confirmation's and a SEQUENCE one higher for each move, so
// a calendar program replaces the event rather than adding one (RFC 5545 §3.8.7.4, RFC 5546
// §2.1.4). The file itself is the confirmation's (bookingCalendarFile); only the words differ.
import { formatMoney } from '$lib/domain/money';
import { formatDate, formatTimes } from '$lib/domain/time';
import { bookingCalendarFile, type ComposedMail, type ConfirmationFacts } from './confirmation';

function sessionWhen(f: Pick<ConfirmationFacts, 'startsAt' | 'endsAt' | 'studio'>): string {
	const { timeZone, locale } = f.studio;
	return `${formatDate(f.startsAt, timeZone, locale)}, ${formatTimes(f.startsAt, f.endsAt, timeZone, locale)}`;
}

export function composeMoved(f: ConfirmationFacts, to: 'artist' | 'engineer', now = new Date()): ComposedMail {
	const { timeZone, locale } = f.studio;
	const money = (minor: number) => formatMoney(minor, f.currency, locale);
	const when = sessionWhen(f);
	const text = [
		to === 'artist' ? `Hello ${f.artistName},` : 'Hello,',
		'',
		to === 'artist'
			? `your session at ${f.studio.name} has been moved. The new time:`
			: `a session you work at ${f.studio.name} has been moved. The new time:`,
		'',
		`  When:      ${when} (${timeZone} time)`,
		`  Room:      ${f.roomName}`,
		`  Engineer:  ${f.engineerName ?? 'none booked'}`,
		f.gear.length ? `  Gear:      ${f.gear.join('; ')}` : null,
		to === 'engineer' ? `  Artist:    ${f.artistName}` : null,
		`  Reference: ${f.reference}`,
		'',
		...(to === 'artist' ? [`  Total after the move: ${money(f.total)}`, `  Deposit: ${money(f.deposit)}`, ''] : []),
		`The booking: ${f.bookingUrl}`,
		'The attached calendar file updates the session in your calendar.',
		'',
		f.studio.name,
		f.studio.email
	]
		.filter((line) => line !== null)
		.join('\n');
	return { subject: `Moved: ${f.roomName} on ${when}`, text, ics: bookingCalendarFile(f, now) };
}

/** The note that a paid move could not be made: the new time was taken before the payment came. */
export function composeMoveFailed(f: ConfirmationFacts, refund: number): { subject: string; text: string } {
	const money = formatMoney(refund, f.currency, f.studio.locale);
	return {
		subject: `Your session was not moved: ${f.reference}`,
		text: [
			`Hello ${f.artistName},`,
			'',
			`the time you asked to move your session to was taken before your payment arrived, so the session`,
			`stays as it was: ${sessionWhen(f)}, ${f.roomName}.`,
			`The ${money} you paid for the move is being refunded in full to the card that paid.`,
			'',
			`The booking: ${f.bookingUrl}`,
			'',
			f.studio.name,
			f.studio.email
		].join('\n')
	};
}

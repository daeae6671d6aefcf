// The confirmation an artist gets once the deposit has come in: when and where, the price as
// booked, what is still to pay, what to prepare, and a calendar file.
//
// The calendar file follows RFC 5545: one VEVENT with one UID (the booking's random UUID, so no
// host or user data, RFC 7986 §5.3) and one DTSTAMP in UTC; DTSTART and DTEND are written as UTC
// times (RFC 5545 §3.3.5, form 2), so the file needs no VTIMEZONE and means the same instant
// whatever zone the server or the reader's device is in; SEQUENCE is the booking's own, which
// rises when a booking is moved. ical-generator writes CRLF line ends and folds at 75 octets.
import ical, { ICalCalendarMethod, ICalEventStatus } from 'ical-generator';
import { formatMoney } from '$lib/domain/money';
import { preparationChecklist } from '$lib/domain/preparation';
import { formatDate, formatTimes } from '$lib/domain/time';
import { postalLines } from '$lib/domain/setup';

export interface ConfirmationFacts {
	bookingId: string;
	reference: string;
	sequence: number;
	startsAt: Date;
	endsAt: Date;
	roomName: string;
	engineerName: string | null;
	gear: string[];
	artistName: string;
	artistEmail: string;
	project: string;
	currency: string;
	total: number;
	deposit: number;
	lines: { label: string; amount: number }[];
	studio: {
		name: string;
		email: string;
		timeZone: string;
		locale: string;
		street: string;
		postalCode: string;
		city: string;
		country: string;
	};
	/** Where the booking's own page is, e.g. https://studio.example/bookings/<id>. */
	bookingUrl: string;
}

export interface ComposedMail {
	subject: string;
	text: string;
	ics: string;
}

/** An ISO 3166 country code in words, e.g. FI → Finland (ECMA-402 Intl.DisplayNames). */
function countryName(code: string, locale: string): string {
	try {
		return new Intl.DisplayNames([locale], { type: 'region' }).of(code) ?? code;
	} catch {
		return code;
	}
}

export function bookingCalendarFile(f: ConfirmationFacts, now = new Date()): string {
	const cal = ical({
		prodId: { company: 'Slateroom', product: 'Bookings', language: 'EN' },
		method: ICalCalendarMethod.PUBLISH,
		name: f.studio.name
	});
	const description = [
		`Booking ${f.reference}`,
		f.engineerName ? `Engineer: ${f.engineerName}` : 'No engineer booked',
		f.gear.length ? `Gear: ${f.gear.join('; ')}` : '',
		f.bookingUrl
	]
		.filter(Boolean)
		.join('\n');
	cal.createEvent({
		id: f.bookingId,
		sequence: f.sequence,
		stamp: now,
		start: f.startsAt,
		end: f.endsAt,
		summary: `${f.roomName} at ${f.studio.name}`,
		description,
		location: [...postalLines(f.studio), countryName(f.studio.country, f.studio.locale)].filter(Boolean).join(', '),
		url: f.bookingUrl
	});
	return cal.toString();
}

/** The session's day and times as the e-mails write them: 'Tuesday 2 March 2027, 10:00–14:00'. */
function sessionWhen(f: ConfirmationFacts): string {
	const { timeZone, locale } = f.studio;
	return `${formatDate(f.startsAt, timeZone, locale)}, ${formatTimes(f.startsAt, f.endsAt, timeZone, locale)}`;
}

export function composeConfirmation(f: ConfirmationFacts, now = new Date()): ComposedMail {
	const { timeZone, locale } = f.studio;
	const money = (minor: number) => formatMoney(minor, f.currency, locale);
	const when = sessionWhen(f);
	const balance = f.total - f.deposit;
	const checklist = preparationChecklist(f.engineerName !== null)
		.map((g) => [`${g.title}:`, ...g.items.map((i) => `  - ${i}`)].join('\n'))
		.join('\n\n');
	const text = [
		`Hello ${f.artistName},`,
		'',
		`your deposit has arrived and your session at ${f.studio.name} is booked.`,
		'',
		`  When:      ${when} (${timeZone} time)`,
		`  Room:      ${f.roomName}`,
		`  Engineer:  ${f.engineerName ?? 'none booked'}`,
		f.gear.length ? `  Gear:      ${f.gear.join('; ')}` : null,
		f.project ? `  Project:   ${f.project}` : null,
		`  Reference: ${f.reference}`,
		'',
		'Price as booked:',
		...f.lines.map((l) => `  ${l.label}: ${money(l.amount)}`),
		`  Total: ${money(f.total)}`,
		`  Deposit received: ${money(f.deposit)}`,
		`  Balance after the session: ${money(balance)}, plus any overtime or extra gear used`,
		'',
		'What to prepare',
		'',
		checklist,
		'',
		`Your booking, its invoices and the cancellation terms: ${f.bookingUrl}`,
		'The attached calendar file adds the session to your calendar.',
		'',
		f.studio.name,
		f.studio.email
	]
		.filter((line) => line !== null)
		.join('\n');
	return {
		subject: `Booked: ${f.roomName} on ${when}`,
		text,
		ics: bookingCalendarFile(f, now)
	};
}

export interface CancellationFacts extends ConfirmationFacts {
	refund: number;
	retained: number;
	rule: string;
}

/**
 * The calendar file that takes a cancelled session off the artist's calendar: the same UID with a
 * higher SEQUENCE, STATUS:CANCELLED and METHOD:CANCEL (RFC 5545 §3.8.1.11, RFC 5546 §3.2.5).
 */
export function cancellationCalendarFile(f: ConfirmationFacts, now = new Date()): string {
	const cal = ical({
		prodId: { company: 'Slateroom', product: 'Bookings', language: 'EN' },
		method: ICalCalendarMethod.CANCEL,
		name: f.studio.name
	});
	cal.createEvent({
		id: f.bookingId,
		sequence: f.sequence + 1,
		stamp: now,
		start: f.startsAt,
		end: f.endsAt,
		summary: `Cancelled: ${f.roomName} at ${f.studio.name}`,
		status: ICalEventStatus.CANCELLED,
		url: f.bookingUrl
	});
	return cal.toString();
}

export function composeCancellation(f: CancellationFacts, now = new Date()): ComposedMail {
	const { timeZone, locale } = f.studio;
	const money = (minor: number) => formatMoney(minor, f.currency, locale);
	const when = sessionWhen(f);
	const text = [
		`Hello ${f.artistName},`,
		'',
		`your session at ${f.studio.name} is cancelled.`,
		'',
		`  When:      ${when} (${timeZone} time)`,
		`  Room:      ${f.roomName}`,
		`  Reference: ${f.reference}`,
		'',
		`Cancellation terms: ${f.rule}.`,
		f.refund > 0
			? `Refund: ${money(f.refund)}, back to the card you paid with; a credit note follows once it has gone through.`
			: 'Refund: none.',
		f.retained > 0 ? `Kept by the studio: ${money(f.retained)}.` : null,
		'',
		`Your booking and its documents: ${f.bookingUrl}`,
		'The attached calendar file takes the session off your calendar.',
		'',
		f.studio.name,
		f.studio.email
	]
		.filter((line) => line !== null)
		.join('\n');
	return { subject: `Cancelled: ${f.roomName} on ${when}`, text, ics: cancellationCalendarFile(f, now) };
}

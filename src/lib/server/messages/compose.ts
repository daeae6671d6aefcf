// What the scheduled e-mails say: the reminder before a session (when and where, how to get
// there and in, what to prepare and what the artist has sent so far) and the balance request
// after it. Plain text with a simple HTML copy, in the studio's zone and locale.
import { formatMoney } from '$lib/domain/money';
import { preparationChecklist } from '$lib/domain/preparation';
import { formatDate, formatTimes } from '$lib/domain/time';
import { postalLines } from '$lib/domain/setup';

export interface MessageFacts {
	bookingId: string;
	reference: string;
	startsAt: Date;
	endsAt: Date;
	roomName: string;
	engineerName: string | null;
	artistName: string;
	project: string;
	currency: string;
	studio: {
		name: string;
		email: string;
		timeZone: string;
		locale: string;
		street: string;
		postalCode: string;
		city: string;
		directions: string;
		loadInNotes: string;
	};
	/** The artist's files on the booking so far, oldest first. */
	uploads: { name: string; typeLabel: string }[];
	bookingUrl: string;
}

export interface ComposedMessage {
	subject: string;
	text: string;
	html: string;
}

const escapeHtml = (s: string) =>
	s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** Paragraphs of the owner's own text (blank lines part them), as HTML. */
const paragraphs = (s: string) =>
	s
		.trim()
		.split(/\n\s*\n/)
		.map((p) => `<p>${escapeHtml(p.trim()).replace(/\n/g, '<br>')}</p>`)
		.join('');

function when(f: MessageFacts): string {
	const { timeZone, locale } = f.studio;
	return `${formatDate(f.startsAt, timeZone, locale)}, ${formatTimes(f.startsAt, f.endsAt, timeZone, locale)}`;
}

function address(f: MessageFacts): string {
	return postalLines(f.studio).filter(Boolean).join(', ');
}

/** "in 7 days" / "in 48 hours": how far ahead the reminder's offset is, as people say it. */
export function aheadLabel(hours: number): string {
	return hours % 24 === 0 && hours >= 72 ? `in ${hours / 24} days` : `in ${hours} hours`;
}

export function composeReminder(f: MessageFacts, hours: number): ComposedMessage {
	const w = when(f);
	const place = address(f);
	const checklist = preparationChecklist(f.engineerName !== null);
	const files = f.uploads.length
		? f.uploads.map((u) => `  - ${u.name} (${u.typeLabel})`)
		: ['  Nothing yet. You can add reference tracks, lyric sheets or stems on your booking page.'];
	const text = [
		`Hello ${f.artistName},`,
		'',
		`your session at ${f.studio.name} is ${aheadLabel(hours)}.`,
		'',
		`  When:      ${w} (${f.studio.timeZone} time)`,
		`  Room:      ${f.roomName}`,
		`  Engineer:  ${f.engineerName ?? 'none booked'}`,
		f.project ? `  Project:   ${f.project}` : null,
		place ? `  Address:   ${place}` : null,
		`  Reference: ${f.reference}`,
		'',
		f.studio.directions.trim() ? `Getting here\n\n${f.studio.directions.trim()}\n` : null,
		f.studio.loadInNotes.trim() ? `Loading in\n\n${f.studio.loadInNotes.trim()}\n` : null,
		'What to prepare',
		'',
		checklist.map((g) => [`${g.title}:`, ...g.items.map((i) => `  - ${i}`)].join('\n')).join('\n\n'),
		'',
		'Your files on the booking so far:',
		...files,
		'',
		`Your booking: ${f.bookingUrl}`,
		'',
		f.studio.name,
		f.studio.email
	]
		.filter((line) => line !== null)
		.join('\n');
	const html = [
		`<p>Hello ${escapeHtml(f.artistName)},</p>`,
		`<p>your session at ${escapeHtml(f.studio.name)} is ${aheadLabel(hours)}.</p>`,
		'<table>',
		`<tr><th align="left">When</th><td>${escapeHtml(w)} (${escapeHtml(f.studio.timeZone)} time)</td></tr>`,
		`<tr><th align="left">Room</th><td>${escapeHtml(f.roomName)}</td></tr>`,
		`<tr><th align="left">Engineer</th><td>${escapeHtml(f.engineerName ?? 'none booked')}</td></tr>`,
		f.project ? `<tr><th align="left">Project</th><td>${escapeHtml(f.project)}</td></tr>` : '',
		place ? `<tr><th align="left">Address</th><td>${escapeHtml(place)}</td></tr>` : '',
		`<tr><th align="left">Reference</th><td>${escapeHtml(f.reference)}</td></tr>`,
		'</table>',
		f.studio.directions.trim() ? `<h3>Getting here</h3>${paragraphs(f.studio.directions)}` : '',
		f.studio.loadInNotes.trim() ? `<h3>Loading in</h3>${paragraphs(f.studio.loadInNotes)}` : '',
		'<h3>What to prepare</h3>',
		...checklist.map(
			(g) => `<h4>${escapeHtml(g.title)}</h4><ul>${g.items.map((i) => `<li>${escapeHtml(i)}</li>`).join('')}</ul>`
		),
		'<h3>Your files on the booking so far</h3>',
		f.uploads.length
			? `<ul>${f.uploads.map((u) => `<li>${escapeHtml(u.name)} (${escapeHtml(u.typeLabel)})</li>`).join('')}</ul>`
			: '<p>Nothing yet. You can add reference tracks, lyric sheets or stems on your booking page.</p>',
		`<p><a href="${escapeHtml(f.bookingUrl)}">Your booking</a></p>`,
		`<p>${escapeHtml(f.studio.name)}<br>${escapeHtml(f.studio.email)}</p>`
	]
		.filter(Boolean)
		.join('\n');
	return { subject: `Coming up: ${f.roomName} on ${w}`, text, html };
}

export function composeBalanceRequest(f: MessageFacts, owed: number): ComposedMessage {
	const w = when(f);
	const amount = formatMoney(owed, f.currency, f.studio.locale);
	const text = [
		`Hello ${f.artistName},`,
		'',
		`thank you for your session at ${f.studio.name}.`,
		'',
		`  When:      ${w} (${f.studio.timeZone} time)`,
		`  Room:      ${f.roomName}`,
		`  Reference: ${f.reference}`,
		'',
		`Balance to pay: ${amount}`,
		'',
		`The final invoice and a button to pay the balance by card are on your booking page: ${f.bookingUrl}`,
		'',
		f.studio.name,
		f.studio.email
	].join('\n');
	const html = [
		`<p>Hello ${escapeHtml(f.artistName)},</p>`,
		`<p>thank you for your session at ${escapeHtml(f.studio.name)} (${escapeHtml(w)}, ${escapeHtml(f.roomName)}, reference ${escapeHtml(f.reference)}).</p>`,
		`<p><strong>Balance to pay: ${escapeHtml(amount)}</strong></p>`,
		`<p>The final invoice and a button to pay the balance by card are on <a href="${escapeHtml(f.bookingUrl)}">your booking page</a>.</p>`,
		`<p>${escapeHtml(f.studio.name)}<br>${escapeHtml(f.studio.email)}</p>`
	].join('\n');
	return {
		subject: `Balance for your session on ${formatDate(f.startsAt, f.studio.timeZone, f.studio.locale)}: ${amount}`,
		text,
		html
	};
}

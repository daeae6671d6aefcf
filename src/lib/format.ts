// Formatting at the edges: instants shown in the studio's zone, money in its currency.
export { formatMoney } from '$lib/domain/money';

export function formatDateTime(iso: string | Date, timeZone: string, locale = 'en-GB'): string {
	return new Intl.DateTimeFormat(locale, {
		timeZone,
		weekday: 'short',
		day: 'numeric',
		month: 'short',
		year: 'numeric',
		hour: '2-digit',
		minute: '2-digit'
	}).format(new Date(iso));
}

export function formatTime(iso: string | Date, timeZone: string, locale = 'en-GB'): string {
	return new Intl.DateTimeFormat(locale, { timeZone, hour: '2-digit', minute: '2-digit' }).format(new Date(iso));
}

export function formatDate(iso: string | Date, timeZone: string, locale = 'en-GB'): string {
	return new Intl.DateTimeFormat(locale, { timeZone, weekday: 'long', day: 'numeric', month: 'long', year: 'numeric' }).format(
		new Date(iso)
	);
}

export function formatRange(start: string | Date, end: string | Date, timeZone: string, locale = 'en-GB'): string {
	return `${formatDateTime(start, timeZone, locale)} – ${formatTime(end, timeZone, locale)}`;
}

export function formatDuration(minutes: number): string {
	const h = Math.floor(minutes / 60);
	const m = minutes % 60;
	return m ? `${h} h ${m} min` : `${h} h`;
}

// Setting up a new studio: the steps its owner goes through before publishing, the prefix of its
// booking references and the defaults a new studio starts from. Plain rules, no framework.
import type { CancellationRung, OpeningHours } from './types';

/**
 * The set-up steps, in the order the owner meets them; publishing comes after the last. `payouts`
 * (Get paid) is done when the studio's payment account can take charges, not when it is saved.
 */
export const SETUP_STEPS = ['address', 'vat', 'rooms', 'engineer', 'hours', 'rules', 'holidays', 'payouts'] as const;
export type SetupStep = (typeof SETUP_STEPS)[number];

export const SETUP_STEP_TITLES: Record<SetupStep, string> = {
	address: 'Address',
	vat: 'VAT',
	rooms: 'Rooms',
	engineer: 'Engineer rates',
	hours: 'Opening hours',
	rules: 'Booking rules',
	holidays: 'Public holidays',
	payouts: 'Get paid'
};

export function isSetupStep(text: string): text is SetupStep {
	return (SETUP_STEPS as readonly string[]).includes(text);
}

/** How many of the steps are done, counting each known step once. */
export function stepsDone(done: readonly string[]): number {
	return SETUP_STEPS.filter((s) => done.includes(s)).length;
}

/** The first step not yet done, or null when all are. */
export function nextStep(done: readonly string[]): SetupStep | null {
	return SETUP_STEPS.find((s) => !done.includes(s)) ?? null;
}

/** Two to four capital letters (A–Z): the start of a booking reference, HP-7K3Q-XM2P. */
export const REFERENCE_PREFIX_PATTERN = /^[A-Z]{2,4}$/;

/** Words that say nothing about which studio it is, left out of the initials. */
const FILLER_WORDS = new Set(['studio', 'studios', 'the']);

/**
 * A reference prefix proposed from a studio's name: the initials of its words, leaving out
 * "studio", "studios" and "the" (Hollow Pine Studio: HP), at most four; a name with fewer than two
 * initials gives its first two letters (Echo: EC); a name without Latin letters gives SR.
 * Accents are dropped first (Ääni Talo: AT).
 */
export function referencePrefixFromName(name: string): string {
	const latin = name
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.replace(/[^A-Za-z]+/g, ' ')
		.trim();
	const words = latin.split(' ').filter((w) => w !== '' && !FILLER_WORDS.has(w.toLowerCase()));
	const initials = words.map((w) => w[0]!.toUpperCase()).join('');
	if (initials.length >= 2) return initials.slice(0, 4);
	const letters = latin.replace(/ /g, '').toUpperCase();
	return letters.length >= 2 ? letters.slice(0, 2) : 'SR';
}

/** A new studio's opening hours: 10:00 to 22:00 every day, which the owner changes in the set-up. */
export const DEFAULT_OPENING_HOURS: readonly OpeningHours[] = [1, 2, 3, 4, 5, 6, 7].map((weekday) => ({
	weekday,
	openMinute: 10 * 60,
	closeMinute: 22 * 60
}));

/** A new studio's cancellation ladder: the whole deposit back with a week's notice, half with two days', none later. */
export const DEFAULT_CANCELLATION: readonly CancellationRung[] = [
	{ minNoticeHours: 7 * 24, refundBp: 10_000 },
	{ minNoticeHours: 48, refundBp: 5000 },
	{ minNoticeHours: 0, refundBp: 0 }
];

/** A new studio's booking rules and deposit, before the owner changes them (minutes, basis points). */
export const DEFAULT_RULES = {
	halfDayMinutes: 4 * 60,
	fullDayMinutes: 8 * 60,
	minBookingMinutes: 60,
	incrementMinutes: 30,
	turnaroundMinutes: 30,
	minNoticeMinutes: 24 * 60,
	horizonDays: 180,
	holdMinutes: 30,
	depositBp: 3000,
	overtimeIncrementMinutes: 15
} as const;

/** A postal address as printed lines: the street, then the postal code and city ("33980 Pirkkala"). */
export function postalLines(a: { street?: string; postalCode?: string; city?: string }): string[] {
	const place = [a.postalCode ?? '', a.city ?? ''].filter(Boolean).join(' ');
	return [a.street ?? '', place].filter(Boolean);
}

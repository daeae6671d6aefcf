// The four roles and what each may do. Shared by server guards and navigation.
import { studioPath } from './studio-paths';
export const ROLES = ['owner', 'engineer', 'accountant', 'artist'] as const;
export type Role = (typeof ROLES)[number];

export function isRole(value: unknown): value is Role {
	return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

export const ROLE_LABELS: Record<Role, string> = {
	owner: 'Owner',
	engineer: 'Engineer',
	accountant: 'Accountant',
	artist: 'Artist'
};

/** Where each role lands after signing in. */
export const HOME_FOR_ROLE: Record<Role, string> = {
	owner: '/studio',
	engineer: '/plan',
	accountant: '/accounts',
	artist: '/bookings'
};

export interface NavItem {
	href: string;
	label: string;
}

/**
 * The site's menu for a role. `studio` is the short name of the studio whose storefront the page
 * is in: its rooms, calendar and booking page are offered there only, never on the platform's
 * own pages (which studio would they be?).
 */
export function navigationFor(role: Role | null, studio: string | null = null): NavItem[] {
	const common: NavItem[] = studio
		? [
				{ href: studioPath(studio, 'rooms'), label: 'Rooms & rates' },
				{ href: studioPath(studio, 'calendar'), label: 'Calendar' }
			]
		: [];
	const book: NavItem[] = studio ? [{ href: studioPath(studio, 'book'), label: 'Book a session' }] : [];
	switch (role) {
		case 'owner':
			return [
				{ href: '/studio', label: 'Studio desk' },
				{ href: '/studio/bookings', label: 'All bookings' },
				{ href: '/plan', label: 'Day plan' },
				{ href: '/studio/rooms', label: 'Rooms & gear' },
				{ href: '/studio/settings', label: 'Rates & policy' },
				{ href: '/studio/people', label: 'People' },
				{ href: '/accounts', label: 'Accounts' }
			];
		case 'engineer':
			return [{ href: '/plan', label: 'Day plan' }, ...common];
		case 'accountant':
			return [{ href: '/accounts', label: 'Accounts' }];
		case 'artist':
			return [...book, { href: '/bookings', label: 'My bookings' }, { href: '/account', label: 'Billing details' }, ...common];
		default:
			return [...common, ...book];
	}
}

/**
 * Who may book a session (make a hold and pay for it): everyone but the accountant, whose role
 * reads the accounts and nothing else. A visitor may open the booking page and is asked to sign in.
 */
export function mayBook(role: Role | null): boolean {
	return role !== 'accountant';
}

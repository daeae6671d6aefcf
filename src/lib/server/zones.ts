// Which roles may enter each zone of the site. The hook turns strangers away early; each page
// and endpoint still checks for itself.
import type { Role } from '$lib/roles';

interface Zone {
	prefix: string;
	roles: Role[] | 'signed-in';
}

const ZONES: Zone[] = [
	{ prefix: '/studio', roles: ['owner'] },
	{ prefix: '/plan', roles: ['owner', 'engineer'] },
	{ prefix: '/accounts', roles: ['owner', 'accountant'] },
	{ prefix: '/studios', roles: 'signed-in' },
	{ prefix: '/bookings', roles: 'signed-in' },
	{ prefix: '/account', roles: 'signed-in' },
	{ prefix: '/uploads', roles: 'signed-in' }
];

/** The first part of each zone's address: never a studio's short name (src/lib/domain/studio-slug.ts). */
export const ZONE_PREFIXES: readonly string[] = ZONES.map((z) => z.prefix);

export function zoneFor(pathname: string): Zone | undefined {
	return ZONES.find((z) => pathname === z.prefix || pathname.startsWith(z.prefix + '/'));
}

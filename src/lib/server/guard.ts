// Function- and object-level authorization (OWASP ASVS 8.2.1, 8.2.2): every load, action and
// endpoint calls one of these itself, whatever the layout or hook already checked.
import { error } from '@sveltejs/kit';
import type { Role } from '$lib/roles';
import type { SessionUser } from './auth';

export function requireUser(locals: App.Locals): SessionUser {
	if (!locals.user) error(401, { error: 'unauthenticated', message: 'Please sign in first.' });
	return locals.user;
}

export function requireRole(locals: App.Locals, ...roles: Role[]): SessionUser {
	const user = requireUser(locals);
	if (!roles.includes(user.role)) {
		error(403, { error: 'forbidden', message: 'Your role does not give access to this.' });
	}
	return user;
}

export function hasRole(locals: App.Locals, ...roles: Role[]): boolean {
	return !!locals.user && roles.includes(locals.user.role);
}

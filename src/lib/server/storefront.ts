// The studio an address names (/hollow-pine/…, /api/studios/hollow-pine/…): found by its short
// name, and seen only by those who may see it. A studio not published yet is its team's alone:
// to anyone else it answers as if it did not exist (404), so its name is not even confirmed.
import { error } from '@sveltejs/kit';
import type { StaffRole } from './db/schema';
import { apiError } from './api';
import { studioBySlug, type StudioAtAddress } from './studio';

export const STUDIO_NOT_FOUND = 'There is no studio at this address.';

/** The studio of a page's address; 404 when there is none the viewer may see. */
export async function pageStudio(slug: string, locals: App.Locals): Promise<StudioAtAddress> {
	const at = await studioBySlug(slug, locals.memberships);
	if (!at) error(404, { error: 'not_found', message: STUDIO_NOT_FOUND });
	return at;
}

export type ApiStudio = { ok: true; at: StudioAtAddress } | { ok: false; response: Response };

/** The studio of an API address; a 404 in the API's error shape when there is none the caller may see. */
export async function apiStudio(slug: string, locals: App.Locals): Promise<ApiStudio> {
	const at = await studioBySlug(slug, locals.memberships);
	return at ? { ok: true, at } : { ok: false, response: apiError(404, 'not_found', STUDIO_NOT_FOUND) };
}

/**
 * The studio of a staff endpoint's address, for a caller in its team with one of `roles` there:
 * 404 as above, 401 for a visitor, 403 for anyone else. The role is the caller's in this studio,
 * whichever studio they work in now: a person in two teams reads either by its address.
 */
export async function apiStaffStudio(
	slug: string,
	locals: App.Locals,
	roles: readonly StaffRole[],
	refusal: string
): Promise<{ ok: true; at: StudioAtAddress; user: NonNullable<App.Locals['user']> } | { ok: false; response: Response }> {
	const found = await apiStudio(slug, locals);
	if (!found.ok) return found;
	if (!locals.user) return { ok: false, response: apiError(401, 'unauthenticated', 'Please sign in first.') };
	const role = found.at.membership?.role;
	if (!role || !roles.includes(role)) return { ok: false, response: apiError(403, 'forbidden', refusal) };
	return { ok: true, at: found.at, user: locals.user };
}

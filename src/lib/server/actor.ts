// Who changes a studio's data: the person, where from, and the studio they act in. Every staff
// write takes one, so it can only reach rows of that studio and the audit log says whose it was.
import { error } from '@sveltejs/kit';
import type { SessionUser } from './auth';

export interface Actor {
	user: Pick<SessionUser, 'id'>;
	ip?: string | null;
	studioId: string;
}

/** The actor for a staff member's request, in the studio they work in now; 403 for anyone outside a team. */
export function staffActor(locals: App.Locals, ip: string | null): Actor {
	if (!locals.user || !locals.studio) error(403, { error: 'forbidden', message: 'You are not in a studio’s team.' });
	return { user: locals.user, ip, studioId: locals.studio.studioId };
}

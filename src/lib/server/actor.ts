// Who changes a studio's data: the person, where from, and the studio they act in. Every staff
// write takes one, so it can only reach rows of that studio and the audit log says whose it was.
import type { SessionUser } from './auth';
import { getStudio } from './studio';

export interface Actor {
	user: Pick<SessionUser, 'id'>;
	ip?: string | null;
	studioId: string;
}

/** The actor for a staff member's request: for now in the studio the app serves. */
export async function staffActor(user: Pick<SessionUser, 'id'>, ip: string | null): Promise<Actor> {
	const studio = await getStudio();
	return { user, ip, studioId: studio.id };
}

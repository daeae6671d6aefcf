/**
 * When a booking may move on in its life: held → pending → confirmed → completed, or cancelled or
 * expired on the way. Pure rules, no framework or database.
 *
 * Recording the end of a session ("closing" it) completes the booking and issues its final
 * invoice, whose date of supply is the session's (Directive 2006/112/EC, Article 226(7)). A
 * session that has not begun has supplied nothing, so it cannot be closed before its start.
 */

export type CloseRefusal = { code: 'not_confirmed'; message: string } | { code: 'not_started'; message: string; opensAt: Date };

export interface Closable {
	status: string;
	startsAt: Date;
}

/** Whether the end of this session may be recorded now; null when it may. */
export function closeRefusal(b: Closable, now: Date): CloseRefusal | null {
	if (b.status !== 'confirmed') {
		return { code: 'not_confirmed', message: 'Only a confirmed booking (deposit paid) can be closed.' };
	}
	if (now.getTime() < b.startsAt.getTime()) {
		return {
			code: 'not_started',
			message: 'The session has not started yet: its end can be recorded once it has begun.',
			opensAt: b.startsAt
		};
	}
	return null;
}

// The audit log: who did what, when, from where (OWASP ASVS 16.3.1 for sign-in events).
import { db } from './db';
import { auditLog } from './db/schema';

export async function audit(entry: {
	/** The studio whose data changed; none for the platform's own events (sign-in, sign-up). */
	studioId?: string | null;
	actorId?: string | null;
	action: string;
	entity?: string;
	entityId?: string | null;
	data?: unknown;
	ip?: string | null;
}) {
	try {
		await db.insert(auditLog).values({
			studioId: entry.studioId ?? null,
			actorId: entry.actorId ?? null,
			action: entry.action,
			entity: entry.entity ?? '',
			entityId: entry.entityId ?? null,
			data: entry.data ?? null,
			ip: entry.ip ?? null
		});
	} catch (e) {
		// An audit write must never break the action it records.
		console.warn('[audit] could not write', entry.action, (e as Error).message);
	}
}

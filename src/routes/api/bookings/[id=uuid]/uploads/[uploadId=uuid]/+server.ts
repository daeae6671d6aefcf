import { apiError } from '$lib/server/api';
import * as uploads from '$lib/server/uploads';
import type { RequestHandler } from './$types';

export const DELETE: RequestHandler = async ({ locals, params, getClientAddress }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	const removed = await uploads.remove(locals.user, params.id, params.uploadId);
	if (!removed.ok) return apiError(removed.status, removed.error, removed.message);
	await uploads.auditRemoved(locals.user, params.id, params.uploadId, getClientAddress());
	return new Response(null, { status: 204 });
};

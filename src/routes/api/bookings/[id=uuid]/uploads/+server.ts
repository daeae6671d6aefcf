import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { readFileField } from '$lib/server/multipart';
import * as uploads from '$lib/server/uploads';
import { getStudio } from '$lib/server/studio';
import { isoInZone } from '$lib/domain/time';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, params }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	const listed = await uploads.listForViewer(locals.user, params.id);
	if (!listed.ok) return apiError(listed.status, listed.error, listed.message);
	const { timeZone } = await getStudio(listed.studioId);
	return json({
		uploads: listed.uploads.map((u) => uploads.uploadJson(u, (d) => isoInZone(d, timeZone))),
		usage: listed.usage,
		limits: listed.limits,
		open: listed.open
	});
};

/** multipart/form-data with the file in a field named `file`; 201 with the stored upload. */
export const POST: RequestHandler = async ({ locals, params, request, getClientAddress }) => {
	const me = locals.user;
	if (!me) return apiError(401, 'unauthenticated', 'Please sign in first.');
	const received = await readFileField(request, 'file', (file) => uploads.save(me, params.id, file));
	if (!received.ok) return apiError(received.status, received.error, received.message);
	const saved = received.value;
	if (!saved.ok) return apiError(saved.status, saved.error, saved.message);
	const u = saved.upload;
	await uploads.auditAdded(me, params.id, u, getClientAddress());
	const { timeZone } = await getStudio(u.studioId);
	return json(
		uploads.uploadJson(u, (d) => isoInZone(d, timeZone)),
		{ status: 201 }
	);
};

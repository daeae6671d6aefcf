// Downloads a booking's file: always as an attachment, in the type decided from its content when
// it arrived, never sniffed by the browser.
import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { Readable } from 'node:stream';
import { apiError } from '$lib/server/api';
import * as uploads from '$lib/server/uploads';
import { attachmentDisposition, downloadName } from '$lib/domain/uploads';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, params }) => {
	if (!locals.user) return apiError(401, 'unauthenticated', 'Please sign in first.');
	const found = await uploads.getForDownload(locals.user, params.id);
	if (!found.ok) return apiError(found.status, found.error, found.message);
	const info = await stat(found.path).catch(() => null);
	if (!info?.isFile()) {
		console.error('[uploads] the file of upload', found.upload.id, 'is missing from the disk');
		return apiError(404, 'not_found', 'The file is missing; ask the studio.');
	}
	const u = found.upload;
	return new Response(Readable.toWeb(createReadStream(found.path)) as ReadableStream<Uint8Array>, {
		headers: {
			'content-type': u.contentType,
			'content-length': String(info.size),
			'content-disposition': attachmentDisposition(downloadName(u.originalName, u.contentType)),
			'x-content-type-options': 'nosniff',
			'cache-control': 'private, no-store',
			// Opened directly, the file still runs nothing (a PDF's scripts, say).
			'content-security-policy': "default-src 'none'; sandbox"
		}
	});
};

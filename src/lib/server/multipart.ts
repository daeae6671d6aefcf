// Reads one file out of a multipart/form-data request as it arrives, without holding the body in
// memory (request.formData() would buffer all of it). The handler consumes the file's stream and
// may stop early (a file that is too large); the rest of the body is then left unread.
import { Readable } from 'node:stream';
import Busboy from 'busboy';

export interface IncomingFile {
	/** The name the client gave; display text only. */
	name: string;
	stream: AsyncIterable<Uint8Array>;
}

export type MultipartOutcome<T> =
	{ ok: true; value: T } | { ok: false; status: 400 | 413 | 415 | 422; error: string; message: string };

/** True for the error adapter-node raises when a body passes BODY_SIZE_LIMIT. */
export function isBodyTooLarge(e: unknown): boolean {
	return !!e && typeof e === 'object' && 'status' in e && e.status === 413;
}

/**
 * Streams the request body into a multipart parser and hands the first file part named `field`
 * to `handle`. Other parts are skipped. Resolves with what `handle` returned, or why there was no
 * file to hand over.
 */
export function readFileField<T>(
	request: Request,
	field: string,
	handle: (file: IncomingFile) => Promise<T>
): Promise<MultipartOutcome<T>> {
	const type = request.headers.get('content-type') ?? '';
	const source = request.body;
	if (!/^multipart\/form-data\s*;/i.test(type) || !source) {
		return Promise.resolve({
			ok: false,
			status: 415,
			error: 'unsupported_media_type',
			message: 'Send the file as multipart/form-data, in a field named “file”.'
		});
	}
	let parser: Busboy.Busboy;
	try {
		// A handful of small text fields may ride along (a form action's own fields); one file.
		parser = Busboy({
			headers: { 'content-type': type },
			limits: { files: 1, fields: 10, fieldSize: 4096, parts: 12 },
			// Browsers send the file name as raw UTF-8 (WHATWG HTML, multipart/form-data encoding); busboy's default is Latin-1.
			defParamCharset: 'utf8'
		});
	} catch {
		return Promise.resolve({
			ok: false,
			status: 400,
			error: 'bad_request',
			message: 'The upload could not be read as multipart/form-data.'
		});
	}

	return new Promise((resolve, reject) => {
		let settled = false;
		let handling = false;
		const body = Readable.from(chunksOf(source));
		const stopReading = () => {
			// Stop reading the body, without cancelling it: adapter-node answers a cancelled body by
			// closing the connection, and the client would never see our answer.
			body.unpipe(parser);
			body.pause();
		};
		const finish = (outcome: MultipartOutcome<T>) => {
			if (settled) return;
			settled = true;
			stopReading();
			resolve(outcome);
		};

		parser.on('file', (name, stream, info) => {
			if (name !== field || handling) {
				stream.resume();
				return;
			}
			handling = true;
			handle({ name: info.filename ?? '', stream }).then(
				(value) => finish({ ok: true, value }),
				(e: unknown) => {
					if (isBodyTooLarge(e)) return finish(tooLarge());
					// Something on our side (the disk, the database): the caller's 500.
					settled = true;
					stopReading();
					reject(e instanceof Error ? e : new Error(String(e)));
				}
			);
		});
		parser.on('close', () => {
			if (!handling) finish({ ok: false, status: 422, error: 'no_file', message: 'Choose a file to upload.' });
		});
		parser.on('error', () => {
			if (!handling)
				finish({ ok: false, status: 400, error: 'bad_request', message: 'The upload could not be read as multipart/form-data.' });
		});
		body.on('error', (e) => {
			// The body broke off, or passed BODY_SIZE_LIMIT: the file being read fails with it.
			parser.destroy(e);
			if (!handling)
				finish(
					isBodyTooLarge(e)
						? tooLarge()
						: { ok: false, status: 400, error: 'incomplete', message: 'The upload did not arrive whole. Please try again.' }
				);
		});
		body.pipe(parser);
	});
}

function tooLarge<T>(): MultipartOutcome<T> {
	return { ok: false, status: 413, error: 'too_large', message: 'The upload is larger than this studio takes.' };
}

/** The body's chunks, releasing (never cancelling) the reader when the consumer stops early. */
async function* chunksOf(body: ReadableStream<Uint8Array>) {
	const reader = body.getReader();
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) return;
			yield value;
		}
	} finally {
		reader.releaseLock();
	}
}

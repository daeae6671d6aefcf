// The money endpoints' bodies: JSON, or a form-encoded body from a program that sends one (list
// fields such as gearUsed come back as arrays). They answer JSON either way; pages change money
// through the booking page's form actions.
import { apiError, readFormData, readJson } from '../api';

const FORM_TYPES = ['application/x-www-form-urlencoded', 'multipart/form-data'];

/** Reads a JSON or form body; an empty body is `{}`. */
export async function readInput(
	request: Request,
	listFields: string[] = []
): Promise<{ ok: true; body: Record<string, unknown> } | { ok: false; response: Response }> {
	const type = request.headers.get('content-type') ?? '';
	if (FORM_TYPES.some((t) => type.startsWith(t))) {
		const form = await readFormData(request);
		if (!form)
			return {
				ok: false,
				response: apiError(400, 'bad_request', 'The body could not be read as the form its content type names.')
			};
		return { ok: true, body: formFields(form, listFields) };
	}
	if (!type && (request.headers.get('content-length') ?? '0') === '0') return { ok: true, body: {} };
	const read = await readJson(request);
	if (!read.ok) return read;
	const body =
		read.body && typeof read.body === 'object' && !Array.isArray(read.body) ? (read.body as Record<string, unknown>) : {};
	return { ok: true, body };
}

/** A form's text fields as an object; the fields named in `listFields` as arrays. */
export function formFields(form: FormData, listFields: string[] = []): Record<string, unknown> {
	const body: Record<string, unknown> = {};
	for (const [key, value] of form) {
		if (typeof value !== 'string') continue;
		if (listFields.includes(key)) ((body[key] as string[] | undefined) ??= []).push(value);
		else body[key] = value;
	}
	return body;
}

export function unauthenticated() {
	return apiError(401, 'unauthenticated', 'Please sign in first.');
}

// JSON API helpers: every error has the one shape { error, message, fields? }, a code for programs
// and words for people, so a client handles every refusal the same way.
import { json } from '@sveltejs/kit';

export function apiError(status: number, error: string, message: string, extra: Record<string, unknown> = {}) {
	return json({ error, message, ...extra }, { status, headers: { 'cache-control': 'no-store' } });
}

/** Reads a JSON body; a body that is not JSON is the caller's mistake (422), never a 500. */
export async function readJson(request: Request): Promise<{ ok: true; body: unknown } | { ok: false; response: Response }> {
	const type = request.headers.get('content-type') ?? '';
	if (!type.includes('application/json')) {
		return { ok: false, response: apiError(415, 'unsupported_media_type', 'Send the body as application/json.') };
	}
	const text = await request.text();
	if (text.length > 64 * 1024) return { ok: false, response: apiError(413, 'too_large', 'The body is too large.') };
	try {
		return { ok: true, body: JSON.parse(text) };
	} catch {
		return { ok: false, response: apiError(422, 'invalid_json', 'The body is not valid JSON.') };
	}
}

/**
 * A form action's fields, or null when the body cannot be read as the form its content type
 * claims (a multipart type over a body that is not multipart, say): the caller's 400, never a 500.
 */
export async function readFormData(request: Request): Promise<FormData | null> {
	try {
		return await request.formData();
	} catch {
		return null;
	}
}

/** A form field's text: '' when the field is missing or holds a file instead of text. */
export function formText(value: FormDataEntryValue | null | undefined): string {
	return typeof value === 'string' ? value : '';
}

export const BAD_INPUT_MESSAGE = 'Part of the request is a value that cannot be stored or read: check the text and dates sent.';

/**
 * The SQLSTATE of a PostgreSQL data exception (class 22: a NUL in text 22021, a date or time out
 * of range 22008, an invalid datetime format 22007, a malformed UUID or number 22P02 …) behind an
 * error, looking through the causes drivers and query builders wrap it in; null for anything else.
 * Such a failure comes from what the request carried, not from the server (PostgreSQL manual,
 * appendix A, "PostgreSQL Error Codes").
 */
export function dataExceptionCode(e: unknown): string | null {
	for (let cur: unknown = e, i = 0; cur && typeof cur === 'object' && i < 5; i++) {
		const code = (cur as { code?: unknown }).code;
		if (typeof code === 'string' && /^22[0-9A-Z]{3}$/.test(code)) return code;
		cur = (cur as { cause?: unknown }).cause;
	}
	return null;
}

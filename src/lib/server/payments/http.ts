// The money endpoints answer two kinds of client: JSON (the API, and the page's scripts) and a
// browser posting a plain form without JavaScript, which gets a 303 back to the booking page.
import { redirect } from '@sveltejs/kit';
import { apiError, readFormData, readJson } from '../api';

export interface Input {
	/** A plain HTML form post (answer with a 303, not JSON). */
	isForm: boolean;
	body: Record<string, unknown>;
}

const FORM_TYPES = ['application/x-www-form-urlencoded', 'multipart/form-data'];

/** Reads a JSON or form body; an empty body is `{}`. List fields of a form (gearUsed) come back as arrays. */
export async function readInput(
	request: Request,
	listFields: string[] = []
): Promise<{ ok: true; input: Input } | { ok: false; response: Response }> {
	const type = request.headers.get('content-type') ?? '';
	if (FORM_TYPES.some((t) => type.startsWith(t))) {
		const form = await readFormData(request);
		if (!form)
			return {
				ok: false,
				response: apiError(400, 'bad_request', 'The body could not be read as the form its content type names.')
			};
		const body: Record<string, unknown> = {};
		for (const [key, value] of form) {
			if (typeof value !== 'string') continue;
			if (listFields.includes(key)) ((body[key] as string[] | undefined) ??= []).push(value);
			else body[key] = value;
		}
		const acceptsJson = (request.headers.get('accept') ?? '').includes('application/json');
		return { ok: true, input: { isForm: !acceptsJson, body } };
	}
	if (!type && (request.headers.get('content-length') ?? '0') === '0') return { ok: true, input: { isForm: false, body: {} } };
	const read = await readJson(request);
	if (!read.ok) return read;
	const body =
		read.body && typeof read.body === 'object' && !Array.isArray(read.body) ? (read.body as Record<string, unknown>) : {};
	return { ok: true, input: { isForm: false, body } };
}

/** Back to the booking page with a notice code the money panel turns into words. */
export function backToBooking(bookingId: string, notice: string): never {
	redirect(303, `/bookings/${bookingId}?money=${encodeURIComponent(notice)}#money`);
}

export function unauthenticated() {
	return apiError(401, 'unauthenticated', 'Please sign in first.');
}

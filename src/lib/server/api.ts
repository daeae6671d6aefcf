// JSON API helpers: every error has the shape { error, message, fields? } (PRODUCT.md).
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

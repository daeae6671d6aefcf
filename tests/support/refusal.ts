// A refusal says no and nothing more (OWASP ASVS 8.2.1, 8.2.2): the status, the API's error code
// and message, and none of the data that was asked for.
import { expect } from 'vitest';

const CODES = { 401: 'unauthenticated', 403: 'forbidden', 404: 'not_found' } as const;

/**
 * The JSON refusal `{ error, message }` with the code that goes with the status, and nothing else
 * in it; `secrets` are strings of the refused data that must appear nowhere in the answer.
 */
export async function expectRefused(
	res: Response,
	status: keyof typeof CODES,
	opts: { code?: string; secrets?: string[] } = {}
): Promise<void> {
	const text = await res.text();
	expect(res.status, text.slice(0, 300)).toBe(status);
	expect(res.headers.get('content-type')).toMatch(/^application\/json/);
	const body = JSON.parse(text) as Record<string, unknown>;
	expect(body).toEqual({ error: opts.code ?? CODES[status], message: expect.stringMatching(/\w/) as string });
	for (const s of opts.secrets ?? []) expect(text).not.toContain(s);
}

/**
 * A refused page (HTML): the status and the error page's words, and none of `secrets`. `words`
 * is what the error page says for that status.
 */
export async function expectRefusedPage(res: Response, status: 401 | 403 | 404, words: RegExp, secrets: string[] = []) {
	const text = await res.text();
	expect(res.status, text.slice(0, 300)).toBe(status);
	expect(text).toMatch(words);
	for (const s of secrets) expect(text).not.toContain(s);
}

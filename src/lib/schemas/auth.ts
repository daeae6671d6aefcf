import { z } from 'zod';
import { lineText } from './input';

export const MIN_PASSWORD = 10;

export const signInSchema = z.object({
	email: z.email({ error: 'Enter your e-mail address.' }).trim().toLowerCase().max(254),
	password: z.string().min(1, { error: 'Enter your password.' }).max(128),
	next: z.string().max(500).optional().default('')
});

export const signUpSchema = z.object({
	name: lineText().trim().min(2, { error: 'Tell us your name or your band’s name.' }).max(120),
	email: z.email({ error: 'Enter a valid e-mail address.' }).trim().toLowerCase().max(254),
	password: z
		.string()
		.min(MIN_PASSWORD, { error: `Use at least ${MIN_PASSWORD} characters.` })
		.max(128, { error: 'Use at most 128 characters.' })
		.refine((p) => new Set(p).size >= 5, { error: 'Use a less repetitive password.' }),
	next: z.string().max(500).optional().default('')
});

// Tabs, newlines and other C0 controls (browsers strip them from URLs), DEL, and backslashes (browsers
// read them as slashes in http(s) URLs): any of these can turn a path into another host, so a
// `next` holding one is refused outright (WHATWG URL Standard, "basic URL parser").
function hasUnsafeChar(s: string): boolean {
	for (let i = 0; i < s.length; i++) {
		const c = s.charCodeAt(i);
		if (c <= 0x1f || c === 0x7f || c === 0x5c) return true;
	}
	return false;
}
const PROBE_ORIGIN = 'http://x.invalid';

/**
 * The page to go to after signing in or up, or null. Only a path on this site is followed (no
 * open redirects, CWE-601): it starts with one `/` not followed by `/` or `\`,
 * holds no control characters or backslashes (not even percent-encoded), and resolving it
 * against a probe origin leaves the origin and a single leading slash in place.
 */
export function safeNext(next: string | undefined | null): string | null {
	if (!next || next.length > 500) return null;
	if (!next.startsWith('/') || next[1] === '/' || hasUnsafeChar(next)) return null;
	let decoded: string;
	try {
		decoded = decodeURIComponent(next);
	} catch {
		return null;
	}
	if (decoded.startsWith('//') || hasUnsafeChar(decoded)) return null;
	let url: URL;
	try {
		url = new URL(next, PROBE_ORIGIN);
	} catch {
		return null;
	}
	// Dot segments can still collapse to a leading `//` (`/.//evil.test` has the path `//evil.test`).
	if (url.origin !== PROBE_ORIGIN || url.pathname.startsWith('//')) return null;
	return next;
}

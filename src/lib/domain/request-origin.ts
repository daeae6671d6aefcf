// Which state-changing API requests come from the app's own pages (a defence against cross-site
// request forgery, OWASP ASVS 3.5.1 and the OWASP CSRF Prevention Cheat Sheet's "verifying origin
// with standard headers"). SameSite=Lax cookies still travel with a POST from another port or a
// sibling subdomain of the same site, so the cookie alone says nothing about who sent a request.

/** Methods that change nothing (RFC 9110 §9.2.1): never checked. */
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/** Routes called by other servers rather than browsers; each proves itself another way. */
const EXEMPT_PATHS = new Set([
	// Stripe signs every event (Stripe-Signature), and its servers send no Origin: the platform's
	// endpoint and the Connect endpoint alike.
	'/api/stripe/webhook',
	'/api/stripe/connect-webhook'
]);

export type OriginVerdict = { ok: true } | { ok: false; message: string };

export const CROSS_ORIGIN_MESSAGE = 'This request did not come from the studio’s own pages, so it was refused.';

/**
 * Judges one request. `origin` and `secFetchSite` are the request's Origin and Sec-Fetch-Site
 * headers (null when absent); `appOrigin` is the origin people use (ORIGIN).
 *
 * - Origin present: it must be exactly the app's origin. `Origin: null` (a sandboxed frame, a
 *   file, a redirect across sites) is refused.
 * - No Origin but Sec-Fetch-Site (Fetch Metadata): only `same-origin` passes.
 * - Neither header: allowed. Every current browser sends Origin with a POST, PUT, PATCH or
 *   DELETE, and Sec-Fetch-Site with every request, so a request with neither comes from a program
 *   (curl, a script) that holds the cookie itself; it forges nothing on anyone's behalf, and the
 *   cookie and the role checks still apply to it.
 */
export function judgeRequestOrigin(req: {
	method: string;
	pathname: string;
	origin: string | null;
	secFetchSite: string | null;
	appOrigin: string;
}): OriginVerdict {
	if (SAFE_METHODS.has(req.method.toUpperCase())) return { ok: true };
	if (!isApiPath(req.pathname) || EXEMPT_PATHS.has(req.pathname)) return { ok: true };
	const refuse = { ok: false as const, message: CROSS_ORIGIN_MESSAGE };
	if (req.origin !== null) return req.origin === req.appOrigin ? { ok: true } : refuse;
	if (req.secFetchSite !== null) return req.secFetchSite.toLowerCase() === 'same-origin' ? { ok: true } : refuse;
	return { ok: true };
}

function isApiPath(pathname: string): boolean {
	return pathname === '/api' || pathname.startsWith('/api/');
}

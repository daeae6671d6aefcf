import { error, isHttpError, redirect, type Handle, type HandleServerError } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { building } from '$app/environment';
import { svelteKitHandler } from 'better-auth/svelte-kit';
import { auth, CLIENT_ADDRESS_HEADER } from '$lib/server/auth';
import { currentMembership, membershipsOf } from '$lib/server/team';
import { zoneFor } from '$lib/server/zones';
import {
	DATABASE_UNAVAILABLE,
	databaseAnswers,
	databaseTrouble,
	isDatabaseDown,
	TROUBLE_ANSWER,
	type DatabaseTrouble
} from '$lib/server/db/health';
import { BAD_INPUT_MESSAGE, apiError, dataExceptionCode } from '$lib/server/api';
import { startBackgroundJobs, stopBackgroundJobs } from '$lib/server/jobs';
import { sqlClient } from '$lib/server/db';
import { ensureDemoLedger } from '$lib/server/demo-ledger';
import { judgeRequestOrigin } from '$lib/domain/request-origin';
import { describeError } from '$lib/domain/log-redaction';

if (!building) {
	// Every periodic job (src/lib/server/jobs.ts lists them) runs from start-up.
	startBackgroundJobs();
	ensureDemoLedger().catch((e) => console.warn('[demo]', (e as Error).message));
	// adapter-node emits this once the HTTP server has closed (after SIGTERM or SIGINT). The
	// job queue and its workers keep database connections busy, so without this the process would
	// never exit on its own.
	process.once('sveltekit:shutdown', () => {
		// The job queue first (a running job may still use the pool), then the pool.
		void stopBackgroundJobs().finally(() => sqlClient.end({ timeout: 5 }));
	});
}

/**
 * The client's address, as adapter-node resolves it (the socket's peer, or ADDRESS_HEADER and
 * XFF_DEPTH behind a proxy), in a header that better-auth trusts and that this handle always
 * overwrites: better-auth's own limiter and session records then see the same address as ours,
 * and a client's made-up X-Forwarded-For counts for nothing.
 */
const clientAddress: Handle = ({ event, resolve }) => {
	let address = '';
	try {
		address = event.getClientAddress();
	} catch {
		// ADDRESS_HEADER is set and this request did not come through the proxy (a load balancer's
		// health check, say): better-auth gets no address rather than the request failing here.
	}
	if (address) event.request.headers.set(CLIENT_ADDRESS_HEADER, address);
	else event.request.headers.delete(CLIENT_ADDRESS_HEADER);
	return resolve(event);
};

/**
 * A request that may change something in the API must come from the app's own origin
 * (src/lib/domain/request-origin.ts has the rule, including why a request with neither Origin
 * nor Sec-Fetch-Site passes). Form actions on pages have SvelteKit's own origin check.
 */
const sameOriginApi: Handle = ({ event, resolve }) => {
	const verdict = judgeRequestOrigin({
		method: event.request.method,
		pathname: event.url.pathname,
		origin: event.request.headers.get('origin'),
		secFetchSite: event.request.headers.get('sec-fetch-site'),
		appOrigin: event.url.origin
	});
	return verdict.ok ? resolve(event) : apiError(403, 'forbidden', verdict.message);
};

/**
 * An address whose path does not decode (a stray `%` or a broken UTF-8 sequence, RFC 3986 §2.1)
 * is refused here with 400, before any other handle runs. SvelteKit still runs the handles for
 * such a path, but a redirect or error thrown from one of them (the zone guard sends visitors to
 * sign-in) is then not caught, and the rejection would stop the whole server.
 */
const malformedPath: Handle = ({ event, resolve }) => {
	try {
		// The same decoding SvelteKit applies to a path (an encoded `%` stays encoded).
		event.url.pathname.split('%25').forEach((part) => decodeURI(part));
	} catch {
		return event.url.pathname.startsWith('/api/')
			? apiError(400, 'invalid', 'The address does not decode: check its % escapes.')
			: new Response('The address does not decode: check its % escapes.', {
					status: 400,
					headers: { 'content-type': 'text/plain; charset=utf-8' }
				});
	}
	return resolve(event);
};

const AUTH_BASE = '/api/auth/';
/**
 * The only better-auth routes open over HTTP. Signing in and up go through the site's own pages,
 * which call auth.api on the server (a function call, not a request) behind our per-account and
 * per-address limits and with replies that never tell whether an account exists. better-auth's
 * JSON routes for the same things would skip both, so they, and every other route the app does
 * not use, answer like any unknown page.
 */
const OPEN_AUTH_ROUTES = new Set(['GET get-session', 'POST sign-out']);

/** better-auth answers its own routes under /api/auth, the open ones only. */
const authRoutes: Handle = async ({ event, resolve }) => {
	if (building || !event.url.pathname.startsWith(AUTH_BASE)) return resolve(event);
	if (!OPEN_AUTH_ROUTES.has(`${event.request.method} ${event.url.pathname.slice(AUTH_BASE.length)}`)) {
		return apiError(404, 'not_found', 'Not found');
	}
	const response = await svelteKitHandler({ event, resolve, auth, building });
	// better-auth turns a lost database into its own 500 and never calls handleError: ask directly.
	if (response.status >= 500 && !(await databaseAnswers())) return apiError(503, 'unavailable', DATABASE_UNAVAILABLE);
	return response;
};

/**
 * A request that fails because the database is down or busy answers 503 with Retry-After and
 * words that say which (health.ts), never a 500. Kit catches an endpoint's or a load's error
 * itself and answers 500 through handleError, which cannot change the status; the pool
 * (db/index.ts) and handleError leave a mark in locals, and this handle, around everything else,
 * sees the mark. better-auth turns a failed query into its own 500 without handleError: the
 * pool's mark covers that too.
 */
const databaseOutage: Handle = async ({ event, resolve }) => {
	event.locals.databaseTrouble = undefined;
	const api = event.url.pathname.startsWith('/api/');
	let response: Response;
	try {
		response = await resolve(event);
	} catch (e) {
		// A handle that threw (reading the session): nothing was rendered yet.
		const kind = databaseTrouble(e) ?? (isHttpError(e, 503) && e.body.error === 'unavailable' ? 'down' : null);
		if (!kind) throw e;
		const answer = TROUBLE_ANSWER[kind];
		if (api) return withRetryAfter(apiError(503, answer.error, answer.message), kind);
		error(503, { error: answer.error, message: answer.message });
	}
	// Set while the request ran (TypeScript still sees the undefined from above).
	const kind = event.locals.databaseTrouble as DatabaseTrouble | undefined;
	if (!kind || response.status < 500) return response;
	if (api) {
		const answer = TROUBLE_ANSWER[kind];
		return withRetryAfter(apiError(503, answer.error, answer.message), kind);
	}
	// A page: keep what was rendered (the error page with handleError's words), as a 503.
	return withRetryAfter(new Response(response.body, { status: 503, headers: response.headers }), kind);
};

function withRetryAfter(response: Response, kind: DatabaseTrouble) {
	response.headers.set('retry-after', String(TROUBLE_ANSWER[kind].retryAfter));
	return response;
}

/**
 * Defence in depth behind the schemas: a request whose value the database refused as data (see
 * dataExceptionCode) answers 400, not 500. handleError leaves the mark, as for an outage.
 */
const dataExceptions: Handle = async ({ event, resolve }) => {
	event.locals.badInput = false;
	const response = await resolve(event);
	if (response.status !== 500 || !event.locals.badInput) return response;
	if (event.url.pathname.startsWith('/api/')) return apiError(400, 'invalid', BAD_INPUT_MESSAGE);
	return new Response(response.body, { status: 400, headers: response.headers });
};

/** The signed-in person, if any, into locals. */
const sessionIntoLocals: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	event.locals.session = null;
	event.locals.role = null;
	event.locals.studio = null;
	event.locals.memberships = [];
	if (event.url.pathname === '/api/health' || event.url.pathname.startsWith('/_app/')) return resolve(event);
	// Sessions live in a cookie: a request without one (most public calendar traffic) has none.
	if (!event.request.headers.get('cookie')) return resolve(event);
	try {
		const found = await auth.api.getSession({ headers: event.request.headers });
		if (found) {
			// The role is the person's role in the studio they work in now (the session's active
			// organization, while they are still in its team, else the first they joined); without
			// one, an artist. Read on every request, so someone taken out of a team loses it at once.
			const memberships = await membershipsOf(found.user.id);
			const current = currentMembership(memberships, found.session.activeOrganizationId);
			event.locals.memberships = memberships;
			event.locals.studio = current;
			event.locals.user = {
				id: found.user.id,
				name: found.user.name,
				email: found.user.email,
				role: current?.role ?? 'artist'
			};
			event.locals.session = { id: found.session.id, expiresAt: found.session.expiresAt };
			event.locals.role = event.locals.user.role;
		}
	} catch (e) {
		if (isDatabaseDown(e)) {
			error(503, { error: 'unavailable', message: DATABASE_UNAVAILABLE });
		}
		// A session that cannot be read (a cookie whose token the database refuses, say) is no
		// session: the visitor is treated as signed out. The failure is logged without its
		// details' secrets: the token is in the failed query's parameters.
		console.error(
			`[auth] session lookup failed on ${event.request.method} ${event.route.id ?? 'an unknown route'}\n${describeError(e)}`
		);
	}
	return resolve(event);
};

/** Zones: strangers go to sign-in, the wrong role gets 403. */
const zoneGuard: Handle = ({ event, resolve }) => {
	const zone = zoneFor(event.url.pathname);
	if (!zone) return resolve(event);
	const user = event.locals.user;
	if (!user) {
		// Sign-in follows a `next` of at most 500 characters (safeNext): a longer address is not
		// carried along, so a huge query string cannot make a huge Location header.
		const full = event.url.pathname + event.url.search;
		const next = full.length <= 500 ? full : event.url.pathname.length <= 500 ? event.url.pathname : '';
		redirect(303, next ? `/sign-in?next=${encodeURIComponent(next)}` : '/sign-in');
	}
	if (zone.roles !== 'signed-in' && !zone.roles.includes(user.role) && event.request.method !== 'GET') {
		// Form actions run before any load, so the wrong role is stopped here. Pages (GET) are
		// stopped by their zone's layout load, which renders the site's own error page.
		error(403, { error: 'forbidden', message: 'Your role does not give access to this page.' });
	}
	return resolve(event);
};

const securityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	response.headers.set('X-Content-Type-Options', 'nosniff');
	response.headers.set('Referrer-Policy', 'strict-origin-when-cross-origin');
	response.headers.set('X-Frame-Options', 'DENY');
	response.headers.set('Permissions-Policy', 'camera=(), microphone=(), geolocation=()');
	if (event.locals.user && !response.headers.has('cache-control')) {
		response.headers.set('Cache-Control', 'private, no-store');
	}
	return response;
};

export const handle = sequence(
	securityHeaders,
	malformedPath,
	databaseOutage,
	clientAddress,
	sameOriginApi,
	dataExceptions,
	authRoutes,
	sessionIntoLocals,
	zoneGuard
);

export const handleError: HandleServerError = ({ error: e, event, status, message }) => {
	if (status === 404) return { message: 'Not found', error: 'not_found' };
	// SvelteKit's own refusals (a body of the wrong type for a form action, an address that does not
	// decode): the request's fault, said as it is and not logged as our failure.
	if (status >= 400 && status < 500) return { message, error: 'bad_request' };
	const trouble = databaseTrouble(e);
	if (trouble) {
		event.locals.databaseTrouble = trouble;
		return { message: TROUBLE_ANSWER[trouble].message, error: TROUBLE_ANSWER[trouble].error };
	}
	const dataCode = dataExceptionCode(e);
	if (dataCode) {
		event.locals.badInput = true;
		console.warn(`[bad input] ${event.request.method} ${event.route.id ?? 'an unknown route'}: SQLSTATE ${dataCode}`);
		return { message: BAD_INPUT_MESSAGE, error: 'invalid' };
	}
	const errorId = crypto.randomUUID().slice(0, 8);
	// The route's pattern, not its path (a feed path holds a token), and the error described, not
	// printed whole (a failed query's message holds its parameters): src/lib/domain/log-redaction.ts.
	console.error(`[error ${errorId}] ${event.request.method} ${event.route.id ?? 'an unknown route'}\n${describeError(e)}`);
	return { message: status >= 500 ? 'Something went wrong on our side.' : message, error: 'internal', errorId };
};

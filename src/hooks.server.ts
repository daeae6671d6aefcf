import { error, redirect, type Handle, type HandleServerError } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { building } from '$app/environment';
import { svelteKitHandler } from 'better-auth/svelte-kit';
import { auth } from '$lib/server/auth';
import { isRole } from '$lib/roles';
import { zoneFor } from '$lib/server/zones';
import { isDatabaseDown } from '$lib/server/db/health';
import { startBackgroundJobs, stopBackgroundJobs } from '$lib/server/jobs';
import { sqlClient } from '$lib/server/db';
import { registerPaymentJobs } from '$lib/server/payments';
import { registerMail } from '$lib/server/mail';

if (!building) {
	// Payment sweeps (expiring lapsed sessions, sending recorded refunds) must run from start-up,
	// not only once some page happens to import the payments module.
	registerPaymentJobs();
	registerMail();
	startBackgroundJobs();
	// adapter-node emits this once the HTTP server has closed (after SIGTERM or SIGINT). The
	// periodic jobs keep pooled database connections busy, so without this the process would
	// never exit on its own.
	process.once('sveltekit:shutdown', () => {
		stopBackgroundJobs();
		void sqlClient.end({ timeout: 5 });
	});
}

/** better-auth answers its own routes under /api/auth. */
const authRoutes: Handle = ({ event, resolve }) => svelteKitHandler({ event, resolve, auth, building });

/** The signed-in person, if any, into locals. */
const sessionIntoLocals: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	event.locals.session = null;
	event.locals.role = null;
	if (event.url.pathname === '/api/health' || event.url.pathname.startsWith('/_app/')) return resolve(event);
	try {
		const found = await auth.api.getSession({ headers: event.request.headers });
		if (found) {
			const role = (found.user as { role?: unknown }).role;
			event.locals.user = {
				id: found.user.id,
				name: found.user.name,
				email: found.user.email,
				role: isRole(role) ? role : 'artist'
			};
			event.locals.session = { id: found.session.id, expiresAt: found.session.expiresAt };
			event.locals.role = event.locals.user.role;
		}
	} catch (e) {
		if (isDatabaseDown(e)) {
			error(503, {
				error: 'unavailable',
				message: 'The studio’s database is not answering right now. Nothing was lost; please try again in a minute.'
			});
		}
		throw e;
	}
	return resolve(event);
};

/** Zones: strangers go to sign-in, the wrong role gets 403. */
const zoneGuard: Handle = ({ event, resolve }) => {
	const zone = zoneFor(event.url.pathname);
	if (!zone) return resolve(event);
	const user = event.locals.user;
	if (!user) {
		const next = event.url.pathname + event.url.search;
		redirect(303, `/sign-in?next=${encodeURIComponent(next)}`);
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

export const handle = sequence(securityHeaders, authRoutes, sessionIntoLocals, zoneGuard);

export const handleError: HandleServerError = ({ error: e, event, status, message }) => {
	if (status === 404) return { message: 'Not found', error: 'not_found' };
	if (isDatabaseDown(e)) {
		return {
			message: 'The studio’s database is not answering right now. Please try again in a minute.',
			error: 'unavailable'
		};
	}
	const errorId = crypto.randomUUID().slice(0, 8);
	console.error(`[error ${errorId}] ${event.request.method} ${event.url.pathname}`, e);
	return { message: status >= 500 ? 'Something went wrong on our side.' : message, error: 'internal', errorId };
};

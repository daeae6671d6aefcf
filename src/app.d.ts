// See https://svelte.dev/docs/kit/types#app.d.ts
import type { SessionUser, Role } from '$lib/server/auth';

declare global {
	namespace App {
		interface Error {
			message: string;
			errorId?: string;
			error?: string;
			fields?: Record<string, string[]>;
		}
		interface Locals {
			user: SessionUser | null;
			session: { id: string; expiresAt: Date } | null;
			role: Role | null;
			/** The studio a staff member works in now, with their role there; null for artists and visitors. */
			studio: import('$lib/server/team').Membership | null;
			/** Every studio the signed-in person works at. */
			memberships: import('$lib/server/team').Membership[];
			/** Set when this request met the database down or busy (db/index.ts, handleError); hooks.server.ts answers 503. */
			databaseTrouble?: import('$lib/server/db/trouble').DatabaseTrouble;
			/** Set by handleError when the database refused a value of the request as data (see hooks.server.ts). */
			badInput?: boolean;
		}
		/** What the root layout gives every page (absent on an error page the layout could not load). */
		interface PageData {
			user?: { name: string; email: string; role: Role } | null;
			/** The studio the page shows (a storefront's own, else the root layout's). */
			studio?: { name: string; timeZone: string; currency: string; locale: string };
			/** Set inside a studio's storefront (/SLUG/…) by its layout. */
			storefront?: { id: string; slug: string; published: boolean };
		}
	}
}

export {};

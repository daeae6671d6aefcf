import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { staffActor } from '$lib/server/actor';
import * as payouts from '$lib/server/payouts';
import type { RequestHandler } from './$types';

// Stripe sends the browser here when an onboarding link was used or has expired: a new link
// takes the owner straight back (Stripe Connect guide, "Account Links", refresh_url).
export const GET: RequestHandler = async ({ locals, url }) => {
	requireRole(locals, 'owner');
	const { studioId } = staffActor(locals, null);
	let link: string | null;
	try {
		link = await payouts.renewLink(studioId, url.origin);
	} catch (e) {
		console.error('get paid: a new onboarding link failed', e instanceof Error ? e.message : e);
		redirect(303, '/studio/get-paid');
	}
	redirect(303, link ?? '/studio/get-paid');
};

import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { staffActor } from '$lib/server/actor';
import * as payouts from '$lib/server/payouts';
import { audit } from '$lib/server/audit';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireRole(locals, 'owner');
	return payouts.payoutState(staffActor(locals, null).studioId);
};

export const actions: Actions = {
	/** Makes the studio's account once and sends the owner to Stripe's onboarding. */
	start: async ({ locals, url, getClientAddress }) => {
		requireRole(locals, 'owner');
		const actor = staffActor(locals, getClientAddress());
		let link: string;
		try {
			link = await payouts.startGetPaid(actor.studioId, url.origin);
		} catch (e) {
			console.error('get paid: starting onboarding failed', e instanceof Error ? e.message : e);
			return fail(502, { problem: 'Stripe could not be reached just now. Nothing was lost: try again in a moment.' });
		}
		await audit({
			studioId: actor.studioId,
			actorId: actor.user.id,
			action: 'studio.payments_onboarding_started',
			entity: 'studio',
			entityId: actor.studioId,
			ip: actor.ip
		});
		redirect(303, link);
	}
};

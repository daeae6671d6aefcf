import { requireRole } from '$lib/server/guard';
import { staffActor } from '$lib/server/actor';
import * as payouts from '$lib/server/payouts';
import { setupState } from '$lib/server/studio-setup';
import type { PageServerLoad } from './$types';

// Stripe sends the owner here from onboarding, finished or not: the account itself says which.
export const load: PageServerLoad = async ({ locals }) => {
	requireRole(locals, 'owner');
	const { studioId } = staffActor(locals, null);
	let checked = true;
	try {
		await payouts.refreshAccount(studioId);
	} catch (e) {
		// What the studio already knew still stands; the account.updated event will bring the rest.
		console.error('get paid: reading the account failed', e instanceof Error ? e.message : e);
		checked = false;
	}
	const [state, setup] = await Promise.all([payouts.payoutState(studioId), setupState(studioId)]);
	return { ...state, checked, published: setup.published };
};

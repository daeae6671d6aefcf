// TEMPORARY preview of the money panel while /bookings/[id] is being built elsewhere. Remove.
import { error } from '@sveltejs/kit';
import { loadMoneyPanel } from '$lib/server/payments';
import { requireUser } from '$lib/server/guard';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const user = requireUser(locals);
	const money = await loadMoneyPanel(user, { id: params.id });
	if (!money) error(404, { message: 'Not found' });
	return { money };
};

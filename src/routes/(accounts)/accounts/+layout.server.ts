import { requireRole } from '$lib/server/guard';
import type { LayoutServerLoad } from './$types';

// Every page of this zone checks the role here, so the site's own error page answers a wrong role.
export const load: LayoutServerLoad = ({ locals }) => {
	requireRole(locals, 'owner', 'accountant');
	return {};
};

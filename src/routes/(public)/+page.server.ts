import * as setup from '$lib/server/studio-setup';
import type { PageServerLoad } from './$types';

/** The platform's front page: what Slateroom is and the studios published on it. */
export const load: PageServerLoad = async ({ locals }) => {
	const studios = await setup.listPublished();
	return {
		studios: studios.map(({ slug, name, city, country }) => ({ slug, name, city, country })),
		signedIn: !!locals.user
	};
};

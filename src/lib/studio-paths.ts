// Where a studio's pages and API live: under its short name (src/lib/domain/studio-slug.ts). The
// browser and the server build the same addresses from here.

/** A page of a studio's storefront: `/hollow-pine`, `/hollow-pine/calendar`. */
export function studioPath(slug: string, page: '' | 'calendar' | 'rooms' | 'book' = ''): string {
	return page ? `/${slug}/${page}` : `/${slug}`;
}

/** An endpoint of a studio's API: `/api/studios/hollow-pine/quote`. */
export function studioApiPath(slug: string, endpoint: string): string {
	return `/api/studios/${slug}/${endpoint}`;
}

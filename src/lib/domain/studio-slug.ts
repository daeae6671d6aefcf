// A studio's short name: the first part of its storefront's address (/hollow-pine) and its key in
// the API (/api/studios/hollow-pine/rooms). It must read well in a link, be typed without doubt
// and never shadow a page of the platform itself.
//
// The characters are those of a DNS label (RFC 1035 section 2.3.1: letters, digits and hyphens,
// beginning with a letter and ending with a letter or digit), in lower case only so that one
// studio never has two spellings; a double hyphen is refused too, since RFC 5891 section 4.2.3.1
// keeps "xx--" for encoded names and people misread it. 3 to 40 characters is our own choice.

export const SLUG_MIN = 3;
export const SLUG_MAX = 40;

/** The whole syntax, as one pattern (the route matcher in src/params uses it too). */
export const SLUG_PATTERN = /^[a-z](?:[a-z0-9]|-(?!-))*[a-z0-9]$/;

/**
 * Words a studio may not take: the platform's own pages and API, words that would mislead a
 * visitor (admin, support, billing) and names web servers and browsers ask for by themselves.
 */
export const RESERVED_SLUGS: ReadonlySet<string> = new Set([
	'about',
	'account',
	'accounts',
	'admin',
	'api',
	'app',
	'assets',
	'billing',
	'blog',
	'book',
	'bookings',
	'calendar',
	'contact',
	'dashboard',
	'docs',
	'favicon',
	'feed',
	'fonts',
	'help',
	'home',
	'invitations',
	'invite',
	'invoices',
	'legal',
	'login',
	'logout',
	'new',
	'owner',
	'plan',
	'pricing',
	'privacy',
	'robots',
	'rooms',
	'root',
	'security',
	'settings',
	'setup',
	'sign-in',
	'sign-out',
	'sign-up',
	'signin',
	'signup',
	'slateroom',
	'start',
	'static',
	'status',
	'studio',
	'studios',
	'support',
	'system',
	'terms',
	'uploads',
	'www'
]);

/** True when the text has a short name's shape (reserved or not): what the route matcher accepts. */
export function hasSlugShape(text: string): boolean {
	return text.length >= SLUG_MIN && text.length <= SLUG_MAX && SLUG_PATTERN.test(text);
}

/** Why a short name cannot be taken, in words for the person choosing it; null when it can. */
export function slugProblem(text: string): string | null {
	if (text.length < SLUG_MIN) return `Use at least ${SLUG_MIN} characters.`;
	if (text.length > SLUG_MAX) return `Use at most ${SLUG_MAX} characters.`;
	if (!SLUG_PATTERN.test(text)) {
		if (/[A-Z]/.test(text)) return 'Use lower-case letters only.';
		if (!/^[a-z]/.test(text)) return 'Begin with a letter.';
		if (text.includes('--')) return 'Use single hyphens between words.';
		if (text.endsWith('-')) return 'End with a letter or a digit.';
		return 'Use only lower-case letters, digits and single hyphens.';
	}
	if (RESERVED_SLUGS.has(text)) return 'That short name is kept for Slateroom itself; choose another.';
	return null;
}

/** A short name proposed from a studio's name: "Hollow Pine Studio" → "hollow-pine-studio". */
export function slugFromName(name: string): string {
	const words = name
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^[^a-z]+/, '')
		.replace(/-+$/, '');
	return words.slice(0, SLUG_MAX).replace(/-+$/, '');
}

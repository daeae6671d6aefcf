import { describe, expect, it } from 'vitest';
import { ROLES, navigationFor } from './roles';

const storefrontLinks = (items: { href: string }[]) =>
	items.filter((i) => /\/(rooms|calendar|book)$/.test(i.href) && !i.href.startsWith('/studio/'));

describe('navigationFor', () => {
	it("offers a studio's rooms, calendar and booking page only inside its storefront, under its short name", () => {
		for (const role of [...ROLES, null]) {
			expect(storefrontLinks(navigationFor(role)), String(role)).toEqual([]);
			for (const item of storefrontLinks(navigationFor(role, 'hollow-pine'))) expect(item.href).toMatch(/^\/hollow-pine\//);
		}
		expect(navigationFor(null, 'hollow-pine').map((i) => i.href)).toEqual([
			'/hollow-pine/rooms',
			'/hollow-pine/calendar',
			'/hollow-pine/book'
		]);
		expect(navigationFor('artist', 'hollow-pine').map((i) => i.href)).toEqual([
			'/hollow-pine/book',
			'/bookings',
			'/account',
			'/hollow-pine/rooms',
			'/hollow-pine/calendar'
		]);
		expect(navigationFor('artist').map((i) => i.href)).toEqual(['/bookings', '/account']);
		// The accountant books nothing, in a storefront or not.
		expect(navigationFor('accountant', 'hollow-pine').map((i) => i.href)).toEqual(['/accounts']);
	});
});

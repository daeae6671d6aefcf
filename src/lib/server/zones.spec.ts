import { describe, expect, it } from 'vitest';
import { ZONE_PREFIXES, zoneFor } from './zones';
import { RESERVED_SLUGS } from '$lib/domain/studio-slug';

describe('zones and studio addresses', () => {
	it('no zone can be taken for a studio: the first part of each is a reserved word', () => {
		for (const prefix of ZONE_PREFIXES) expect(RESERVED_SLUGS.has(prefix.split('/')[1]!), prefix).toBe(true);
	});

	it("a studio's storefront is in no zone, whatever its pages", () => {
		for (const path of ['/hollow-pine', '/hollow-pine/calendar', '/hollow-pine/book', '/studio-north/rooms']) {
			expect(zoneFor(path), path).toBeUndefined();
		}
		expect(zoneFor('/studio/people')?.roles).toEqual(['owner']);
	});
});

import { describe, expect, it } from 'vitest';
import { newReference } from './reference';

describe('a booking reference', () => {
	it('is the studio’s prefix, then two groups of four symbols of Crockford’s Base32', () => {
		for (let i = 0; i < 200; i++) expect(newReference('HP')).toMatch(/^HP-[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{4}$/);
		expect(newReference('ABCD')).toMatch(/^ABCD-[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{4}$/);
	});

	it('never holds a letter that reads as another (I, L, O, U) in its random part', () => {
		const seen = Array.from({ length: 500 }, () => newReference('HP').slice(3)).join('');
		expect(seen).not.toMatch(/[ILOU]/);
	});

	it('refuses a prefix that is not two to four capitals', () => {
		for (const bad of ['', 'H', 'hp', 'HOLLO', 'H1', 'ÄP']) expect(() => newReference(bad)).toThrow(RangeError);
	});
});

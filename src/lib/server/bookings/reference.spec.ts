import { describe, expect, it } from 'vitest';
import { newReference } from './reference';

describe('a booking reference', () => {
	it('is two groups of four symbols of Crockford’s Base32, naming no studio', () => {
		for (let i = 0; i < 200; i++) expect(newReference()).toMatch(/^[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{4}$/);
	});

	it('never holds a letter that reads as another (I, L, O, U)', () => {
		const seen = Array.from({ length: 500 }, newReference).join('');
		expect(seen).not.toMatch(/[ILOU]/);
	});
});

import { describe, expect, it } from 'vitest';
import { nextStep, postalLines, referencePrefixFromName, REFERENCE_PREFIX_PATTERN, SETUP_STEPS, stepsDone } from './setup';

describe('a reference prefix from a studio’s name', () => {
	it('takes the initials, leaving out studio, studios and the', () => {
		expect(referencePrefixFromName('Hollow Pine Studio')).toBe('HP');
		expect(referencePrefixFromName('The Quiet Room Studios')).toBe('QR');
		expect(referencePrefixFromName('north shore tape and echo works')).toBe('NSTA');
	});

	it('drops accents and anything that is not a Latin letter', () => {
		expect(referencePrefixFromName('Ääni Talo')).toBe('AT');
		expect(referencePrefixFromName('Studio 4 & Öljy-Mäki')).toBe('OM');
	});

	it('uses the first two letters of a one-word name, and SR without Latin letters', () => {
		expect(referencePrefixFromName('Echo')).toBe('EC');
		expect(referencePrefixFromName('Studio')).toBe('ST');
		expect(referencePrefixFromName('録音 123')).toBe('SR');
		expect(referencePrefixFromName('')).toBe('SR');
	});

	it('always gives two to four capitals', () => {
		for (const name of ['a', 'Q', 'The', 'x y', 'Hollow Pine Studio', 'A B C D E F']) {
			expect(referencePrefixFromName(name)).toMatch(REFERENCE_PREFIX_PATTERN);
		}
	});
});

describe('set-up steps', () => {
	it('counts the known steps done once and names the first left', () => {
		expect(stepsDone([])).toBe(0);
		expect(stepsDone(['address', 'address', 'unknown', 'vat'])).toBe(2);
		expect(nextStep(['address'])).toBe('vat');
		expect(nextStep([...SETUP_STEPS])).toBeNull();
	});
});

describe('postal lines', () => {
	it('prints the street, then the postal code with the city', () => {
		expect(postalLines({ street: 'Kuusikkotie 14', postalCode: '33980', city: 'Pirkkala' })).toEqual([
			'Kuusikkotie 14',
			'33980 Pirkkala'
		]);
		expect(postalLines({ street: '', postalCode: '', city: 'Tampere' })).toEqual(['Tampere']);
		expect(postalLines({})).toEqual([]);
	});
});

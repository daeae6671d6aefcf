import { describe, expect, it } from 'vitest';
import {
	billingCountries,
	billingLine,
	billingSchema,
	checksVatIdsOf,
	cleanVatId,
	normaliseVatId,
	parseBilling,
	vatIdProblem,
	vatPrefix,
	type BillingDetails
} from './billing';

const band: BillingDetails = {
	kind: 'organisation',
	name: 'Lantern Static Oy',
	street: 'Hämeenkatu 1 B 12',
	postalCode: '33100',
	city: 'Tampere',
	country: 'FI',
	vatId: 'FI12345671'
};

// Known VAT IDs, each with where it comes from:
// - FI12345671: worked out by hand for this spec with Finland's check digit rule (Y-tunnus: weights
//   7, 9, 10, 5, 8, 4, 2 on the first seven digits, check digit = 11 − sum mod 11, remainder 0 → 0):
//   1·7 + 2·9 + 3·10 + 4·5 + 5·8 + 6·4 + 7·2 = 153; 153 mod 11 = 10; 11 − 10 = 1.
// - EL123456783: by hand with Greece's rule (weights 256, 128, 64, 32, 16, 8, 4, 2 on the first
//   eight digits, sum mod 11, then mod 10): 256 + 256 + 192 + 128 + 80 + 48 + 28 + 16 = 1004;
//   1004 mod 11 = 3.
// - SE123456789701: by hand with Sweden's rule (a 10-digit organisation number whose last digit is
//   the Luhn check digit, then "01"): Luhn over 123456789 gives 7.
// - BE0411905847 (valid) and BE0897221791 (right form, wrong check digits): the examples of the
//   jsvat package's README.
const VALID: [string, string][] = [
	['FI', 'FI12345671'],
	['GR', 'EL123456783'],
	['SE', 'SE123456789701'],
	['BE', 'BE0411905847']
];

describe('a VAT ID', () => {
	it.each(VALID)('is accepted for %s: %s', (country, id) => {
		expect(vatIdProblem(id, country)).toBeNull();
	});

	it('is refused when one check digit is off (same sources, last digit changed)', () => {
		expect(vatIdProblem('FI12345672', 'FI')).toMatch(/check digit/);
		expect(vatIdProblem('EL123456784', 'GR')).toMatch(/check digit/);
		expect(vatIdProblem('SE123456789801', 'SE')).toMatch(/check digit/);
		expect(vatIdProblem('BE0897221791', 'BE')).toMatch(/check digit/);
	});

	it('is refused in a form its country does not use', () => {
		expect(vatIdProblem('FI1234567', 'FI')).toMatch(/not the form of a VAT ID from Finland/);
		expect(vatIdProblem('FI123456710', 'FI')).toMatch(/not the form/);
		expect(vatIdProblem('SE123456789702', 'SE')).toMatch(/not the form/); // Swedish IDs end in 01
	});

	it('must carry the billing country’s prefix', () => {
		expect(vatIdProblem('SE123456789701', 'FI')).toMatch(/from Sweden \(SE\).*billing country is Finland/);
		// Greece's ISO code is GR, its VAT prefix EL: an EL ID belongs to a Greek buyer only.
		expect(vatIdProblem('EL123456783', 'CY')).toMatch(/from Greece \(EL\)/);
		expect(vatIdProblem('XX12345671', 'FI')).toMatch(/begins with FI/);
	});

	it('is normalised: upper case, no spaces, dots or hyphens, with the country’s prefix', () => {
		expect(cleanVatId(' fi 1234-567.1 ')).toBe('FI12345671');
		expect(normaliseVatId('1234567-1', 'FI')).toBe('FI12345671');
		expect(normaliseVatId('gr 123 456 783', 'GR')).toBe('EL123456783');
		expect(normaliseVatId('123456783', 'GR')).toBe('EL123456783');
		expect(normaliseVatId('CHE-123.456.788', 'CH')).toBe('CHE123456788');
		expect(normaliseVatId('   ', 'FI')).toBe('');
		expect(vatIdProblem('1234567-1', 'FI')).toBeNull();
		expect(vatPrefix('GR')).toBe('EL');
		expect(vatPrefix('DE')).toBe('DE');
	});

	it('is only checked where there are rules to check it by', () => {
		expect(checksVatIdsOf('FI')).toBe(true);
		expect(checksVatIdsOf('US')).toBe(false);
		expect(vatIdProblem('123456789', 'US')).toMatch(/cannot be checked/);
		expect(vatIdProblem('FI12345671', 'ZZ')).toMatch(/country first/);
		expect(vatIdProblem('FI1234567/1', 'FI')).toMatch(/letters and digits/);
	});
});

describe('billing details', () => {
	it('are kept trimmed, with the VAT ID normalised', () => {
		const parsed = parseBilling({ ...band, name: '  Lantern Static Oy ', country: 'fi', vatId: 'fi 1234567-1' });
		expect(parsed).toEqual({ ok: true, details: { ...band, name: 'Lantern Static Oy' } });
	});

	it('need every line, on one line', () => {
		const parsed = parseBilling({
			kind: 'person',
			name: ' ',
			street: 'a\nb',
			postalCode: '',
			city: 'x'.repeat(101),
			country: 'FI'
		});
		expect(parsed.ok).toBe(false);
		if (parsed.ok) return;
		expect(Object.keys(parsed.fields).sort()).toEqual(['city', 'name', 'postalCode', 'street']);
		expect(parsed.fields.street?.[0]).toMatch(/one line/);
		expect(parsed.fields.postalCode).toEqual(['Enter the postal code.']);
	});

	it('refuse an unknown kind or country, and a postal code that is not one', () => {
		const parsed = parseBilling({ ...band, kind: 'band', country: 'XX', postalCode: '33100!' });
		expect(parsed.ok).toBe(false);
		if (parsed.ok) return;
		expect(Object.keys(parsed.fields).sort()).toEqual(['country', 'kind', 'postalCode']);
	});

	it('give a wrong VAT ID as an error on vatId alone', () => {
		const parsed = parseBilling({ ...band, vatId: 'FI12345672' });
		expect(parsed).toEqual({ ok: false, fields: { vatId: [expect.stringMatching(/check digit/)] } });
	});

	it('give a VAT ID only to an organisation; a person’s empty one is fine', () => {
		const person = { ...band, kind: 'person', vatId: 'FI12345671' };
		expect(parseBilling(person)).toEqual({ ok: false, fields: { vatId: [expect.stringMatching(/Only an organisation/)] } });
		expect(parseBilling({ ...person, vatId: '' })).toEqual({ ok: true, details: { ...band, kind: 'person', vatId: '' } });
		const noVat = { ...band } as Partial<BillingDetails>;
		delete noVat.vatId;
		expect(parseBilling(noVat)).toEqual({ ok: true, details: { ...band, vatId: '' } });
	});

	it('check the VAT ID even when another field is wrong too', () => {
		const result = billingSchema.safeParse({ ...band, name: '', vatId: 'SE123456789701' });
		expect(result.error?.issues.map((i) => i.path.join('.')).sort()).toEqual(['name', 'vatId']);
	});

	it('read as one line on a booking', () => {
		expect(billingLine(band)).toBe('Lantern Static Oy, Hämeenkatu 1 B 12, 33100 Tampere, Finland, VAT ID FI12345671');
	});

	it('offer the ISO 3166-1 countries by name', () => {
		const list = billingCountries();
		expect(list.length).toBeGreaterThan(240);
		expect(list.find((c) => c.code === 'FI')?.name).toBe('Finland');
		expect(list.every((c) => /^[A-Z]{2}$/.test(c.code))).toBe(true);
	});
});

// Reverse charge for business buyers in another EU member state: Council Directive 2006/112/EC,
// Articles 44 and 196 (place of supply and who pays the VAT), Article 45 (a person pays the
// supplier's VAT). VAT IDs below are invented, with check digits that jsvat accepts.
import { describe, expect, it } from 'vitest';
import type { BillingDetails } from './billing';
import { EU_MEMBER_STATES, euVatIdCountry, treatmentOf, vatTreatmentFor } from './vat-treatment';

const studio = { reverseChargeAbroad: true, country: 'FI', vatId: 'FI00000000' };
const german: BillingDetails = {
	kind: 'organisation',
	name: 'Nachtfalter Tonträger GmbH',
	street: 'Lindenhof 7',
	postalCode: '50667',
	city: 'Köln',
	country: 'DE',
	vatId: 'DE294817367'
};

describe('which VAT a booking carries', () => {
	it('reverse charge for an organisation with a valid VAT ID of another member state, when the studio has opted in', () => {
		expect(vatTreatmentFor(studio, german)).toBe('reverse-charge');
		expect(vatTreatmentFor(studio, { ...german, country: 'AT', vatId: 'ATU29481735' })).toBe('reverse-charge');
	});

	it('the studio’s VAT otherwise, each condition on its own', () => {
		expect(vatTreatmentFor({ ...studio, reverseChargeAbroad: false }, german)).toBe('standard'); // the setting is off
		expect(vatTreatmentFor({ ...studio, country: 'NO' }, german)).toBe('standard'); // the studio is not in the EU
		expect(vatTreatmentFor({ ...studio, vatId: '' }, german)).toBe('standard'); // the studio has no VAT ID (BR-AE-02)
		expect(vatTreatmentFor(studio, null)).toBe('standard'); // no billing details
		expect(vatTreatmentFor(studio, { ...german, kind: 'person', vatId: '' })).toBe('standard'); // a person (Article 45)
		expect(vatTreatmentFor(studio, { ...german, vatId: '' })).toBe('standard'); // an organisation without a VAT ID
		expect(vatTreatmentFor(studio, { ...german, vatId: 'DE294817368' })).toBe('standard'); // a wrong check digit
		expect(vatTreatmentFor({ ...studio, country: 'DE', vatId: 'DE294817367' }, german)).toBe('standard'); // same state
		expect(vatTreatmentFor(studio, { ...german, country: 'FI' })).toBe('standard'); // address and VAT ID disagree
		expect(vatTreatmentFor(studio, { ...german, country: 'GB', vatId: 'GB980780684' })).toBe('standard'); // not in the EU
	});

	it('reads a VAT ID’s member state, Greece’s EL prefix as GR, and nothing outside the EU', () => {
		expect(euVatIdCountry('DE294817367')).toBe('DE');
		expect(euVatIdCountry('de 294 817 367')).toBe('DE');
		expect(euVatIdCountry('EL094014201')).toBe('GR');
		expect(euVatIdCountry('CHE116281710')).toBeNull();
		expect(euVatIdCountry('')).toBeNull();
		expect(EU_MEMBER_STATES.size).toBe(27);
	});

	it('a quote kept before treatments were stored is standard', () => {
		expect(treatmentOf({})).toBe('standard');
		expect(treatmentOf(null)).toBe('standard');
		expect(treatmentOf({ vatTreatment: 'reverse-charge' })).toBe('reverse-charge');
	});
});

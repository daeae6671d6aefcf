import { describe, expect, it } from 'vitest';
import { feePercent, missingInWords, payoutStatus, requirementPhrase, SOMETHING_ELSE, STILL_CHECKING } from './payouts';

// Requirement paths as Stripe's Account object lists them in `requirements.currently_due`.
describe('requirementPhrase', () => {
	it.each([
		['external_account', 'a bank account for payouts'],
		['business_profile.url', 'the studio’s website or a line about what it sells'],
		['business_profile.product_description', 'the studio’s website or a line about what it sells'],
		['business_profile.mcc', 'what kind of business the studio is'],
		['individual.verification.document', 'a photo of an identity document'],
		['person_1NXyz.verification.document', 'a photo of an identity document'],
		['individual.verification.additional_document', 'a document that proves the address'],
		['individual.dob.day', 'a date of birth'],
		['representative.first_name', 'a full name'],
		['individual.address.postal_code', 'a home address'],
		['individual.id_number', 'a personal identity number'],
		['tos_acceptance.date', 'accepting Stripe’s terms of service'],
		['company.tax_id', 'the company’s tax number'],
		['company.owners_provided', 'who owns and runs the company'],
		['company.address.city', 'the company’s name, address and registration'],
		['settings.payments.statement_descriptor', 'the name shown on artists’ card statements']
	])('%s reads as "%s"', (path, phrase) => {
		expect(requirementPhrase(path)).toBe(phrase);
	});

	it('knows nothing of paths Stripe may add later', () => {
		expect(requirementPhrase('some.future.field')).toBeNull();
		expect(requirementPhrase('')).toBeNull();
	});
});

describe('missingInWords', () => {
	it('says each phrase once, in Stripe’s order, with anything unknown last as one phrase', () => {
		expect(
			missingInWords(['individual.dob.day', 'x.y', 'external_account', 'individual.dob.month', 'z', 'individual.dob.year'])
		).toEqual(['a date of birth', 'a bank account for payouts', SOMETHING_ELSE]);
	});

	it('is empty when nothing is due', () => {
		expect(missingInWords([])).toEqual([]);
	});
});

describe('payoutStatus', () => {
	const base = { stripeAccountId: null, chargesEnabled: false, payoutsEnabled: false, accountRequirements: [] };

	it('is none without an account, whatever else the row says', () => {
		expect(payoutStatus(base)).toEqual({ state: 'none' });
		expect(payoutStatus({ ...base, chargesEnabled: true })).toEqual({ state: 'none' });
	});

	it('is incomplete while the account cannot take charges, with what is missing', () => {
		expect(payoutStatus({ ...base, stripeAccountId: 'acct_1', accountRequirements: ['external_account'] })).toEqual({
			state: 'incomplete',
			missing: ['a bank account for payouts']
		});
	});

	it('says Stripe is still checking when it cannot take charges and nothing is listed', () => {
		expect(payoutStatus({ ...base, stripeAccountId: 'acct_1' })).toEqual({ state: 'incomplete', missing: [STILL_CHECKING] });
	});

	it('is ready once the account takes charges, saying whether payouts run too', () => {
		expect(payoutStatus({ ...base, stripeAccountId: 'acct_1', chargesEnabled: true })).toEqual({
			state: 'ready',
			payoutsEnabled: false
		});
		expect(
			payoutStatus({ ...base, stripeAccountId: 'acct_1', chargesEnabled: true, payoutsEnabled: true, accountRequirements: ['x'] })
		).toEqual({ state: 'ready', payoutsEnabled: true });
	});
});

describe('feePercent', () => {
	it.each([
		[0, '0 %'],
		[250, '2.5 %'],
		[275, '2.75 %'],
		[5, '0.05 %'],
		[1000, '10 %'],
		[10000, '100 %']
	])('%i basis points read %s', (bp, text) => {
		expect(feePercent(bp)).toBe(text);
	});
});

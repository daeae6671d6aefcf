// Where a studio stands with taking payments: no payment account yet, an account that cannot take
// charges (with what is still missing, in words an owner reads), or ready. Stripe names what an
// account still needs as dotted requirement paths (Stripe API reference, "The Account object",
// `requirements.currently_due`, and the Connect guide "Handle verification": `external_account`,
// `individual.verification.document`, `person_XXXX.dob.day`, ...); each path here becomes a short
// phrase, and a path we do not know becomes one general phrase.

export type PayoutStatus =
	{ state: 'none' } | { state: 'incomplete'; missing: string[] } | { state: 'ready'; payoutsEnabled: boolean };

export interface PayoutFacts {
	stripeAccountId: string | null;
	chargesEnabled: boolean;
	payoutsEnabled: boolean;
	accountRequirements: readonly string[];
}

/** When an account cannot take charges yet and Stripe lists nothing: it is still looking at what it was given. */
export const STILL_CHECKING = 'Stripe is still checking the details you gave';
export const SOMETHING_ELSE = 'a few more details Stripe asks for';

// The person behind a requirement: the individual, a company's representative or any listed person.
const PERSON = String.raw`(?:individual|representative|person_[A-Za-z0-9]+|owners|directors|executives)`;

/** Stripe's requirement paths, first match wins, each with the phrase an owner reads. */
const PHRASES: readonly [RegExp, string][] = [
	[/^external_account$/, 'a bank account for payouts'],
	[/^tos_acceptance\./, 'accepting Stripe’s terms of service'],
	[/^business_type$/, 'whether the studio is run by a person or a company'],
	[/^business_profile\.(url|product_description)$/, 'the studio’s website or a line about what it sells'],
	[/^business_profile\.mcc$/, 'what kind of business the studio is'],
	[/^business_profile\.(support_|name)/, 'the studio’s name and contact details for customers'],
	[/^settings\.payments\.statement_descriptor/, 'the name shown on artists’ card statements'],
	[new RegExp(`^${PERSON}\\.verification\\.additional_document`), 'a document that proves the address'],
	[new RegExp(`^${PERSON}\\.verification\\.document`), 'a photo of an identity document'],
	[new RegExp(`^${PERSON}\\.dob\\.`), 'a date of birth'],
	[new RegExp(`^${PERSON}\\.(first_name|last_name|full_name_aliases)`), 'a full name'],
	[new RegExp(`^${PERSON}\\.address\\.`), 'a home address'],
	[new RegExp(`^${PERSON}\\.(email|phone)$`), 'an e-mail address and phone number'],
	[new RegExp(`^${PERSON}\\.(id_number|ssn_last_4)$`), 'a personal identity number'],
	[new RegExp(`^${PERSON}\\.relationship\\.`), 'the role of each person in the business'],
	[/^(company\.)?(owners|directors|executives)_provided$/, 'who owns and runs the company'],
	[/^company\.(tax_id|vat_id)$/, 'the company’s tax number'],
	[/^company\.verification\./, 'a document that proves the company is registered'],
	[/^company\./, 'the company’s name, address and registration'],
	[/^representative\./, 'details of the person who runs the company']
];

/** One requirement path in words, or null when it is one we do not know. */
export function requirementPhrase(path: string): string | null {
	for (const [pattern, phrase] of PHRASES) if (pattern.test(path)) return phrase;
	return null;
}

/** What Stripe still wants, in words, each phrase once, in Stripe's order; anything unknown as one general phrase at the end. */
export function missingInWords(requirements: readonly string[]): string[] {
	const out: string[] = [];
	let unknown = false;
	for (const path of requirements) {
		const phrase = requirementPhrase(path);
		if (phrase === null) unknown = true;
		else if (!out.includes(phrase)) out.push(phrase);
	}
	if (unknown) out.push(SOMETHING_ELSE);
	return out;
}

/** A studio takes bookings (and their deposits) only when its account can take charges. */
export function payoutStatus(s: PayoutFacts): PayoutStatus {
	if (!s.stripeAccountId) return { state: 'none' };
	if (s.chargesEnabled) return { state: 'ready', payoutsEnabled: s.payoutsEnabled };
	const missing = missingInWords(s.accountRequirements);
	return { state: 'incomplete', missing: missing.length ? missing : [STILL_CHECKING] };
}

/** The platform's fee in basis points as a percentage people read: 250 → "2.5 %". */
export function feePercent(bp: number): string {
	const whole = Math.trunc(bp / 100);
	const rest = bp % 100;
	return rest === 0 ? `${whole} %` : `${whole}.${String(rest).padStart(2, '0').replace(/0$/, '')} %`;
}

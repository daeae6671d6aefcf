// Who an invoice is made out to: the buyer. An artist may keep one set of billing details in their
// account and choose them, or other details, when booking; the booking keeps the details it was
// made with, and each document copies them when it is issued (EN 16931 BG-7 buyer, BG-8 its
// postal address, BT-48 its VAT identifier).
//
// The rules: every line is required, trimmed, on one line and of a sensible length; the country is
// an ISO 3166-1 alpha-2 code (the list of the countries-and-timezones package, built from the IANA
// tz database's iso3166.tab); a VAT ID belongs to an organisation only, is optional, and is kept
// normalised (upper case, no spaces, dots or hyphens, with its country's prefix). A VAT ID is
// checked for its country's format and check digits by the jsvat package, and its prefix must be
// the billing country's: the EU writes Greece's as EL (not GR) in VAT identifiers (Council
// Directive 2006/112/EC, art. 215, and the VIES service), Switzerland's UID for VAT is CHE.
import { z } from 'zod';
import { getAllCountries } from 'countries-and-timezones';
import {
	andorra,
	austria,
	belgium,
	bulgaria,
	checkVAT,
	croatia,
	cyprus,
	czechRepublic,
	denmark,
	estonia,
	finland,
	france,
	germany,
	greece,
	hungary,
	ireland,
	italy,
	latvia,
	lithuania,
	luxembourg,
	malta,
	netherlands,
	norway,
	poland,
	portugal,
	romania,
	russia,
	serbia,
	slovakiaRepublic,
	slovenia,
	spain,
	sweden,
	switzerland,
	unitedKingdom,
	type Country
} from 'jsvat';

/** A person buys for themselves; an organisation (a band's company, a label) may have a VAT ID. */
export const BUYER_KINDS = ['person', 'organisation'] as const;
export type BuyerKind = (typeof BUYER_KINDS)[number];

export interface BillingDetails {
	kind: BuyerKind;
	/** The person's full name, or the organisation's registered name. */
	name: string;
	street: string;
	postalCode: string;
	city: string;
	/** ISO 3166-1 alpha-2, upper case. */
	country: string;
	/** Only for an organisation; '' when it has none. Stored with its country prefix, no spaces. */
	vatId: string;
}

/** The longest text each field takes (characters, after trimming). */
export const BILLING_MAX = { name: 200, street: 200, postalCode: 12, city: 100, vatId: 32 } as const;

// ---------------------------------------------------------------------------------------------
// Countries

let countryList: { code: string; name: string }[] | null = null;

function englishName(code: string): string {
	try {
		return new Intl.DisplayNames(['en-GB'], { type: 'region' }).of(code) ?? code;
	} catch {
		return code;
	}
}

/** The countries a buyer can be in (ISO 3166-1 alpha-2), by English name. */
export function billingCountries(): { code: string; name: string }[] {
	countryList ??= Object.keys(getAllCountries({ deprecated: true }))
		.map((code) => ({ code, name: englishName(code) }))
		.sort((a, b) => a.name.localeCompare(b.name, 'en'));
	return countryList;
}

export function isBillingCountry(code: string): boolean {
	return /^[A-Z]{2}$/.test(code) && billingCountries().some((c) => c.code === code);
}

export function countryName(code: string): string {
	return billingCountries().find((c) => c.code === code)?.name ?? code;
}

// ---------------------------------------------------------------------------------------------
// VAT IDs

/**
 * The countries whose VAT IDs can be checked, by ISO code: jsvat's rules for the EU member states
 * and the neighbours it knows whose IDs begin with a country prefix (not Brazil's CNPJ, which has
 * none, nor the EU's own "EU" numbers for sellers outside the Union).
 */
const VAT_RULES: Readonly<Record<string, Country>> = {
	AD: andorra,
	AT: austria,
	BE: belgium,
	BG: bulgaria,
	CH: switzerland,
	CY: cyprus,
	CZ: czechRepublic,
	DE: germany,
	DK: denmark,
	EE: estonia,
	ES: spain,
	FI: finland,
	FR: france,
	GB: unitedKingdom,
	GR: greece,
	HR: croatia,
	HU: hungary,
	IE: ireland,
	IT: italy,
	LT: lithuania,
	LU: luxembourg,
	LV: latvia,
	MT: malta,
	NL: netherlands,
	NO: norway,
	PL: poland,
	PT: portugal,
	RO: romania,
	RS: serbia,
	RU: russia,
	SE: sweden,
	SI: slovenia,
	SK: slovakiaRepublic
};

/** Where a VAT ID's prefix is not the country's ISO code. */
const OTHER_PREFIX: Readonly<Record<string, string>> = { GR: 'EL', CH: 'CHE' };

/** Whether VAT IDs of this country can be checked (and so kept). */
export function checksVatIdsOf(country: string): boolean {
	return country in VAT_RULES;
}

/** The prefix a VAT ID of this country begins with: its ISO code, EL for Greece, CHE for Switzerland. */
export function vatPrefix(country: string): string {
	return OTHER_PREFIX[country] ?? country;
}

/** A VAT ID as typed, upper case without spaces, dots or hyphens (country-independent). */
export function cleanVatId(raw: string): string {
	return raw.toUpperCase().replace(/[\s.-]+/g, '');
}

/**
 * A VAT ID as it is kept: cleaned, and with the billing country's prefix when it was typed
 * without one (digits first). A Greek ID typed with GR gets EL. '' stays ''.
 */
export function normaliseVatId(raw: string, country: string): string {
	const id = cleanVatId(raw);
	if (!id) return '';
	if (/^\d/.test(id)) return vatPrefix(country) + id;
	if (country === 'GR' && id.startsWith('GR')) return 'EL' + id.slice(2);
	return id;
}

/** The country whose VAT prefix begins this ID, if any (the longest prefix wins: CHE before CH). */
function countryOfPrefix(id: string): string | undefined {
	let best: string | undefined;
	for (const country of Object.keys(VAT_RULES)) {
		const prefix = vatPrefix(country);
		if (id.startsWith(prefix) && (!best || prefix.length > vatPrefix(best).length)) best = country;
	}
	return best;
}

/** What is wrong with a VAT ID for a buyer in `country`, in words; null when it is right (or empty). */
export function vatIdProblem(raw: string, country: string): string | null {
	const id = normaliseVatId(raw, country);
	if (!id) return null;
	if (!/^[A-Z0-9]+$/.test(id)) return 'A VAT ID has letters and digits only (spaces, dots and hyphens are fine).';
	if (!isBillingCountry(country)) return 'Choose the billing country first: the VAT ID is checked against it.';
	const rules = VAT_RULES[country];
	if (!rules) {
		return `VAT IDs from ${countryName(country)} cannot be checked here; leave the field empty.`;
	}
	const prefix = vatPrefix(country);
	if (!id.startsWith(prefix)) {
		const other = countryOfPrefix(id);
		return other
			? `This VAT ID is from ${countryName(other)} (${vatPrefix(other)}), but the billing country is ${countryName(country)}: correct one of them.`
			: `A VAT ID from ${countryName(country)} begins with ${prefix}.`;
	}
	const result = checkVAT(id, [rules]);
	if (!result.isValidFormat)
		return `That is not the form of a VAT ID from ${countryName(country)}: check it against your registration.`;
	if (!result.isValid) return 'Its check digit does not match the rest: check it for a typing error.';
	return null;
}

// ---------------------------------------------------------------------------------------------
// The schema

// C0 controls, DEL and the Unicode line and paragraph separators: none of them belongs on one line.
// eslint-disable-next-line no-control-regex
const NOT_ONE_LINE = /[\u0000-\u001F\u007F\u2028\u2029]/;
export const ONE_LINE_MESSAGE = 'Write this on one line, without control characters.';

function line(field: 'name' | 'street' | 'city', missing: string) {
	const max = BILLING_MAX[field];
	return z
		.string({ error: missing })
		.trim()
		.min(1, { error: missing })
		.max(max, { error: `Keep it under ${max + 1} characters.` })
		.refine((s) => !NOT_ONE_LINE.test(s), { error: ONE_LINE_MESSAGE });
}

/** The fields, each on its own (the VAT ID against the country is the object's check below). */
export const billingFields = {
	kind: z.enum(BUYER_KINDS, { error: 'Choose a person or an organisation.' }),
	name: line('name', 'Enter the name to bill.'),
	street: line('street', 'Enter the street address.'),
	postalCode: z
		.string({ error: 'Enter the postal code.' })
		.trim()
		.min(1, { error: 'Enter the postal code.' })
		.max(BILLING_MAX.postalCode, { error: `A postal code has at most ${BILLING_MAX.postalCode} characters.` })
		// Empty is the message above alone.
		.regex(/^(?:[A-Za-z0-9](?:[A-Za-z0-9 -]*[A-Za-z0-9])?)?$/, {
			error: 'A postal code has letters, digits, spaces and hyphens only.'
		}),
	city: line('city', 'Enter the town or city.'),
	country: z
		.string({ error: 'Choose a country.' })
		.trim()
		.toUpperCase()
		.refine(isBillingCountry, { error: 'Choose a country from the list.' }),
	vatId: z
		.string({ error: 'Write the VAT ID as text.' })
		.trim()
		.max(BILLING_MAX.vatId, { error: 'A VAT ID is shorter than that.' })
		.refine((s) => !NOT_ONE_LINE.test(s), { error: ONE_LINE_MESSAGE })
		.default('')
};

type BillingShape = { kind: string; country: string; vatId: string };

/** The VAT ID against the kind and the country: an issue on vatId only, every other field kept. */
export function checkVatIdOf(value: BillingShape, addIssue: (message: string) => void) {
	if (typeof value.vatId !== 'string' || !value.vatId) return;
	if (value.kind !== 'organisation') {
		addIssue('Only an organisation is billed with a VAT ID: choose organisation, or leave it empty.');
		return;
	}
	const problem = vatIdProblem(value.vatId, typeof value.country === 'string' ? value.country : '');
	if (problem) addIssue(problem);
}

/** Billing details as the account page, the booking form and the JSON API take them. */
export const billingSchema = z
	.object(billingFields)
	.superRefine((value, ctx) => checkVatIdOf(value, (message) => ctx.addIssue({ code: 'custom', path: ['vatId'], message })));

/** Billing details as a form holds them (a type alias, as superforms wants its data). */
export type BillingForm = z.infer<typeof billingSchema>;

/** Details the schema accepted, as they are kept: the VAT ID normalised, none for a person. */
export function normaliseBilling(d: BillingDetails): BillingDetails {
	return {
		kind: d.kind,
		name: d.name.trim(),
		street: d.street.trim(),
		postalCode: d.postalCode.trim(),
		city: d.city.trim(),
		country: d.country.trim().toUpperCase(),
		vatId: d.kind === 'organisation' ? normaliseVatId(d.vatId, d.country.trim().toUpperCase()) : ''
	};
}

export type BillingFieldErrors = Partial<Record<keyof BillingDetails | '_', string[]>>;

/** Reads billing details from anything (a JSON body): the kept details, or messages by field. */
export function parseBilling(input: unknown): { ok: true; details: BillingDetails } | { ok: false; fields: BillingFieldErrors } {
	const parsed = billingSchema.safeParse(input);
	if (parsed.success) return { ok: true, details: normaliseBilling(parsed.data) };
	const fields: BillingFieldErrors = {};
	for (const issue of parsed.error.issues) {
		const key = (issue.path.length ? String(issue.path[0]) : '_') as keyof BillingFieldErrors;
		(fields[key] ??= []).push(issue.message);
	}
	return { ok: false, fields };
}

/** The details on one line, as a booking shows whom it is billed to. */
export function billingLine(d: BillingDetails): string {
	return [d.name, d.street, `${d.postalCode} ${d.city}`, countryName(d.country), d.vatId ? `VAT ID ${d.vatId}` : '']
		.filter(Boolean)
		.join(', ');
}

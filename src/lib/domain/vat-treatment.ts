/**
 * Which VAT a booking is priced and invoiced with: the studio's own rate ('standard'), or none
 * because the buyer accounts for it ('reverse-charge').
 *
 * Council Directive 2006/112/EC: a service supplied to a taxable person acting as such is supplied
 * where that person has established their business (Article 44), and when the supplier is not
 * established in that member state the VAT is payable by the customer (Article 196). The invoice
 * then carries no VAT, names both VAT identification numbers (Article 226(3) and (4)) and says
 * "Reverse charge" (Article 226(11a)). A person buying for themselves is always charged the
 * studio's VAT (Article 45).
 *
 * Our rule, which the owner switches on (`studio.reverseChargeAbroad`, off by default; local tax
 * advice decides whether it fits the studio): reverse charge applies when
 * - the setting is on,
 * - the studio is established in an EU member state and has a VAT identification number,
 * - the buyer is an organisation whose VAT identification number is well formed with valid check
 *   digits for an EU member state (jsvat) other than the studio's, and whose address is in that
 *   same member state (a buyer who cannot be placed in one other member state pays VAT: the
 *   careful default).
 * Everything else is 'standard'. Nothing here asks VIES whether the number is registered: the
 * studio checks that as its tax advice tells it to.
 *
 * The treatment is fixed when the booking is made (kept in its quote) and every document of the
 * booking follows it: deposit invoice, final invoice and credit notes.
 */
import { checkVAT, countries as vatCountries } from 'jsvat';
import type { BillingDetails } from './billing';

export type VatTreatment = 'standard' | 'reverse-charge';

/**
 * The EU's member states (Treaty on European Union, Article 52, as it stands since 1 February 2020)
 * by ISO 3166-1 alpha-2 code.
 */
export const EU_MEMBER_STATES: ReadonlySet<string> = new Set([
	'AT',
	'BE',
	'BG',
	'CY',
	'CZ',
	'DE',
	'DK',
	'EE',
	'ES',
	'FI',
	'FR',
	'GR',
	'HR',
	'HU',
	'IE',
	'IT',
	'LT',
	'LU',
	'LV',
	'MT',
	'NL',
	'PL',
	'PT',
	'RO',
	'SE',
	'SI',
	'SK'
]);

export const isEuMemberState = (country: string): boolean => EU_MEMBER_STATES.has(country);

/** The words the invoice carries (Article 226(11a)) and EN 16931 BT-120 with code BT-121. */
export const REVERSE_CHARGE_WORDS = 'Reverse charge';
/** CEF VAT exemption reason code list (VATEX), as EN 16931 BT-121 uses it. */
export const REVERSE_CHARGE_REASON_CODE = 'VATEX-EU-AE';

const EU_VAT_COUNTRIES = vatCountries.filter((c) => isEuMemberState(c.codes[0] ?? ''));

/**
 * The member state (ISO 3166-1 alpha-2; Greece's 'EL' prefix reads as GR) of a well-formed EU VAT
 * identification number with valid check digits, or null.
 */
export function euVatIdCountry(vatId: string): string | null {
	const result = checkVAT(vatId.replace(/[\s.-]/g, '').toUpperCase(), EU_VAT_COUNTRIES);
	const country = result.country?.isoCode.short;
	return result.isValid && country && isEuMemberState(country) ? country : null;
}

export interface SellerForTreatment {
	reverseChargeAbroad: boolean;
	/** ISO 3166-1 alpha-2. */
	country: string;
	vatId: string;
}

/** The treatment of a booking by this seller for this buyer (null: the artist gave no billing details). */
export function vatTreatmentFor(seller: SellerForTreatment, buyer: BillingDetails | null | undefined): VatTreatment {
	if (!seller.reverseChargeAbroad || !isEuMemberState(seller.country) || !seller.vatId.trim()) return 'standard';
	if (!buyer || buyer.kind !== 'organisation' || !buyer.vatId) return 'standard';
	const buyerState = euVatIdCountry(buyer.vatId);
	if (!buyerState || buyerState === seller.country || buyer.country !== buyerState) return 'standard';
	return 'reverse-charge';
}

/** The treatment a booking's quote was made with; a quote from before treatments were kept is 'standard'. */
export function treatmentOf(quote: { vatTreatment?: VatTreatment } | null | undefined): VatTreatment {
	return quote?.vatTreatment === 'reverse-charge' ? 'reverse-charge' : 'standard';
}

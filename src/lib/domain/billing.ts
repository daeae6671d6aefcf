// Who an invoice is made out to: the buyer. An artist may keep one set of billing details in their
// account and choose them, or other details, when booking; the booking keeps the details it was
// made with, and each document copies them when it is issued (EN 16931 BG-7 buyer, BG-8 its
// postal address, BT-48 its VAT identifier).

/** A person buys for themselves; an organisation (a band's company, a label) may have a VAT ID. */
export type BuyerKind = 'person' | 'organisation';

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

// Where a new studio is and what it charges in: its country (ISO 3166-1 alpha-2), its time zone
// (an IANA zone name) and its currency (ISO 4217). The country proposes the other two; the owner
// may change them. Zones by country come from the countries-and-timezones package (built from the
// IANA tz database), a country's currency from country-to-currency, currency codes and their minor
// units from currency-codes (ISO 4217), public holidays from date-holidays (holidays.ts).
import { getAllCountries, getTimezone } from 'countries-and-timezones';
import countryToCurrency from 'country-to-currency';
import { code as iso4217 } from 'currency-codes';
import { hasPublicHolidayCalendar } from './holidays';

/**
 * The currencies Stripe can charge a card in (its presentment currencies), written from memory of
 * Stripe's documented list "Supported currencies" (stripe.com/docs/currencies); a studio may only
 * take one of these. Check it against that page when Stripe changes it.
 */
export const STRIPE_PRESENTMENT_CURRENCIES: ReadonlySet<string> = new Set(
	(
		'USD AED AFN ALL AMD ANG AOA ARS AUD AWG AZN BAM BBD BDT BGN BHD BIF BMD BND BOB BRL BSD BWP BYN BZD ' +
		'CAD CDF CHF CLP CNY COP CRC CVE CZK DJF DKK DOP DZD EGP ETB EUR FJD FKP GBP GEL GIP GMD GNF GTQ GYD ' +
		'HKD HNL HTG HUF IDR ILS INR ISK JMD JOD JPY KES KGS KHR KMF KRW KWD KYD KZT LAK LBP LKR LRD LSL MAD ' +
		'MDL MGA MKD MMK MNT MOP MUR MVR MWK MXN MYR MZN NAD NGN NIO NOK NPR NZD OMR PAB PEN PGK PHP PKR PLN ' +
		'PYG QAR RON RSD RUB RWF SAR SBD SCR SEK SGD SHP SLE SOS SRD STD SZL THB TJS TND TOP TRY TTD TWD TZS ' +
		'UAH UGX UYU UZS VND VUV WST XAF XCD XOF XPF YER ZAR ZMW'
	).split(' ')
);

/**
 * The zone proposed for a country with several: the zone of its largest city (our choice). The
 * data lists a country's zones by name, which would put America/Adak first for the United States.
 */
const MAIN_ZONE: Record<string, string> = {
	AR: 'America/Argentina/Buenos_Aires',
	AU: 'Australia/Sydney',
	BR: 'America/Sao_Paulo',
	CA: 'America/Toronto',
	CL: 'America/Santiago',
	CN: 'Asia/Shanghai',
	DE: 'Europe/Berlin',
	EC: 'America/Guayaquil',
	ES: 'Europe/Madrid',
	ID: 'Asia/Jakarta',
	KZ: 'Asia/Almaty',
	MX: 'America/Mexico_City',
	NZ: 'Pacific/Auckland',
	PT: 'Europe/Lisbon',
	RU: 'Europe/Moscow',
	UA: 'Europe/Kyiv',
	US: 'America/New_York'
};

/** The currency proposed when a country's own is one Stripe does not charge in. */
const FALLBACK_CURRENCY = 'USD';

export interface CountryChoice {
	code: string;
	name: string;
	/** IANA zones of the country, the one proposed first. */
	zones: string[];
	/** The currency proposed for it (its own where Stripe charges in it). */
	currency: string;
}

function englishName(code: string): string {
	try {
		return new Intl.DisplayNames(['en-GB'], { type: 'region' }).of(code) ?? code;
	} catch {
		return code;
	}
}

/**
 * A country's zones, the one to propose first: our choice for the largest countries, then the
 * zones named after a place in the country. The tz database now makes some of those links to a
 * neighbour's zone (Europe/Oslo and Europe/Stockholm to Europe/Berlin, same clock); the links are
 * still valid zone names and read as the owner expects, so they come before the neighbour's.
 */
function zonesOf(country: string, all: readonly string[]): string[] {
	const rank = (zone: string) => {
		if (zone === MAIN_ZONE[country]) return 0;
		const info = getTimezone(zone);
		const own = info?.countries[0] === country;
		if (own && !info?.deprecated) return 1;
		if (own) return 2;
		return 3;
	};
	return [...all].sort((a, b) => rank(a) - rank(b) || a.localeCompare(b));
}

let choices: CountryChoice[] | null = null;

/**
 * The countries a studio can be in: those with at least one time zone and a public holiday
 * calendar (the booking rules read both), by English name.
 */
export function countryChoices(): CountryChoice[] {
	if (choices) return choices;
	choices = Object.values(getAllCountries({ deprecated: true }))
		.filter((c) => c.timezones.length > 0 && hasPublicHolidayCalendar(c.id))
		.map((c) => {
			const own = (countryToCurrency as Record<string, string | undefined>)[c.id];
			return {
				code: c.id,
				name: englishName(c.id),
				zones: zonesOf(c.id, c.timezones),
				currency: own && STRIPE_PRESENTMENT_CURRENCIES.has(own) ? own : FALLBACK_CURRENCY
			};
		})
		.sort((a, b) => a.name.localeCompare(b.name, 'en'));
	return choices;
}

export function countryChoice(code: string): CountryChoice | undefined {
	return countryChoices().find((c) => c.code === code);
}

/** What the form proposes for a country: its first zone and its currency. */
export function proposalFor(country: string): { timeZone: string; currency: string } | null {
	const c = countryChoice(country);
	return c ? { timeZone: c.zones[0]!, currency: c.currency } : null;
}

/** Why a country cannot be a studio's, in words; null when it can. */
export function countryProblem(code: string): string | null {
	if (!/^[A-Z]{2}$/.test(code)) return 'Choose a country from the list.';
	return countryChoice(code)
		? null
		: 'We cannot set up a studio in that country yet: we have no calendar of its public holidays.';
}

/** Why a time zone cannot be used, in words; null when it can. An IANA name, e.g. Europe/Helsinki. */
export function timeZoneProblem(zone: string): string | null {
	if (!getTimezone(zone)) return 'Choose a time zone from the list, such as Europe/Helsinki.';
	try {
		new Intl.DateTimeFormat('en', { timeZone: zone });
	} catch {
		return 'Choose a time zone from the list, such as Europe/Helsinki.';
	}
	return null;
}

/** Why a currency cannot be a studio's, in words; null when it can. */
export function currencyProblem(currency: string): string | null {
	if (!/^[A-Z]{3}$/.test(currency) || !iso4217(currency))
		return 'Choose a currency by its three-letter ISO 4217 code, such as EUR.';
	if (!STRIPE_PRESENTMENT_CURRENCIES.has(currency))
		return `Card payments cannot be taken in ${currency}; choose another currency.`;
	return null;
}

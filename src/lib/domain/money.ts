/**
 * Money helpers. Every amount is an integer number of minor units (`Minor`); nothing here
 * multiplies money by a float. Products and quotients go through BigInt, so `a × b / c` is exact
 * before the one rounding step that each helper names.
 */
import { code as iso4217 } from 'currency-codes';
import type { Minor } from './types';

// ---------------------------------------------------------------------------------------------
// ISO 4217 minor units
// ---------------------------------------------------------------------------------------------

/**
 * Number of decimal digits of the currency's minor unit, from the ISO 4217 list as shipped in the
 * `currency-codes` package: EUR 2, JPY 0, ISK 0, KWD 3. Throws on a code ISO 4217 does not list.
 */
export function minorUnits(currency: string): number {
	const record = iso4217(currency);
	if (!record || !Number.isInteger(record.digits)) {
		throw new RangeError(`Unknown ISO 4217 currency code: ${currency}`);
	}
	return record.digits;
}

/** 10^digits: how many minor units make one whole currency unit (EUR 100, JPY 1, KWD 1000). */
export function minorPerMajor(currency: string): number {
	return 10 ** minorUnits(currency);
}

/** Exact decimal text of an amount in minor units: (20550, 'EUR') → "205.50", (-5, 'EUR') → "-0.05". */
export function toDecimalString(minor: Minor, currency: string): string {
	assertInteger(minor, 'amount');
	const digits = minorUnits(currency);
	const sign = minor < 0 ? '-' : '';
	const abs = String(Math.abs(minor));
	if (digits === 0) return sign + abs;
	const padded = abs.padStart(digits + 1, '0');
	return `${sign}${padded.slice(0, -digits)}.${padded.slice(-digits)}`;
}

/**
 * Formats an amount for people with Intl.NumberFormat (ECMA-402), e.g. (20500, 'EUR') → "€205.00"
 * in en-GB. The amount reaches Intl as exact decimal text, never as a float, and always with the
 * ISO 4217 number of decimals.
 */
export function formatMoney(minor: Minor, currency: string, locale = 'en-GB'): string {
	const digits = minorUnits(currency);
	const format = new Intl.NumberFormat(locale, {
		style: 'currency',
		currency,
		minimumFractionDigits: digits,
		maximumFractionDigits: digits
	});
	// ES2023 Intl.NumberFormat v3 takes a decimal string and formats it exactly.
	return format.format(toDecimalString(minor, currency) as `${number}`);
}

// ---------------------------------------------------------------------------------------------
// Stripe amounts
// ---------------------------------------------------------------------------------------------

/** Stripe docs, "Supported currencies" → "Zero-decimal currencies". */
// prettier-ignore
export const STRIPE_ZERO_DECIMAL = new Set([
	'BIF', 'CLP', 'DJF', 'GNF', 'JPY', 'KMF', 'KRW', 'MGA',
	'PYG', 'RWF', 'UGX', 'VND', 'VUV', 'XAF', 'XOF', 'XPF'
]);

/**
 * Stripe docs, "Supported currencies" → "Three-decimal currencies": the API takes three decimals
 * but the last digit must be 0 ("round amounts to the nearest ten").
 */
export const STRIPE_THREE_DECIMAL = new Set(['BHD', 'JOD', 'KWD', 'OMR', 'TND']);

/**
 * Stripe docs, "Supported currencies" → "Special cases", and Stripe support, "Deprecation of
 * fractional ISK charges and refunds" (2023): ISK stays two-decimal in the API but every amount
 * must be a multiple of 100 (whole krónur), although ISO 4217 gives ISK 0 digits.
 */
const STRIPE_SPECIAL: Record<string, { digits: number; step: number }> = {
	ISK: { digits: 2, step: 100 }
};

/** How Stripe writes amounts of a currency: decimals in the API and the step amounts must be on. */
export function stripeCurrencyRule(currency: string): { digits: number; step: number } {
	const upper = currency.toUpperCase();
	const special = STRIPE_SPECIAL[upper];
	if (special) return special;
	if (STRIPE_ZERO_DECIMAL.has(upper)) return { digits: 0, step: 1 };
	if (STRIPE_THREE_DECIMAL.has(upper)) return { digits: 3, step: 10 };
	return { digits: 2, step: 1 }; // Stripe: "unless otherwise noted, currencies are two-decimal"
}

/**
 * Converts an amount in ISO 4217 minor units to the integer Stripe expects, by Stripe's rule
 * rather than by ISO digits alone: JPY ¥500 → 500; EUR 205.00 → 20500; ISK 5 kr → 500;
 * KWD 5.124 → 5120 (rounded half-up to the nearest ten, as Stripe asks). Where Stripe's step
 * forces rounding, callers that must charge the exact invoiced amount should check
 * `isExactStripeAmount` first.
 */
export function toStripeAmount(minor: Minor, currency: string): number {
	assertInteger(minor, 'amount');
	const iso = minorUnits(currency);
	const { digits, step } = stripeCurrencyRule(currency);
	const scaled = digits >= iso ? mulDivRoundHalfUp(minor, 10 ** (digits - iso), 1) : divRoundHalfUp(minor, 10 ** (iso - digits));
	return roundHalfUpToMultiple(scaled, step);
}

/** true when `toStripeAmount` loses nothing (Stripe's integer represents exactly `minor`). */
export function isExactStripeAmount(minor: Minor, currency: string): boolean {
	return fromStripeAmount(toStripeAmount(minor, currency), currency) === minor;
}

/** Inverse of `toStripeAmount` for amounts Stripe reports back (refunds, webhooks). */
export function fromStripeAmount(stripeAmount: number, currency: string): Minor {
	assertInteger(stripeAmount, 'Stripe amount');
	const iso = minorUnits(currency);
	const { digits } = stripeCurrencyRule(currency);
	return digits >= iso
		? divRoundHalfUp(stripeAmount, 10 ** (digits - iso))
		: mulDivRoundHalfUp(stripeAmount, 10 ** (iso - digits), 1);
}

// ---------------------------------------------------------------------------------------------
// Integer rounding
// ---------------------------------------------------------------------------------------------

/** Throws unless `n` is a safe integer: money and counts are never fractional here. */
export function assertInteger(n: number, what = 'value'): void {
	if (!Number.isSafeInteger(n)) throw new RangeError(`${what} must be a safe integer, got ${n}`);
}

function toSafeNumber(n: bigint): number {
	const result = Number(n);
	if (!Number.isSafeInteger(result)) throw new RangeError(`result ${n} is not a safe integer`);
	return result;
}

function bigArgs(a: number, b: number, c: number): [bigint, bigint, bigint] {
	assertInteger(a, 'a');
	assertInteger(b, 'b');
	assertInteger(c, 'c');
	if (c === 0) throw new RangeError('division by zero');
	return [BigInt(a), BigInt(b), BigInt(c)];
}

/**
 * Rounds the exact quotient n / d half-up, i.e. to the nearest integer with halves away from
 * zero: the rounding mode decimal.js calls ROUND_HALF_UP and the one commercial rounding to cents
 * uses (EN 16931 gives no mode; half-up is common practice).
 */
function bigDivRoundHalfUp(n: bigint, d: bigint): bigint {
	if (d < 0n) return bigDivRoundHalfUp(-n, -d);
	const negative = n < 0n;
	const abs = negative ? -n : n;
	const q = (2n * abs + d) / (2n * d); // floor((abs + d/2) / d), exact in integers
	return negative ? -q : q;
}

/** Exact a × b / c rounded half-up (halves away from zero). */
export function mulDivRoundHalfUp(a: number, b: number, c: number): number {
	const [x, y, z] = bigArgs(a, b, c);
	return toSafeNumber(bigDivRoundHalfUp(x * y, z));
}

/** Exact a × b / c rounded up (towards +∞). */
export function mulDivCeil(a: number, b: number, c: number): number {
	const [x, y, z] = bigArgs(a, b, c);
	const n = z < 0n ? -(x * y) : x * y;
	const d = z < 0n ? -z : z;
	const q = n / d; // BigInt division truncates towards zero
	return toSafeNumber(n % d !== 0n && n > 0n ? q + 1n : q);
}

/** Exact a × b / c rounded down (towards −∞). */
export function mulDivFloor(a: number, b: number, c: number): number {
	const result = -mulDivCeil(-a, b, c);
	return result === 0 ? 0 : result; // never -0
}

/** n / d rounded half-up (halves away from zero). */
export function divRoundHalfUp(n: number, d: number): number {
	return mulDivRoundHalfUp(n, 1, d);
}

/** n / d rounded up (towards +∞). */
export function divCeil(n: number, d: number): number {
	return mulDivCeil(n, 1, d);
}

/** n rounded half-up to a multiple of `step` (step > 0): (5124, 10) → 5120, (5125, 10) → 5130. */
export function roundHalfUpToMultiple(n: number, step: number): number {
	if (step <= 0) throw new RangeError('step must be positive');
	return divRoundHalfUp(n, step) * step;
}

/** n rounded up to a multiple of `step` (step > 0): (6150, 100) → 6200. */
export function ceilToMultiple(n: number, step: number): number {
	if (step <= 0) throw new RangeError('step must be positive');
	return divCeil(n, step) * step;
}

/** amount × bp / 10 000 rounded half-up: a share in basis points (2550 = 25.5 %). */
export function applyBasisPoints(amount: Minor, bp: number): Minor {
	return mulDivRoundHalfUp(amount, bp, 10_000);
}

/** Sum of integer amounts, checked to stay a safe integer. */
export function sumMinor(amounts: Iterable<Minor>): Minor {
	let total = 0n;
	for (const a of amounts) {
		assertInteger(a, 'amount');
		total += BigInt(a);
	}
	return toSafeNumber(total);
}

/** Basis points as a percent string without trailing zeros: 2550 → "25.5", 2400 → "24", 25 → "0.25". */
export function basisPointsToPercent(bp: number): string {
	assertInteger(bp, 'basis points');
	const sign = bp < 0 ? '-' : '';
	const abs = Math.abs(bp);
	const whole = Math.floor(abs / 100);
	const fraction = String(abs % 100)
		.padStart(2, '0')
		.replace(/0+$/, '');
	return fraction ? `${sign}${whole}.${fraction}` : `${sign}${whole}`;
}

// ---------------------------------------------------------------------------------------------
// Parsing what people type
// ---------------------------------------------------------------------------------------------

export type ParsedDecimal =
	{ ok: true; value: number } | { ok: false; reason: 'empty' | 'format' | 'negative' | 'precision' | 'too-large' };

/**
 * Reads plain decimal text ("45", "45.5", "45.50", "-3") as an integer scaled by 10^digits, by
 * string arithmetic alone (no float ever holds the amount). A point is the only decimal mark;
 * grouping marks, commas, currency signs and exponents are refused, so "12,5" is never read as
 * twelve thousand five hundred or as 12.5 by guesswork.
 */
export function parseScaledDecimal(text: string, digits: number): ParsedDecimal {
	const s = text.trim();
	if (s === '') return { ok: false, reason: 'empty' };
	const m = /^(-?)(\d+)(?:\.(\d*))?$|^(-?)\.(\d+)$/.exec(s);
	if (!m) return { ok: false, reason: 'format' };
	const negative = (m[1] ?? m[4]) === '-';
	const whole = m[2] ?? '0';
	const fraction = (m[3] ?? m[5] ?? '').replace(/0+$/, '');
	if (fraction.length > digits) return { ok: false, reason: 'precision' };
	const scaled = BigInt(whole) * 10n ** BigInt(digits) + BigInt(fraction.padEnd(digits, '0') || '0');
	if (negative && scaled !== 0n) return { ok: false, reason: 'negative' };
	if (scaled > BigInt(Number.MAX_SAFE_INTEGER)) return { ok: false, reason: 'too-large' };
	return { ok: true, value: Number(scaled) };
}

/** Decimal text in the currency's major unit to minor units, exactly: ("45.50", 'EUR') → 4550, ("500", 'JPY') → 500. */
export function parseMoney(text: string, currency: string): ParsedDecimal {
	return parseScaledDecimal(text, minorUnits(currency));
}

/** A percent as typed to basis points, exactly: "25.5" → 2550, "30" → 3000, "0.25" → 25. */
export function parsePercentToBasisPoints(text: string): ParsedDecimal {
	return parseScaledDecimal(text.replace(/\s*%$/, ''), 2);
}

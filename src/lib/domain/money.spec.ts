import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Decimal from 'decimal.js';
import {
	applyBasisPoints,
	assertInteger,
	parseScaledDecimal,
	stripeCurrencyRule,
	basisPointsToPercent,
	ceilToMultiple,
	divRoundHalfUp,
	formatMoney,
	fromStripeAmount,
	isExactStripeAmount,
	minorPerMajor,
	minorUnits,
	mulDivCeil,
	mulDivFloor,
	mulDivRoundHalfUp,
	parseMoney,
	parsePercentToBasisPoints,
	roundHalfUpToMultiple,
	sumMinor,
	toDecimalString,
	toStripeAmount
} from './money';

// decimal.js with room for products of two safe integers (≈ 32 digits).
const D = Decimal.clone({ precision: 60 });

describe('ISO 4217 minor units (source: ISO 4217 via the currency-codes package)', () => {
	it('gives EUR 2, JPY 0, ISK 0, KWD 3 digits', () => {
		expect(minorUnits('EUR')).toBe(2);
		expect(minorUnits('JPY')).toBe(0);
		expect(minorUnits('ISK')).toBe(0);
		expect(minorUnits('KWD')).toBe(3);
		expect(minorUnits('eur')).toBe(2); // codes are case-insensitive
		expect(minorPerMajor('EUR')).toBe(100);
		expect(minorPerMajor('KWD')).toBe(1000);
	});

	it('refuses a code ISO 4217 does not list', () => {
		expect(() => minorUnits('EUX')).toThrow(RangeError);
	});

	it('writes exact decimal text per ISO digits', () => {
		expect(toDecimalString(20550, 'EUR')).toBe('205.50');
		expect(toDecimalString(-5, 'EUR')).toBe('-0.05');
		expect(toDecimalString(500, 'JPY')).toBe('500');
		expect(toDecimalString(5124, 'KWD')).toBe('5.124');
	});
});

describe('formatMoney (Intl.NumberFormat, ECMA-402, en-GB by default)', () => {
	it('formats euros with two decimals, negatives too', () => {
		expect(formatMoney(20500, 'EUR')).toBe('€205.00');
		expect(formatMoney(-1250, 'EUR')).toBe('-€12.50');
		expect(formatMoney(123456789, 'EUR')).toBe('€1,234,567.89');
	});

	it('uses the ISO digits of each currency', () => {
		expect(formatMoney(1000, 'JPY')).toBe('JP¥1,000');
		expect(formatMoney(5124, 'KWD').replace(/\s/g, ' ')).toBe('KWD 5.124'); // ICU puts a no-break space
	});

	it('formats in another locale (fi-FI groups with a space and puts € last)', () => {
		expect(formatMoney(123456, 'EUR', 'fi-FI').replace(/\s/g, ' ')).toBe('1 234,56 €');
	});

	it('never goes through a float: 2^53 − 1 cents prints exactly', () => {
		expect(formatMoney(Number.MAX_SAFE_INTEGER, 'EUR')).toBe('€90,071,992,547,409.91');
	});
});

describe('Stripe amounts (source: Stripe docs, "Supported currencies" and its special cases)', () => {
	it('sends two-decimal currencies in cents', () => {
		expect(toStripeAmount(20500, 'EUR')).toBe(20500); // €205.00 → 20500
	});

	it('sends zero-decimal JPY as whole yen', () => {
		expect(toStripeAmount(500, 'JPY')).toBe(500); // "to charge ¥500, provide an amount value of 500"
	});

	it('rounds three-decimal KWD to the nearest ten, half-up', () => {
		// Stripe: "5.124 KWD must be rounded to 5120 or 5130" — nearest ten: 5120; 5.125 → 5130.
		expect(toStripeAmount(5124, 'KWD')).toBe(5120);
		expect(toStripeAmount(5125, 'KWD')).toBe(5130);
		expect(toStripeAmount(5120, 'KWD')).toBe(5120);
		expect(isExactStripeAmount(5124, 'KWD')).toBe(false);
		expect(isExactStripeAmount(5120, 'KWD')).toBe(true);
	});

	it('sends ISK as two-decimal in multiples of 100 although ISO gives it 0 digits', () => {
		// Stripe: "to charge 5 ISK, provide an amount value of 500".
		expect(toStripeAmount(5, 'ISK')).toBe(500);
		expect(toStripeAmount(12345, 'ISK') % 100).toBe(0);
		expect(fromStripeAmount(500, 'ISK')).toBe(5);
	});

	it('sends MGA (ISO 2 digits, Stripe zero-decimal) as whole ariary', () => {
		expect(minorUnits('MGA')).toBe(2);
		expect(toStripeAmount(12300, 'MGA')).toBe(123);
		expect(fromStripeAmount(123, 'MGA')).toBe(12300);
	});

	it('round-trips exactly wherever Stripe needs no rounding', () => {
		fc.assert(
			fc.property(
				fc.integer({ min: 0, max: 10_000_000 }),
				fc.constantFrom('EUR', 'USD', 'JPY', 'KRW', 'ISK', 'SEK'),
				(minor, currency) => {
					expect(fromStripeAmount(toStripeAmount(minor, currency), currency)).toBe(minor);
				}
			)
		);
	});
});

describe('integer rounding (cross-checked against decimal.js)', () => {
	it('rounds halves away from zero like decimal.js ROUND_HALF_UP', () => {
		// 1 × 1 / 2 = 0.5 → 1; −0.5 → −1; 2.5 → 3; 2.4999… → 2.
		expect(mulDivRoundHalfUp(1, 1, 2)).toBe(1);
		expect(mulDivRoundHalfUp(-1, 1, 2)).toBe(-1);
		expect(divRoundHalfUp(5, 2)).toBe(3);
		expect(mulDivRoundHalfUp(4999, 1, 2000)).toBe(2);
		expect(new D(-1).div(2).toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber()).toBe(-1);
	});

	it('EN 16931 worked check: 183.23 at 6 % gives VAT 10.99', () => {
		// 18323 × 600 / 10000 = 1099.38 → 1099 cents (BR-CO-17, rounded to 2 decimals).
		expect(applyBasisPoints(18323, 600)).toBe(1099);
		expect(new D('183.23').mul('0.06').toDecimalPlaces(2, Decimal.ROUND_HALF_UP).toString()).toBe('10.99');
	});

	it('mulDivRoundHalfUp, mulDivCeil and mulDivFloor equal decimal.js for any safe integers', () => {
		const safe = fc.integer({ min: -(2 ** 40), max: 2 ** 40 });
		const divisor = fc.integer({ min: -(2 ** 30), max: 2 ** 30 }).filter((c) => c !== 0);
		fc.assert(
			fc.property(safe, fc.integer({ min: -100_000, max: 100_000 }), divisor, (a, b, c) => {
				const exact = new D(a).mul(b).div(c);
				fc.pre(exact.abs().plus(1).lte(Number.MAX_SAFE_INTEGER));
				expect(mulDivRoundHalfUp(a, b, c)).toBe(exact.toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber() + 0); // + 0: decimal.js keeps −0
				expect(mulDivCeil(a, b, c)).toBe(exact.toDecimalPlaces(0, Decimal.ROUND_CEIL).toNumber() + 0); // + 0: decimal.js keeps −0
				expect(mulDivFloor(a, b, c)).toBe(exact.toDecimalPlaces(0, Decimal.ROUND_FLOOR).toNumber() + 0); // + 0: decimal.js keeps −0
			}),
			{ numRuns: 500 }
		);
	});

	it('computes a × b / c exactly even when a × b passes 2^53', () => {
		// 9 007 199 254 740 991 × 3 / 3 would lose digits as a float product.
		expect(mulDivRoundHalfUp(Number.MAX_SAFE_INTEGER, 3, 3)).toBe(Number.MAX_SAFE_INTEGER);
		expect(() => mulDivRoundHalfUp(Number.MAX_SAFE_INTEGER, 3, 1)).toThrow(RangeError);
		expect(() => mulDivRoundHalfUp(1.5, 1, 1)).toThrow(RangeError); // money never floats
		expect(() => mulDivRoundHalfUp(1, 1, 0)).toThrow(RangeError);
	});

	it('rounds to multiples: half-up and up', () => {
		expect(roundHalfUpToMultiple(5124, 10)).toBe(5120);
		expect(roundHalfUpToMultiple(5125, 10)).toBe(5130);
		expect(ceilToMultiple(6150, 100)).toBe(6200); // 61.50 € → 62 € (whole euros, up)
		expect(ceilToMultiple(6200, 100)).toBe(6200);
		expect(sumMinor([1, 2, 3])).toBe(6);
	});

	it('writes basis points as percent text without trailing zeros', () => {
		expect(basisPointsToPercent(2550)).toBe('25.5');
		expect(basisPointsToPercent(2400)).toBe('24');
		expect(basisPointsToPercent(25)).toBe('0.25');
		expect(basisPointsToPercent(0)).toBe('0');
	});
});

describe('parsing typed amounts and percents (exact, no floats)', () => {
	it('reads money in minor units by the currency’s ISO 4217 digits', () => {
		expect(parseMoney('45', 'EUR')).toEqual({ ok: true, value: 4500 });
		expect(parseMoney(' 45.5 ', 'EUR')).toEqual({ ok: true, value: 4550 });
		expect(parseMoney('0.07', 'EUR')).toEqual({ ok: true, value: 7 });
		expect(parseMoney('.5', 'EUR')).toEqual({ ok: true, value: 50 });
		expect(parseMoney('45.', 'EUR')).toEqual({ ok: true, value: 4500 });
		expect(parseMoney('160.00', 'EUR')).toEqual({ ok: true, value: 16000 });
		expect(parseMoney('500', 'JPY')).toEqual({ ok: true, value: 500 });
		expect(parseMoney('5.125', 'KWD')).toEqual({ ok: true, value: 5125 });
		// 0.1 + 0.2 style float trouble cannot happen: 1.15 × 100 is 114.99999999999999 in floats.
		expect(parseMoney('1.15', 'EUR')).toEqual({ ok: true, value: 115 });
		expect(parseMoney('-0.00', 'EUR')).toEqual({ ok: true, value: 0 });
	});

	it('refuses commas, signs, letters, exponents, too many decimals and negatives', () => {
		for (const bad of ['12,5x', '12,50', '1,000.00', '€45', '45 EUR', '1e3', '0x10', '4 5', 'abc', '--1', '+5']) {
			expect(parseMoney(bad, 'EUR')).toEqual({ ok: false, reason: 'format' });
		}
		expect(parseMoney('', 'EUR')).toEqual({ ok: false, reason: 'empty' });
		expect(parseMoney('45.505', 'EUR')).toEqual({ ok: false, reason: 'precision' });
		expect(parseMoney('45.5', 'JPY')).toEqual({ ok: false, reason: 'precision' });
		expect(parseMoney('-3.00', 'EUR')).toEqual({ ok: false, reason: 'negative' });
		expect(parseMoney('99999999999999999', 'EUR')).toEqual({ ok: false, reason: 'too-large' });
	});

	it('reads percents as basis points', () => {
		expect(parsePercentToBasisPoints('25.5')).toEqual({ ok: true, value: 2550 });
		expect(parsePercentToBasisPoints('30 %')).toEqual({ ok: true, value: 3000 });
		expect(parsePercentToBasisPoints('0.25')).toEqual({ ok: true, value: 25 });
		expect(parsePercentToBasisPoints('25.505')).toEqual({ ok: false, reason: 'precision' });
	});

	it('round-trips every amount with toDecimalString', () => {
		fc.assert(
			fc.property(
				fc.integer({ min: 0, max: Number.MAX_SAFE_INTEGER }),
				fc.constantFrom('EUR', 'JPY', 'KWD'),
				(minor, currency) => {
					expect(parseMoney(toDecimalString(minor, currency), currency)).toEqual({ ok: true, value: minor });
				}
			)
		);
	});
});

describe('the edges of the money helpers', () => {
	it('knows every currency Stripe lists as zero-decimal and as three-decimal, and its special case ISK', () => {
		// Stripe docs, "Supported currencies": the zero-decimal list, the three-decimal list (amounts
		// rounded to the nearest ten) and ISK, two-decimal in the API in steps of 100.
		for (const code of [
			'BIF',
			'CLP',
			'DJF',
			'GNF',
			'JPY',
			'KMF',
			'KRW',
			'MGA',
			'PYG',
			'RWF',
			'UGX',
			'VND',
			'VUV',
			'XAF',
			'XOF',
			'XPF'
		]) {
			expect(stripeCurrencyRule(code), code).toEqual({ digits: 0, step: 1 });
		}
		for (const code of ['BHD', 'JOD', 'KWD', 'OMR', 'TND'])
			expect(stripeCurrencyRule(code), code).toEqual({ digits: 3, step: 10 });
		expect(stripeCurrencyRule('isk')).toEqual({ digits: 2, step: 100 });
		expect(stripeCurrencyRule('EUR')).toEqual({ digits: 2, step: 1 });
	});

	it('writes zero without a sign, and refuses a fraction of a minor unit or an unknown code', () => {
		expect(toDecimalString(0, 'EUR')).toBe('0.00');
		expect(toDecimalString(-1, 'EUR')).toBe('-0.01');
		expect(() => toDecimalString(1.5, 'EUR')).toThrow('amount must be a safe integer, got 1.5');
		expect(() => assertInteger(0.5)).toThrow(RangeError);
		expect(() => assertInteger(2 ** 53)).toThrow(RangeError);
		expect(() => minorUnits('XYZ')).toThrow('Unknown ISO 4217 currency code: XYZ');
	});

	it('refuses a division by zero and a step that is not positive', () => {
		expect(() => mulDivRoundHalfUp(1, 1, 0)).toThrow('division by zero');
		for (const step of [0, -10]) {
			expect(() => roundHalfUpToMultiple(5124, step)).toThrow('step must be positive');
			expect(() => ceilToMultiple(6150, step)).toThrow('step must be positive');
		}
	});

	it('writes negative and small basis points as percent text', () => {
		expect(basisPointsToPercent(-2550)).toBe('-25.5');
		expect(basisPointsToPercent(5)).toBe('0.05');
		expect(basisPointsToPercent(-5)).toBe('-0.05');
	});

	it('reads a leading point, trailing zeros beyond the digits, and the largest safe integer exactly', () => {
		expect(parseScaledDecimal('.25', 2)).toEqual({ ok: true, value: 25 });
		expect(parseScaledDecimal('.5x', 2)).toEqual({ ok: false, reason: 'format' });
		expect(parseScaledDecimal('1.5000', 2)).toEqual({ ok: true, value: 150 });
		expect(parseScaledDecimal('9007199254740991', 0)).toEqual({ ok: true, value: Number.MAX_SAFE_INTEGER });
		expect(parseScaledDecimal('9007199254740992', 0)).toEqual({ ok: false, reason: 'too-large' });
	});

	it('takes a percent sign only at the end, with or without a space before it', () => {
		expect(parsePercentToBasisPoints('25.5%')).toEqual({ ok: true, value: 2550 });
		expect(parsePercentToBasisPoints('25.5 %')).toEqual({ ok: true, value: 2550 });
		expect(parsePercentToBasisPoints('2%5')).toEqual({ ok: false, reason: 'format' });
	});
});

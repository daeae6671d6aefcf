import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Decimal from 'decimal.js';
import { en16931Violations, lineNet, summariseCharges, vatOf, type ChargeItem } from './vat';

const item = (key: string, amount: number, vatRateBp: number): ChargeItem => ({
	key,
	kind: 'gear',
	label: key,
	amount,
	vatRateBp
});

describe('VAT and totals (source: EN 16931-1 business rules, CEN validation artefacts)', () => {
	it('worked check: base 183.23 at 6 % gives VAT 10.99 (BR-CO-17)', () => {
		// 183.23 × 6 / 100 = 10.9938 → 10.99.
		const t = summariseCharges([item('a', 18323, 600)], 'EUR', false);
		expect(t.vat).toEqual([{ ratePercent: '6', rateBp: 600, base: 18323, amount: 1099 }]);
		expect(t.gross).toBe(19422); // BR-CO-15: 183.23 + 10.99
		expect(en16931Violations(t)).toEqual([]);
	});

	it('groups VAT per rate on the sum of line nets, not per line (BR-CO-17, BR-CO-14)', () => {
		// Three lines of 0.10 at 25.5 %: per line 0.0255 → 0.03 each would make 0.09; per rate
		// 0.30 × 25.5 % = 0.0765 → 0.08. Plus one line 10.00 at 14 %: 1.40.
		const t = summariseCharges(
			[item('a', 10, 2550), item('b', 10, 2550), item('c', 10, 2550), item('d', 1000, 1400)],
			'EUR',
			false
		);
		expect(t.vat).toEqual([
			{ ratePercent: '25.5', rateBp: 2550, base: 30, amount: 8 },
			{ ratePercent: '14', rateBp: 1400, base: 1000, amount: 140 }
		]);
		expect(t.vatTotal).toBe(148);
		expect(t.total).toBe(1178);
		expect(en16931Violations(t)).toEqual([]);
	});

	it('keeps the advertised gross with an explicit rounding amount when prices include VAT (BT-114)', () => {
		// Three items of 0.01 incl. 25.5 %: each net 0.01 / 1.255 = 0.00797 → 0.01; Σ nets 0.03;
		// VAT 0.03 × 25.5 % = 0.00765 → 0.01; gross 0.04 ≠ advertised 0.03 → rounding −0.01;
		// amount due 0.04 − 0.01 = 0.03 (BR-CO-16).
		const t = summariseCharges([item('a', 1, 2550), item('b', 1, 2550), item('c', 1, 2550)], 'EUR', true);
		expect(t).toMatchObject({ net: 3, vatTotal: 1, gross: 4, rounding: -1, total: 3 });
		expect(en16931Violations(t)).toEqual([]);
	});

	it('takes line nets half-up: 80.00 incl. 25.5 % → 63.745… → 63.75', () => {
		expect(lineNet(8000, 2550, true)).toBe(6375);
		expect(lineNet(8000, 2550, false)).toBe(8000);
	});

	it('reports each broken rule', () => {
		const good = summariseCharges([item('a', 20500, 2550)], 'EUR', true);
		expect(en16931Violations({ ...good, net: good.net + 1 })).toContain('BR-CO-10');
		expect(en16931Violations({ ...good, vatTotal: good.vatTotal + 1 })).toContain('BR-CO-14');
		expect(en16931Violations({ ...good, gross: good.gross + 1 })).toContain('BR-CO-15');
		expect(en16931Violations({ ...good, total: good.total + 1 })).toContain('BR-CO-16');
		const vat = good.vat.map((g) => ({ ...g, amount: g.amount + 1 }));
		expect(en16931Violations({ ...good, vat })).toContain('BR-CO-17 (25.5 %)');
		expect(en16931Violations({ ...good, rounding: 0.5 })).toContain('BR-DEC: amounts in whole minor units');
	});

	it('rounds VAT exactly like decimal.js ROUND_HALF_UP to 2 decimals (property)', () => {
		fc.assert(
			fc.property(fc.integer({ min: 0, max: 10_000_000_000 }), fc.integer({ min: 0, max: 5000 }), (base, bp) => {
				const expected = new Decimal(base).div(100).mul(bp).div(10_000).toDecimalPlaces(2, Decimal.ROUND_HALF_UP);
				expect(vatOf(base, bp)).toBe(expected.mul(100).toNumber());
			}),
			{ numRuns: 500 }
		);
	});

	it('satisfies BR-CO-10/13/14/15/16/17 for any lines and rates, incl. or excl. VAT (property)', () => {
		const items = fc.array(
			fc.record({ amount: fc.integer({ min: 0, max: 5_000_000 }), vatRateBp: fc.constantFrom(0, 550, 1000, 1400, 2400, 2550) }),
			{ minLength: 1, maxLength: 12 }
		);
		fc.assert(
			fc.property(items, fc.boolean(), (list, includes) => {
				const t = summariseCharges(
					list.map((l, i) => item(`l${i}`, l.amount, l.vatRateBp)),
					'EUR',
					includes
				);
				expect(en16931Violations(t)).toEqual([]);
				// Rounding stays within half a cent per line plus half a cent per rate.
				expect(Math.abs(t.rounding)).toBeLessThanOrEqual(list.length + t.vat.length);
			}),
			{ numRuns: 300 }
		);
	});
});

describe('each EN 16931 rule the totals check names, found on its own', () => {
	const incl = () => summariseCharges([item('a', 20500, 1000), item('b', 4500, 2550), item('c', 2250, 1400)], 'EUR', true);
	const excl = () => summariseCharges([item('a', 18323, 600)], 'EUR', false);

	it('gives the VAT groups highest rate first, whatever order the lines come in', () => {
		expect(incl().vat.map((g) => g.rateBp)).toEqual([2550, 1400, 1000]);
		expect(en16931Violations(incl())).toEqual([]);
	});

	it('BR-DEC: a line amount that is not whole minor units', () => {
		const t = excl();
		expect(en16931Violations({ ...t, lines: [{ ...t.lines[0]!, amount: 18323.5 }] })).toEqual([
			'BR-DEC: amounts in whole minor units'
		]);
	});

	it('BR-27: a negative item price, as the amount or as the unit price', () => {
		const t = excl();
		expect(en16931Violations({ ...t, lines: [{ ...t.lines[0]!, unitAmount: -1 }] })).toEqual(['BR-27: no negative item price']);
		expect(en16931Violations({ ...t, lines: [{ ...t.lines[0]!, amount: -18323 }] })).toEqual(['BR-27: no negative item price']);
	});

	it('BR-CO-13 and BR-S-08: VAT bases that do not cover the lines', () => {
		const t = incl();
		const [first, ...rest] = t.vat;
		const broken = en16931Violations({ ...t, vat: [{ ...first!, base: first!.base + 1 }, ...rest] });
		expect(broken).toContain('BR-CO-13');
		expect(broken).toContain('BR-S-08 (25.5 %)');
	});

	it('the advertised total with VAT included, and no rounding without it', () => {
		const t = incl();
		// Total and rounding moved together keep BR-CO-16; only the advertised sum breaks.
		expect(en16931Violations({ ...t, total: t.total + 1, rounding: t.rounding + 1 })).toEqual([
			'advertised gross: total = sum of the gross line amounts'
		]);
		const e = excl();
		expect(en16931Violations({ ...e, total: e.total + 1, rounding: 1 })).toEqual(['no rounding when prices exclude VAT']);
	});
});

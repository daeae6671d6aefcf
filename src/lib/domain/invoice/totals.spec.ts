/**
 * Invoice totals against EN 16931-1 (business rules as published with the CEN validation
 * artefacts, github.com/ConnectingEurope/eInvoicing-EN16931), on the demo studio of PRODUCT.md
 * (Hollow Pine Studio, EUR, prices include VAT at 25.5 %). Amounts in cents.
 * Calendar: 2027-03-02 is a Tuesday.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Decimal from 'decimal.js';
import { DEMO_POLICY } from '../demo';
import { overtimeCharge, quoteBooking } from '../pricing';
import { at, LIVE_ROOM, noHolidays } from '../pricing/spec-fixtures';
import {
	documentTotals,
	documentViolations,
	grossByRate,
	linesFromPriceLines,
	lumpSumLines,
	payableTotal,
	splitByWeights,
	type DocumentLineInput
} from './totals';

const EUR = { currency: 'EUR', amountsIncludeVat: true } as const;

/** Tuesday 10:00–15:00 in the live room: a half day + 1 h = 205.00 (PRODUCT.md rates). */
const fiveHours = () =>
	quoteBooking({
		start: at('2027-03-02', '10:00'),
		end: at('2027-03-02', '15:00'),
		room: LIVE_ROOM,
		engineer: false,
		gear: [],
		policy: DEMO_POLICY,
		holidays: noHolidays
	});

const line = (amount: number, vatRateBp = 2550, extra: Partial<DocumentLineInput> = {}): DocumentLineInput => ({
	key: `l${amount}`,
	kind: 'room',
	description: 'Room time',
	quantity: '1',
	unitCode: 'C62',
	unitAmount: amount,
	amount,
	vatRateBp,
	...extra
});

describe('BR-CO rules on a final invoice built from a quote', () => {
	it('has exactly the quote’s nets, VAT, gross and rounding (invoice gross = quoted gross)', () => {
		const q = fiveHours();
		const t = documentTotals(linesFromPriceLines(q.lines), { ...EUR, prepaid: q.deposit });
		expect(documentViolations(t)).toEqual([]);
		expect(t.lines.map((l) => l.net)).toEqual(q.lines.map((l) => l.net));
		expect(t.lineNetTotal).toBe(q.net);
		expect(t.vat).toEqual(q.vat);
		expect(t.vatTotal).toBe(q.vatTotal);
		expect(t.gross).toBe(q.gross);
		expect(t.rounding).toBe(q.rounding); // BT-114 carried from the quote
		expect(payableTotal(t)).toBe(q.total);
	});

	it('worked example: 160.00 + 45.00 incl. 25.5 % VAT, 62.00 paid on account', () => {
		const q = fiveHours();
		expect(q.total).toBe(20500);
		expect(q.deposit).toBe(6200); // 30 % of 205.00 = 61.50, rounded up to whole euros
		const t = documentTotals(linesFromPriceLines(q.lines), { ...EUR, prepaid: q.deposit });
		// BT-131: 160.00 / 1.255 = 127.490… → 127.49; 45.00 / 1.255 = 35.856… → 35.86
		expect(t.lines.map((l) => l.net)).toEqual([12749, 3586]);
		expect(t.lineNetTotal).toBe(16335); // BR-CO-10: BT-106 = Σ BT-131
		expect(t.taxable).toBe(16335); // BR-CO-13: BT-109 = BT-106 − 0 + 0
		expect(t.vat).toEqual([{ ratePercent: '25.5', rateBp: 2550, base: 16335, amount: 4165 }]); // BR-CO-17: 163.35 × 25.5 % = 41.654… → 41.65
		expect(t.vatTotal).toBe(4165); // BR-CO-14
		expect(t.gross).toBe(20500); // BR-CO-15: 163.35 + 41.65
		expect(t.rounding).toBe(0);
		expect(t.amountDue).toBe(14300); // BR-CO-16: 205.00 − 62.00 + 0
	});

	it('adds overtime lines and shows the cent of rounding as BT-114 (BR-CO-16)', () => {
		const q = fiveHours();
		// 20 minutes past 15:00: two started 15-minute increments at 45.00/h = 22.50 (PRODUCT.md).
		const ot = overtimeCharge({
			bookedEnd: at('2027-03-02', '15:00'),
			actualEnd: at('2027-03-02', '15:20'),
			room: LIVE_ROOM,
			engineer: false,
			policy: DEMO_POLICY,
			holidays: noHolidays
		});
		expect(ot.total).toBe(2250);
		const t = documentTotals(linesFromPriceLines([...q.lines, ...ot.lines]), { ...EUR, prepaid: 6200 });
		expect(documentViolations(t)).toEqual([]);
		// 22.50 / 1.255 = 17.928… → 17.93; Σ 181.28; VAT 181.28 × 25.5 % = 46.2264 → 46.23;
		// gross 227.51 against the advertised 227.50: rounding −0.01.
		expect(t.lineNetTotal).toBe(18128);
		expect(t.vatTotal).toBe(4623);
		expect(t.gross).toBe(22751);
		expect(t.rounding).toBe(-1);
		expect(payableTotal(t)).toBe(22750);
		expect(t.amountDue).toBe(22751 - 6200 - 1); // BR-CO-16 = 165.50
		const overtime = t.lines.find((l) => l.kind === 'overtime')!;
		expect(overtime.quantity).toBe('0.5');
		expect(overtime.unitCode).toBe('HUR');
		expect(overtime.unitPriceNet).toBe(3586); // Article 226(8): 45.00 excl. VAT = 35.86
	});

	it('BR-CO-17 worked check from the references: base 183.23 at 6 % gives VAT 10.99', () => {
		const t = documentTotals([line(18323, 600)], { currency: 'EUR', amountsIncludeVat: false });
		expect(t.vat[0]!.amount).toBe(1099);
		expect(t.rounding).toBe(0);
		expect(documentViolations(t)).toEqual([]);
	});

	it('keeps one VAT group per rate, VAT per rate on the sum of its lines (BR-CO-17, not per line)', () => {
		// Three lines of 0.05 excl. VAT at 25.5 %: per line VAT would be 3 × 0.01 = 0.03, on the sum 0.0383 → 0.04.
		const t = documentTotals([line(5), line(5), line(5), line(1000, 1400)], { currency: 'EUR', amountsIncludeVat: false });
		expect(t.vat).toEqual([
			{ ratePercent: '25.5', rateBp: 2550, base: 15, amount: 4 },
			{ ratePercent: '14', rateBp: 1400, base: 1000, amount: 140 }
		]);
		expect(documentViolations(t)).toEqual([]);
	});

	it('flags broken totals by rule name', () => {
		const good = documentTotals(linesFromPriceLines(fiveHours().lines), { ...EUR, prepaid: 6200 });
		expect(documentViolations({ ...good, lineNetTotal: good.lineNetTotal + 1 })).toContain('BR-CO-10');
		expect(documentViolations({ ...good, vatTotal: good.vatTotal + 1 })).toContain('BR-CO-14');
		expect(documentViolations({ ...good, gross: good.gross + 1 })).toContain('BR-CO-15');
		expect(documentViolations({ ...good, amountDue: good.amountDue + 1 })).toContain('BR-CO-16');
		expect(documentViolations({ ...good, vat: [{ ...good.vat[0]!, amount: 1 }] })).toContain('BR-CO-17 (25.5 %)');
		expect(documentViolations({ ...good, lines: [{ ...good.lines[0]!, unitPriceNet: -1 }, ...good.lines.slice(1)] })).toContain(
			'BR-27: no negative item net price'
		);
	});

	it('holds BR-CO-10/13/14/15/16/17 for any mix of lines and rates (property)', () => {
		const arbLine = fc.record({
			amount: fc.integer({ min: 0, max: 5_000_000 }),
			rate: fc.constantFrom(0, 1000, 1400, 2400, 2550)
		});
		fc.assert(
			fc.property(
				fc.array(arbLine, { minLength: 1, maxLength: 12 }),
				fc.boolean(),
				fc.integer({ min: 0, max: 100_000 }),
				(ls, incl, prepaid) => {
					const t = documentTotals(
						ls.map((l, i) => line(l.amount, l.rate, { key: `k${i}` })),
						{ currency: 'EUR', amountsIncludeVat: incl, prepaid }
					);
					expect(documentViolations(t)).toEqual([]);
					// BR-CO-17 cross-checked with decimal.js ROUND_HALF_UP on the cent values.
					for (const g of t.vat) {
						const expected = new Decimal(g.base).mul(g.rateBp).div(10_000).toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber();
						expect(g.amount).toBe(expected);
					}
				}
			)
		);
	});
});

describe('deposit invoices and credit notes (one amount incl. VAT, split by the supply’s rates)', () => {
	it('a deposit of 62.00 incl. 25.5 % VAT: net 49.40, VAT 12.60, paid on account, nothing due', () => {
		const q = fiveHours();
		const lines = lumpSumLines(q.deposit, 'deposit', 'Deposit for the live room on 2 March 2027', grossByRate(q.vat));
		expect(lines).toHaveLength(1);
		const t = documentTotals(lines, { ...EUR, prepaid: q.deposit });
		expect(documentViolations(t)).toEqual([]);
		expect(t.lineNetTotal).toBe(4940); // 62.00 / 1.255 = 49.402… → 49.40
		expect(t.vatTotal).toBe(1260); // 49.40 × 25.5 % = 12.597 → 12.60 (BR-CO-17)
		expect(payableTotal(t)).toBe(6200);
		expect(t.amountDue).toBe(0); // BR-CO-16: 62.00 − 62.00 paid + 0
	});

	it('a credit note keeps positive amounts (BR-27; UNTDID 1001 code 381 says they are credited)', () => {
		const lines = lumpSumLines(3100, 'refund', 'Refund of half the deposit', [{ rateBp: 2550, weight: 20500 }]);
		const t = documentTotals(lines, { ...EUR, prepaid: 3100 });
		expect(documentViolations(t)).toEqual([]);
		expect(t.lines.every((l) => l.amount > 0 && l.net > 0 && l.unitPriceNet > 0)).toBe(true);
		expect(t.vatTotal).toBeGreaterThan(0);
		expect(payableTotal(t)).toBe(3100);
	});

	it('splits across rates in proportion, parts always adding up (largest remainder)', () => {
		expect(
			splitByWeights(100, [
				{ rateBp: 2550, weight: 1 },
				{ rateBp: 1400, weight: 1 },
				{ rateBp: 1000, weight: 1 }
			])
		).toEqual([
			{ rateBp: 2550, amount: 34 },
			{ rateBp: 1400, amount: 33 },
			{ rateBp: 1000, amount: 33 }
		]);
		fc.assert(
			fc.property(
				fc.integer({ min: 1, max: 10_000_000 }),
				fc.array(fc.integer({ min: 1, max: 1_000_000 }), { minLength: 1, maxLength: 4 }),
				(amount, weights) => {
					const parts = splitByWeights(
						amount,
						weights.map((w, i) => ({ rateBp: 1000 + i, weight: w }))
					);
					expect(parts.reduce((s, p) => s + p.amount, 0)).toBe(amount);
				}
			)
		);
		expect(() => lumpSumLines(0, 'refund', 'nothing', [{ rateBp: 2550, weight: 1 }])).toThrow(RangeError);
	});
});

/**
 * Invoice totals against EN 16931-1 (business rules as published with the CEN validation
 * artefacts, github.com/ConnectingEurope/eInvoicing-EN16931), on the invented demo studio (src/lib/domain/demo.ts)
 * (Hollow Pine Studio, EUR, prices include VAT at 25.5 %). Amounts in cents.
 * Calendar: 2027-03-02 is a Tuesday.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Decimal from 'decimal.js';
import { DEMO_POLICY } from '../demo';
import { overtimeCharge, quoteBooking } from '../pricing';
import { at, CONTROL_ROOM, LIVE_ROOM, noHolidays, VOCAL_BOOTH } from '$fixtures/pricing';
import {
	documentTotals,
	documentViolations,
	grossByRate,
	linesFromPriceLines,
	lumpSumLines,
	payableTotal,
	splitByWeights,
	type DocumentLine,
	type DocumentLineInput
} from './totals';

const EUR = { currency: 'EUR', amountsIncludeVat: true } as const;

/** Tuesday 10:00–15:00 in the live room: a half day + 1 h = 205.00 at the demo rates. */
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
	it('has the nets, VAT, gross and rounding worked out with decimal.js from the line amounts, and exactly the quote’s', () => {
		const bookings = [
			{ room: LIVE_ROOM, from: '10:00', to: '15:00', engineer: false },
			{ room: VOCAL_BOOTH, from: '09:00', to: '12:30', engineer: true },
			{ room: CONTROL_ROOM, from: '10:00', to: '19:45', engineer: true }
		];
		for (const b of bookings) {
			const q = quoteBooking({
				start: at('2027-03-02', b.from),
				end: at('2027-03-02', b.to),
				room: b.room,
				engineer: b.engineer,
				gear: [],
				policy: DEMO_POLICY,
				holidays: noHolidays
			});
			const t = documentTotals(linesFromPriceLines(q.lines), { ...EUR, prepaid: q.deposit });
			expect(documentViolations(t)).toEqual([]);
			// Independently: BT-131 = amount ÷ 1.255, BR-CO-17 VAT = base × 25.5 %, both half-up to cents.
			const rate = new Decimal(2550).div(10_000);
			const nets = q.lines.map((l) =>
				new Decimal(l.amount).div(rate.plus(1)).toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber()
			);
			const base = nets.reduce((a, n) => a + n, 0);
			const vat = new Decimal(base).mul(rate).toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber();
			const advertised = q.lines.reduce((a, l) => a + l.amount, 0);
			expect(t.lines.map((l) => l.net)).toEqual(nets);
			expect(t.lineNetTotal).toBe(base);
			expect(t.vat).toEqual([{ ratePercent: '25.5', rateBp: 2550, base, amount: vat }]);
			expect(t.vatTotal).toBe(vat);
			expect(t.gross).toBe(base + vat);
			expect(t.rounding).toBe(advertised - (base + vat)); // BT-114
			expect(t.amountDue).toBe(base + vat - q.deposit + t.rounding); // BR-CO-16
			// The invoice has exactly the quote’s figures (invoice gross = quoted gross).
			expect([t.lineNetTotal, t.vatTotal, t.gross, t.rounding, payableTotal(t)]).toEqual([
				q.net,
				q.vatTotal,
				q.gross,
				q.rounding,
				q.total
			]);
			expect(t.vat).toEqual(q.vat);
		}
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
		// 20 minutes past 15:00: two started 15-minute increments at 45.00/h = 22.50 (overtime.ts).
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

	it('names each rule a stored document can break, and only that rule', () => {
		const good = documentTotals(linesFromPriceLines(fiveHours().lines), { ...EUR, prepaid: 6200 });
		const [first, second] = good.lines as [DocumentLine, DocumentLine];
		const group = good.vat[0]!;
		expect(documentViolations(good)).toEqual([]);
		expect(documentViolations({ ...good, prepaid: 6200.5, amountDue: good.amountDue - 0.5 })).toEqual([
			'BR-DEC: amounts in whole minor units'
		]);
		expect(documentViolations({ ...good, lines: [{ ...first, unitAmount: -1 }, second] })).toEqual([
			'BR-27: no negative item net price'
		]);
		expect(documentViolations({ ...good, lines: [{ ...first, quantity: '-1' }, second] })).toEqual([
			'BT-129: quantity is a non-negative decimal'
		]);
		expect(documentViolations({ ...good, lines: [{ ...first, quantity: '2.5' }, second] })).toEqual([]);
		expect(documentViolations({ ...good, lines: [{ ...first, quantity: '1,5' }, second] })).toEqual([
			'BT-129: quantity is a non-negative decimal'
		]);
		// BT-109 off by a cent: neither BT-106 − BT-107 + BT-108 nor the VAT bases, nor BT-112.
		expect(documentViolations({ ...good, taxable: good.taxable + 1 })).toEqual([
			'BR-CO-13',
			'BR-CO-13 (VAT bases cover the taxable total)',
			'BR-CO-15'
		]);
		// A VAT group for a rate no line uses; the only group at a rate no line has.
		expect(documentViolations({ ...good, vat: [group, { ratePercent: '14', rateBp: 1400, base: 0, amount: 0 }] })).toEqual([
			'BR-S-01/BR-CO-18: one VAT group per rate used'
		]);
		expect(documentViolations({ ...good, vat: [{ ...group, rateBp: 1400, ratePercent: '14', amount: 2287 }] })).toEqual([
			'BR-S-01/BR-CO-18: one VAT group per rate used',
			'BR-S-08 (14 %)',
			'BR-CO-14'
		]);
		// Nets said to be 163.36 (VAT 41.6568 → 41.66, all else consistent) while the lines add up to 163.35.
		expect(
			documentViolations({
				...good,
				taxable: 16336,
				lineNetTotal: 16336,
				vat: [{ ...group, base: 16336, amount: 4166 }],
				vatTotal: 4166,
				gross: 20502,
				amountDue: 14300,
				rounding: -2
			})
		).toEqual(['BR-CO-10', 'BR-S-08 (25.5 %)']);
		// What the customer was shown (Σ amounts incl. VAT) must be BT-112 + BT-114.
		expect(documentViolations({ ...good, rounding: 1, amountDue: good.amountDue + 1 })).toEqual([
			'advertised total: BT-112 + BT-114 = Σ line amounts incl. VAT'
		]);
		const excl = documentTotals([line(10000, 2550)], { currency: 'EUR', amountsIncludeVat: false });
		expect(documentViolations(excl)).toEqual([]);
		expect(documentViolations({ ...excl, rounding: 1, amountDue: excl.amountDue + 1 })).toEqual([
			'no rounding amount when amounts exclude VAT'
		]);
		expect(documentViolations({ ...good, lines: [] })).toContain('BR-16: at least one invoice line');
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

	it('gives the spare cents to the largest remainders: 1.00 over 1 : 2 is 0.33 + 0.67, 10.00 over 1 : 2 : 4 is 1.43 + 2.86 + 5.71', () => {
		// 100 × 1/3 = 33.33…, 100 × 2/3 = 66.66…: floors 33 + 66, the spare cent to the larger remainder (2/3 > 1/3).
		expect(
			splitByWeights(100, [
				{ rateBp: 2550, weight: 1 },
				{ rateBp: 1400, weight: 2 }
			])
		).toEqual([
			{ rateBp: 2550, amount: 33 },
			{ rateBp: 1400, amount: 67 }
		]);
		// 1000 × 1/7 = 142.857…, × 2/7 = 285.714…, × 4/7 = 571.428…: floors 998, two cents to the remainders 6/7 and 5/7.
		expect(
			splitByWeights(1000, [
				{ rateBp: 2550, weight: 1 },
				{ rateBp: 1400, weight: 2 },
				{ rateBp: 1000, weight: 4 }
			]).map((p) => p.amount)
		).toEqual([143, 286, 571]);
		// Equal remainders: the rate listed first gets the cent; a part of nothing is left out.
		expect(
			splitByWeights(1, [
				{ rateBp: 2550, weight: 5 },
				{ rateBp: 2400, weight: 5 }
			])
		).toEqual([{ rateBp: 2550, amount: 1 }]);
		expect(
			splitByWeights(1, [
				{ rateBp: 2400, weight: 5 },
				{ rateBp: 2550, weight: 5 }
			])
		).toEqual([{ rateBp: 2400, amount: 1 }]);
		// Weights of zero take no part.
		expect(
			splitByWeights(500, [
				{ rateBp: 2550, weight: 0 },
				{ rateBp: 1400, weight: 3 }
			])
		).toEqual([{ rateBp: 1400, amount: 500 }]);
		expect(() => splitByWeights(500, [{ rateBp: 2550, weight: 0 }])).toThrow(RangeError);
	});

	it('a deposit of 69.00 on a supply of 205.00 at 24 % and 22.50 at 25.5 %: 62.18 + 6.82, each with its own VAT', () => {
		// The weights are the gross per rate: 165.32 + 39.68 = 205.00 at 24 %, 17.93 + 4.57 = 22.50 at 25.5 %.
		const weights = grossByRate([
			{ rateBp: 2550, base: 1793, amount: 457 },
			{ rateBp: 2400, base: 16532, amount: 3968 }
		]);
		expect(weights).toEqual([
			{ rateBp: 2550, weight: 2250 },
			{ rateBp: 2400, weight: 20500 }
		]);
		// 69.00 × 22.50/227.50 = 6.824…, × 205.00/227.50 = 62.175…: floors 6.82 + 62.17, the cent to 62.17 (remainder 0.58 > 0.42).
		const lines = lumpSumLines(6900, 'deposit', 'Deposit', weights);
		expect(lines.map((l) => [l.key, l.amount, l.description])).toEqual([
			['deposit:2550', 682, 'Deposit (VAT 25.5 % part)'],
			['deposit:2400', 6218, 'Deposit (VAT 24 % part)']
		]);
		const t = documentTotals(lines, { ...EUR, prepaid: 6900 });
		expect(documentViolations(t)).toEqual([]);
		// 6.82 / 1.255 = 5.434… → 5.43, VAT 5.43 × 25.5 % = 1.38465 → 1.38 (6.81 with VAT);
		// 62.18 / 1.24 = 50.145… → 50.15, VAT 50.15 × 24 % = 12.036 → 12.04 (62.19 with VAT): 69.00 in all, no rounding.
		expect(t.vat).toEqual([
			{ ratePercent: '25.5', rateBp: 2550, base: 543, amount: 138 },
			{ ratePercent: '24', rateBp: 2400, base: 5015, amount: 1204 }
		]);
		expect(t.gross).toBe(6900);
		expect(t.rounding).toBe(0);
		expect(t.amountDue).toBe(0);
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

describe('the edges of the totals, the rule checks and the lump-sum lines', () => {
	const valid = () =>
		documentTotals([line(20500), line(4000, 1000, { quantity: '12' }), line(2250, 1400, { quantity: '1.25' })], EUR);

	it('gives the VAT groups highest rate first (BG-23), whatever order the lines come in', () => {
		expect(valid().vat.map((g) => g.rateBp)).toEqual([2550, 1400, 1000]);
	});

	it('holds BR-CO-13 with allowances and charges at document level: taxable = Σ line nets − allowances + charges', () => {
		const t = valid();
		expect(documentViolations(t)).toEqual([]);
		// 1.00 allowed and 1.00 charged leave the taxable amount as it is.
		expect(documentViolations({ ...t, allowances: 100, charges: 100 })).toEqual([]);
		expect(documentViolations({ ...t, charges: 100 })).toContain('BR-CO-13');
	});

	it('finds a line amount that is not whole minor units (BR-DEC)', () => {
		const t = valid();
		const [first, ...rest] = t.lines;
		expect(documentViolations({ ...t, lines: [{ ...first!, unitAmount: 20500.5 }, ...rest] })).toEqual([
			'BR-DEC: amounts in whole minor units'
		]);
	});

	it('finds a VAT group for a rate no line uses, also when the number of groups is right', () => {
		const t = valid();
		const wrong = t.vat.map((g) => (g.rateBp === 1000 ? { ...g, rateBp: 2400, ratePercent: '24' } : g));
		expect(documentViolations({ ...t, vat: wrong })).toContain('BR-S-01/BR-CO-18: one VAT group per rate used');
		// …and a rate in use that has no group of its own.
		const missing = t.vat.filter((g) => g.rateBp !== 1000);
		expect(documentViolations({ ...t, vat: missing })).toContain('BR-S-01/BR-CO-18: one VAT group per rate used');
	});

	it('makes a priced line without a unit price one unit (UN/ECE Recommendation 20 code C62, "one") of its amount', () => {
		const lines = linesFromPriceLines([
			{ key: 'a', kind: 'room', label: 'Surcharge', amount: 1500, vatRateBp: 2550 },
			{ key: 'b', kind: 'room', label: 'Quantity only', quantity: '2', amount: 9000, vatRateBp: 2550 },
			{ key: 'c', kind: 'room', label: 'Hours', quantity: '2', unitAmount: 4500, amount: 9000, vatRateBp: 2550 },
			{ key: 'd', kind: 'room', label: 'Unit price only', unitAmount: 4500, amount: 9000, vatRateBp: 2550 }
		]);
		expect(lines.map((l) => [l.quantity, l.unitCode, l.unitAmount])).toEqual([
			['1', 'C62', 1500],
			['1', 'C62', 9000],
			['2', 'C62', 4500],
			['1', 'C62', 9000]
		]);
	});

	it('splits nothing against weights of zero or less, and says so', () => {
		expect(
			splitByWeights(10_000, [
				{ rateBp: 2550, weight: 300 },
				{ rateBp: 1000, weight: -100 }
			])
		).toEqual([{ rateBp: 2550, amount: 10_000 }]);
		expect(() => splitByWeights(100, [{ rateBp: 2550, weight: 0 }])).toThrow('nothing to split against');
		expect(() => lumpSumLines(0, 'deposit', 'Deposit', [{ rateBp: 2550, weight: 100 }])).toThrow(
			'the amount must be a positive integer'
		);
	});

	it('names a lump sum plainly when it has one rate, as one unit', () => {
		expect(lumpSumLines(6200, 'deposit', 'Deposit received', [{ rateBp: 2550, weight: 20500 }])).toEqual([
			{
				key: 'deposit:2550',
				kind: 'deposit',
				description: 'Deposit received',
				quantity: '1',
				unitCode: 'C62',
				unitAmount: 6200,
				amount: 6200,
				vatRateBp: 2550
			}
		]);
	});
});

describe('reverse-charged documents (VAT category AE; EN 16931 BR-AE-01, -05, -08, -09)', () => {
	const reverse = () =>
		quoteBooking({
			start: at('2027-03-02', '10:00'),
			end: at('2027-03-02', '15:00'),
			room: LIVE_ROOM,
			engineer: false,
			gear: [],
			policy: DEMO_POLICY,
			holidays: noHolidays,
			vatTreatment: 'reverse-charge'
		});

	it('a final invoice from a reverse-charged quote has the quote’s nets, one AE group and no VAT', () => {
		const q = reverse();
		const t = documentTotals(linesFromPriceLines(q.lines), {
			currency: 'EUR',
			amountsIncludeVat: q.pricesIncludeVat,
			prepaid: q.deposit,
			vatCategory: 'AE'
		});
		expect(t.vat).toEqual([{ ratePercent: '0', rateBp: 0, base: 16335, amount: 0, category: 'AE' }]);
		expect([t.gross, t.vatTotal, t.amountDue]).toEqual([16335, 0, 16335 - q.deposit]);
		expect(documentViolations(t)).toEqual([]);
	});

	it('a deposit on account of it is one AE line at 0 %', () => {
		const q = reverse();
		const t = documentTotals(lumpSumLines(q.deposit, 'deposit', 'Deposit', grossByRate(q.vat)), {
			...EUR,
			prepaid: q.deposit,
			vatCategory: 'AE'
		});
		expect(t.lines.map((l) => [l.vatRateBp, l.net])).toEqual([[0, q.deposit]]);
		expect(documentViolations(t)).toEqual([]);
	});

	it('finds a reverse-charged document with a rate, with VAT, or beside another group', () => {
		const t = documentTotals([line(5000, 0)], { ...EUR, vatCategory: 'AE' });
		expect(documentViolations({ ...t, lines: t.lines.map((l) => ({ ...l, vatRateBp: 2550 })) })).toContain('BR-AE-05');
		expect(documentViolations({ ...t, vat: t.vat.map((g) => ({ ...g, amount: 1 })) })).toContain('BR-AE-09');
		const mixed = documentTotals([line(5000, 0), line(1000, 2550)], { ...EUR, vatCategory: 'AE' });
		expect(documentViolations(mixed)).toEqual(expect.arrayContaining(['BR-AE-01', 'BR-AE-05', 'BR-AE-09']));
	});
});

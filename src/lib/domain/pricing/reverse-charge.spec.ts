// Reverse charge in the pricing engine (../vat-treatment.ts): lines at 0 %, one VAT group of
// category AE (EN 16931 BR-AE-01, -05, -09), and, with a rate card incl. VAT, the buyer pays each
// line's net. Checked against an independent computation in decimal.js: net = amount ÷ (1 + rate)
// rounded half-up to the cent, per line.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Decimal from 'decimal.js';
import { quoteBooking } from './quote';
import { overtimeCharge } from './overtime';
import { en16931Violations } from './vat';
import { LIVE_ROOM, at, openAllHours, policyWith } from '$fixtures/pricing';

const netOf = (amount: number, rateBp: number) =>
	new Decimal(amount)
		.div(new Decimal(1).plus(new Decimal(rateBp).div(10_000)))
		.toDecimalPlaces(0, Decimal.ROUND_HALF_UP)
		.toNumber();

describe('a reverse-charged quote', () => {
	it('worked example: live room 10:00–15:00 incl. 25.5 % VAT costs the nets, 127.49 + 35.86 = 163.35', () => {
		const input = {
			start: at('2027-03-02', '10:00'),
			end: at('2027-03-02', '15:00'),
			room: LIVE_ROOM,
			engineer: false,
			gear: []
		};
		const standard = quoteBooking({ ...input, policy: policyWith() });
		const reverse = quoteBooking({ ...input, policy: policyWith(), vatTreatment: 'reverse-charge' });
		expect(standard.total).toBe(20500);
		expect(reverse.lines.map((l) => [l.amount, l.vatRateBp])).toEqual([
			[12749, 0],
			[3586, 0]
		]);
		expect(reverse.vat).toEqual([{ ratePercent: '0', rateBp: 0, base: 16335, amount: 0, category: 'AE' }]);
		expect([reverse.net, reverse.vatTotal, reverse.gross, reverse.rounding, reverse.total]).toEqual([16335, 0, 16335, 0, 16335]);
		expect(reverse.total).toBe(standard.net);
		expect(reverse.vatTreatment).toBe('reverse-charge');
		expect(standard.vatTreatment).toBe('standard');
		expect(reverse.deposit + reverse.balance).toBe(reverse.total);
		expect(en16931Violations(reverse)).toEqual([]);
	});

	it('with a rate card before VAT keeps the amounts and drops the VAT', () => {
		const input = {
			start: at('2027-03-02', '10:00'),
			end: at('2027-03-02', '14:00'),
			room: LIVE_ROOM,
			engineer: false,
			gear: []
		};
		const policy = policyWith({ pricesIncludeVat: false });
		const reverse = quoteBooking({ ...input, policy, vatTreatment: 'reverse-charge' });
		expect(reverse.total).toBe(quoteBooking({ ...input, policy }).net);
		expect(reverse.lines.every((l) => l.vatRateBp === 0)).toBe(true);
	});

	it('overtime of a reverse-charged booking carries no VAT either', () => {
		const o = overtimeCharge({
			bookedEnd: at('2027-03-02', '15:00'),
			actualEnd: at('2027-03-02', '15:20'),
			room: LIVE_ROOM,
			engineer: false,
			policy: policyWith(),
			vatTreatment: 'reverse-charge'
		});
		// 22.50 incl. 25.5 %: net 17.93.
		expect([o.total, o.vatTotal, o.vat[0]?.category]).toEqual([1793, 0, 'AE']);
	});

	it('for any booking, rate and VAT setting: each line costs its net (decimal.js), the total is the standard net, EN 16931 holds', () => {
		fc.assert(
			fc.property(
				fc.constantFrom(0, 550, 1000, 1400, 2400, 2550, 2700),
				fc.boolean(),
				fc.integer({ min: 0, max: 365 * 96 }),
				fc.integer({ min: 1, max: 96 }),
				fc.boolean(),
				(vatRateBp, pricesIncludeVat, q, quarters, engineer) => {
					const policy = openAllHours({ vatRateBp, pricesIncludeVat });
					const start = new Date(Date.UTC(2027, 0, 1) + q * 15 * 60_000);
					const input = {
						start,
						end: new Date(start.getTime() + quarters * 15 * 60_000),
						room: LIVE_ROOM,
						engineer,
						gear: [],
						policy
					};
					const standard = quoteBooking(input);
					const reverse = quoteBooking({ ...input, vatTreatment: 'reverse-charge' });
					expect(reverse.lines.map((l) => l.amount)).toEqual(
						standard.lines.map((l) => (pricesIncludeVat ? netOf(l.amount, l.vatRateBp) : l.amount))
					);
					expect(reverse.total).toBe(standard.net);
					expect(reverse.vatTotal).toBe(0);
					expect(en16931Violations(reverse)).toEqual([]);
				}
			),
			{ numRuns: 200 }
		);
	});

	it('the check finds a reverse-charged quote with VAT in it (BR-AE-05, BR-AE-09) or beside another group (BR-AE-01)', () => {
		const input = {
			start: at('2027-03-02', '10:00'),
			end: at('2027-03-02', '15:00'),
			room: LIVE_ROOM,
			engineer: false,
			gear: []
		};
		const q = quoteBooking({ ...input, policy: policyWith(), vatTreatment: 'reverse-charge' });
		expect(en16931Violations({ ...q, lines: q.lines.map((l) => ({ ...l, vatRateBp: 2550 })) })).toContain('BR-AE-05');
		expect(
			en16931Violations({
				...q,
				vat: q.vat.map((g) => ({ ...g, amount: 1 })),
				vatTotal: 1,
				gross: q.gross + 1,
				total: q.total + 1
			})
		).toContain('BR-AE-09');
		expect(en16931Violations({ ...q, vat: [...q.vat, { ratePercent: '10', rateBp: 1000, base: 0, amount: 0 }] })).toContain(
			'BR-AE-01'
		);
	});
});

// The month's VAT by rate. Directive 2006/112/EC: Article 65 (VAT chargeable on a payment on
// account when it is received), Article 90 (the taxable amount is reduced by what is refunded).
import { describe, expect, it } from 'vitest';
import { vatLedger } from './ledger';

describe('VAT by rate for a month', () => {
	const deposit = { typeCode: 386, vat: [{ rateBp: 2550, base: 4940, amount: 1260 }] };
	const final = {
		typeCode: 380,
		vat: [{ rateBp: 2550, base: 18128, amount: 4623 }],
		prepaidVat: [{ rateBp: 2550, base: 4940, amount: 1260 }]
	};
	const credit = { typeCode: 381, vat: [{ rateBp: 2550, base: 2470, amount: 630 }] };

	it('counts a deposit invoice in full (Article 65)', () => {
		expect(vatLedger([deposit])).toEqual([{ category: 'S', rateBp: 2550, ratePercent: '25.5', base: 4940, vat: 1260 }]);
	});

	it('takes the deposit’s VAT off the final invoice, so nothing is declared twice', () => {
		expect(vatLedger([final])).toEqual([{ category: 'S', rateBp: 2550, ratePercent: '25.5', base: 13188, vat: 3363 }]);
		// Over the two months together: exactly the VAT of the whole supply.
		const both = vatLedger([deposit, final]);
		expect(both).toEqual([{ category: 'S', rateBp: 2550, ratePercent: '25.5', base: 18128, vat: 4623 }]);
	});

	it('counts a credit note negatively (Article 90)', () => {
		expect(vatLedger([deposit, credit])).toEqual([{ category: 'S', rateBp: 2550, ratePercent: '25.5', base: 2470, vat: 630 }]);
		expect(vatLedger([])).toEqual([]);
	});
});

describe('VAT by rate: which documents deduct a deposit, and the order of the rates', () => {
	it('deducts prepaid VAT on a final invoice only, and a final invoice with no deposit counts in full', () => {
		const prepaidVat = [{ rateBp: 2550, base: 4940, amount: 1260 }];
		// A credit note or a deposit invoice that carried a deposit's breakdown by mistake deducts nothing.
		const credit = { typeCode: 381, vat: [{ rateBp: 2550, base: 2470, amount: 630 }], prepaidVat };
		const deposit = { typeCode: 386, vat: [{ rateBp: 2550, base: 4940, amount: 1260 }], prepaidVat };
		expect(vatLedger([credit])).toEqual([{ category: 'S', rateBp: 2550, ratePercent: '25.5', base: -2470, vat: -630 }]);
		expect(vatLedger([deposit])).toEqual([{ category: 'S', rateBp: 2550, ratePercent: '25.5', base: 4940, vat: 1260 }]);
		const noDeposit = { typeCode: 380, vat: [{ rateBp: 2550, base: 18128, amount: 4623 }] };
		expect(vatLedger([noDeposit])).toEqual([{ category: 'S', rateBp: 2550, ratePercent: '25.5', base: 18128, vat: 4623 }]);
	});

	it('lists the rates from the highest down, whatever order the documents bring them in', () => {
		const docs = [1000, 2550, 1400].map((rateBp) => ({ typeCode: 386, vat: [{ rateBp, base: 1000, amount: 100 }] }));
		expect(vatLedger(docs).map((r) => r.ratePercent)).toEqual(['25.5', '14', '10']);
	});
});

describe('VAT by category: reverse charge apart', () => {
	it('keeps reverse-charged supplies (AE) apart from zero-rated ones, and deducts an AE deposit from AE', () => {
		const zero = { typeCode: 380, vat: [{ rateBp: 0, base: 1000, amount: 0 }] };
		const aeDeposit = { typeCode: 386, vat: [{ rateBp: 0, base: 5000, amount: 0, category: 'AE' as const }] };
		const aeFinal = {
			typeCode: 380,
			vat: [{ rateBp: 0, base: 16335, amount: 0, category: 'AE' as const }],
			prepaidVat: [{ rateBp: 0, base: 5000, amount: 0, category: 'AE' as const }]
		};
		expect(vatLedger([aeFinal, zero, deposit(), aeDeposit])).toEqual([
			{ category: 'S', rateBp: 2550, ratePercent: '25.5', base: 4940, vat: 1260 },
			{ category: 'Z', rateBp: 0, ratePercent: '0', base: 1000, vat: 0 },
			{ category: 'AE', rateBp: 0, ratePercent: '0', base: 16335, vat: 0 }
		]);
	});
});

function deposit() {
	return { typeCode: 386, vat: [{ rateBp: 2550, base: 4940, amount: 1260 }] };
}

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
		expect(vatLedger([deposit])).toEqual([{ rateBp: 2550, ratePercent: '25.5', base: 4940, vat: 1260 }]);
	});

	it('takes the deposit’s VAT off the final invoice, so nothing is declared twice', () => {
		expect(vatLedger([final])).toEqual([{ rateBp: 2550, ratePercent: '25.5', base: 13188, vat: 3363 }]);
		// Over the two months together: exactly the VAT of the whole supply.
		const both = vatLedger([deposit, final]);
		expect(both).toEqual([{ rateBp: 2550, ratePercent: '25.5', base: 18128, vat: 4623 }]);
	});

	it('counts a credit note negatively (Article 90)', () => {
		expect(vatLedger([deposit, credit])).toEqual([{ rateBp: 2550, ratePercent: '25.5', base: 2470, vat: 630 }]);
		expect(vatLedger([])).toEqual([]);
	});
});

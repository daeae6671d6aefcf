// The booking page's "Record a payment" form (the owner): the amount as decimal text in the
// booking's currency, read exactly by $lib/domain/money (never a float), then handed to
// payments/recorded.ts as integer minor units, as the JSON API takes it.
import { z } from 'zod';
import { moneyText } from './fields';
import { dateText, multilineText } from './input';
import { NOTE_MAX, RECORDED_METHODS } from '$lib/domain/recorded-payments';

export function recordPaymentSchema(currency: string) {
	return z.object({
		amount: moneyText(currency),
		method: z.enum(RECORDED_METHODS, { error: 'Choose cash or bank transfer.' }).default('cash'),
		paidOn: dateText(),
		note: multilineText()
			.trim()
			.max(NOTE_MAX, { error: `Keep the note under ${NOTE_MAX} characters.` })
			.default('')
	});
}

export type RecordPaymentForm = z.infer<ReturnType<typeof recordPaymentSchema>>;

import { describe, expect, it } from 'vitest';
import { FormParseError, parseForm, stableStringify } from './form.js';
import { computeSignature, signatureHeader } from './signing.js';

// Bracket notation as Stripe's API reference writes it (e.g. `line_items[0][price_data][unit_amount]`)
// and as stripe-node's `stringifyRequestData` sends it (indexed arrays, unencoded brackets).
describe('parseForm', () => {
	it('builds nested objects and indexed arrays from bracket notation', () => {
		const body = new URLSearchParams([
			['mode', 'payment'],
			['line_items[0][price_data][currency]', 'eur'],
			['line_items[0][price_data][unit_amount]', '16000'],
			['line_items[0][price_data][product_data][name]', 'Live room, half day'],
			['line_items[0][quantity]', '1'],
			['line_items[1][price_data][product_data][name]', 'Engineer & gear'],
			['line_items[1][quantity]', '2'],
			['metadata[bookingId]', 'bk_42'],
			['payment_intent_data[metadata][bookingId]', 'bk_42']
		]).toString();
		expect(parseForm(body)).toEqual({
			mode: 'payment',
			line_items: [
				{
					price_data: {
						currency: 'eur',
						unit_amount: '16000',
						product_data: { name: 'Live room, half day' }
					},
					quantity: '1'
				},
				{ price_data: { product_data: { name: 'Engineer & gear' } }, quantity: '2' }
			],
			metadata: { bookingId: 'bk_42' },
			payment_intent_data: { metadata: { bookingId: 'bk_42' } }
		});
	});

	it('accepts [] pushes, indexed arrays out of order, unencoded brackets and + as space', () => {
		expect(parseForm('expand[]=payment_intent&expand[]=line_items')).toEqual({
			expand: ['payment_intent', 'line_items']
		});
		expect(parseForm('expand[1]=b&expand[0]=a')).toEqual({ expand: ['a', 'b'] });
		expect(parseForm('metadata[note]=two+words%21&metadata%5Bx%5D=%7BCHECKOUT_SESSION_ID%7D')).toEqual({
			metadata: { note: 'two words!', x: '{CHECKOUT_SESSION_ID}' }
		});
		expect(parseForm('flag&empty=')).toEqual({ flag: '', empty: '' });
		expect(parseForm('')).toEqual({});
	});

	it('rejects malformed names and mixed scalar/hash values with the offending param', () => {
		expect(() => parseForm('a]b=1')).toThrow(FormParseError);
		expect(() => parseForm('metadata=x&metadata[a]=1')).toThrow(/metadata/);
		expect(() => parseForm('metadata[a]=1&metadata=x')).toThrow(/metadata/);
		expect(() => parseForm('a=%E0%A4%A')).toThrow(/percent-encoding/);
		try {
			parseForm('line_items[0]=x&line_items[0][quantity]=1');
			expect.unreachable();
		} catch (e) {
			expect((e as FormParseError).param).toBe('line_items[0]');
		}
	});

	it('cannot be used for prototype pollution', () => {
		expect(() => parseForm('__proto__[polluted]=yes')).toThrow(FormParseError);
		expect(() => parseForm('metadata[constructor][prototype][x]=1')).toThrow(FormParseError);
		expect(({} as Record<string, unknown>).polluted).toBeUndefined();
	});

	it('stableStringify ignores key order, so equal params give one idempotency fingerprint', () => {
		const a = parseForm('metadata[a]=1&metadata[b]=2&mode=payment');
		const b = parseForm('mode=payment&metadata[b]=2&metadata[a]=1');
		expect(stableStringify(a)).toBe(stableStringify(b));
		expect(stableStringify(a)).not.toBe(stableStringify(parseForm('mode=payment&metadata[a]=1')));
	});
});

describe('signing', () => {
	it('signs `${t}.${body}` with HMAC-SHA256 as hex, in the t=...,v1=... header form', () => {
		// Known answer computed independently with OpenSSL:
		//   printf '%s' '1700000000.{"id":"evt_1"}' | openssl dgst -sha256 -hmac whsec_test
		const sig = computeSignature('{"id":"evt_1"}', 'whsec_test', 1700000000);
		expect(sig).toBe('c89214b5b5da833daed6f0b8c5bb6bd58cea9022bd80ccc78230f3942d632925');
		expect(signatureHeader('{"id":"evt_1"}', 'whsec_test', 1700000000)).toBe(`t=1700000000,v1=${sig}`);
	});
});

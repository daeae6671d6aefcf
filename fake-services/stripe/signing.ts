import { createHmac } from 'node:crypto';

/**
 * Stripe's webhook signature: HMAC-SHA256 keyed with the endpoint secret (the whole `whsec_...`
 * string) over `${timestamp}.${rawBody}`, hex encoded, sent as `Stripe-Signature: t=<unix>,v1=<hex>`.
 * (Stripe docs, "Verify webhook signatures manually".)
 */
export function computeSignature(payload: string, secret: string, timestamp: number): string {
	return createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
}

export function signatureHeader(payload: string, secret: string, timestamp: number): string {
	return `t=${timestamp},v1=${computeSignature(payload, secret, timestamp)}`;
}

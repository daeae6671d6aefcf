// The platform's Stripe webhook endpoint: its own events, and those of payments made before
// Connect (src/lib/server/payments/receive.ts checks and applies them).
import { receiveWebhook } from '$lib/server/payments/receive';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = ({ request }) => receiveWebhook(request, 'platform');

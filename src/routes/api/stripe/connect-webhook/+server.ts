// The Connect webhook endpoint: the events of the studios' connected accounts, signed with the
// Connect endpoint's own secret (src/lib/server/payments/receive.ts checks and applies them).
import { receiveWebhook } from '$lib/server/payments/receive';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = ({ request }) => receiveWebhook(request, 'connect');

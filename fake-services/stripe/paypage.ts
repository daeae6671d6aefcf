/**
 * The fake's hosted payment page: a plain page of our own design (it does not imitate Stripe's),
 * with one button per outcome a test may want.
 */
import { type Account, formatAmount } from './objects.js';
import type { SessionRecord } from './state.js';

export type PayNotice = 'declined' | 'not-open' | 'refused' | null;

export function escapeHtml(value: string): string {
	return value.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

const STYLE = `
body { font: 16px/1.5 system-ui, sans-serif; margin: 0; background: #f4f1ea; color: #1f2328; }
header { background: #263238; color: #fafafa; padding: 14px 24px; }
header h1 { font-size: 18px; margin: 0; letter-spacing: .02em; }
header p { margin: 2px 0 0; font-size: 13px; color: #cfd8dc; }
main { max-width: 640px; margin: 24px auto; padding: 0 16px; }
section { background: #fff; border: 1px solid #d7d2c8; border-radius: 6px; padding: 18px 20px; margin-bottom: 16px; }
table { width: 100%; border-collapse: collapse; }
th, td { text-align: left; padding: 6px 4px; border-bottom: 1px solid #ece8df; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
tfoot td { font-weight: 700; border-bottom: none; }
.notice { padding: 10px 14px; border-radius: 4px; margin-bottom: 16px; }
.notice.bad { background: #fdecea; border: 1px solid #e0a49c; }
.notice.good { background: #e8f5e9; border: 1px solid #9cc9a0; }
.notice.info { background: #fff8e1; border: 1px solid #e3cf8a; }
.actions { display: flex; flex-wrap: wrap; gap: 10px; margin-top: 14px; }
button { font: inherit; padding: 8px 16px; border-radius: 4px; border: 1px solid #455a64; background: #fff; cursor: pointer; }
button.primary { background: #2e7d32; border-color: #2e7d32; color: #fff; }
label { display: block; font-size: 14px; margin-top: 8px; }
input { font: inherit; padding: 6px 8px; width: 100%; box-sizing: border-box; }
dl { display: grid; grid-template-columns: max-content 1fr; gap: 4px 16px; margin: 0; font-size: 14px; }
dt { color: #5f6368; }
dd { margin: 0; overflow-wrap: anywhere; }
`;

export interface Banner {
	heading: string;
	tagline: string;
}

const PAYMENTS: Banner = {
	heading: 'Slateroom test payments',
	tagline: 'A local stand-in for the card payment step. No card is charged and no money moves.'
};

/** A page of the fake in its one plain style; the banner names which stand-in it is. */
export function page(title: string, body: string, banner: Banner = PAYMENTS): string {
	return `<!doctype html>
<html lang="en-GB">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)} · ${escapeHtml(banner.heading)}</title>
<style>${STYLE}</style>
</head>
<body>
<header><h1>${escapeHtml(banner.heading)}</h1><p>${escapeHtml(banner.tagline)}</p></header>
<main>
${body}
</main>
</body>
</html>`;
}

function utc(unixSeconds: number): string {
	return new Date(unixSeconds * 1000)
		.toISOString()
		.replace('T', ' ')
		.replace(/\.\d+Z$/, ' UTC');
}

/** `payee`: the connected account a direct charge pays, or null for the platform's own session. */
export function renderPayPage(
	rec: SessionRecord,
	notice: PayNotice,
	successUrl: string | null,
	payee: Account | null = null
): string {
	const s = rec.session;
	const rows = rec.lineItems
		.map(
			(li) =>
				`<tr><td>${escapeHtml(li.description)}</td><td class="num">${li.quantity}</td>` +
				`<td class="num">${escapeHtml(formatAmount(li.price.unit_amount, li.currency))}</td>` +
				`<td class="num">${escapeHtml(formatAmount(li.amount_total, li.currency))}</td></tr>`
		)
		.join('\n');
	const total = formatAmount(s.amount_total, s.currency);
	const notices: string[] = [];
	if (notice === 'declined' && s.status === 'open') {
		notices.push(
			'<div class="notice bad" role="alert"><strong>Card declined.</strong> The test card was declined (generic_decline). You can try again.</div>'
		);
	}
	if (notice === 'refused' && s.status === 'open') {
		notices.push(
			'<div class="notice bad" role="alert"><strong>Payment refused.</strong> The studio’s payment account cannot take charges at the moment. Nothing was charged.</div>'
		);
	}
	if (notice === 'not-open') {
		notices.push(
			`<div class="notice info" role="status">That action is no longer possible: this payment is ${escapeHtml(s.status)}.</div>`
		);
	}
	if (s.status === 'expired') {
		notices.push(
			'<div class="notice bad" role="status"><strong>This payment page has expired.</strong> Nothing was charged.</div>'
		);
	} else if (s.status === 'complete') {
		const text =
			s.payment_status === 'paid'
				? '<strong>Payment received.</strong>'
				: '<strong>Payment started (delayed method).</strong> It is waiting for the bank to settle it.';
		const link = successUrl ? ` <a href="${escapeHtml(successUrl)}">Return to the studio</a>` : '';
		notices.push(`<div class="notice good" role="status">${text}${link}</div>`);
	}

	const details = [
		['Amount due', escapeHtml(total)],
		...(payee
			? [
					[
						'Paid to',
						`${escapeHtml(payee.business_profile.name ?? 'a connected account')} (<code>${escapeHtml(payee.id)}</code>)`
					]
				]
			: []),
		['Status', `${escapeHtml(s.status)} / ${escapeHtml(s.payment_status)}`],
		...(s.client_reference_id ? [['Reference', escapeHtml(s.client_reference_id)]] : []),
		...(s.customer_email ? [['E-mail', escapeHtml(s.customer_email)]] : []),
		['Open until', escapeHtml(utc(s.expires_at))],
		['Session', `<code>${escapeHtml(s.id)}</code>`]
	]
		.map(([k, v]) => `<dt>${k}</dt><dd>${v}</dd>`)
		.join('');

	const base = `/pay/${encodeURIComponent(s.id)}`;
	const form =
		s.status === 'open'
			? `<section>
<form method="post" action="${base}/pay">
${s.customer_email ? '' : '<label for="email">E-mail for the receipt</label><input id="email" name="email" type="email" value="payer@example.test">'}
<div class="actions">
<button class="primary" type="submit">Pay</button>
<button type="submit" formaction="${base}/decline">Decline</button>
<button type="submit" formaction="${base}/pay-later">Pay later (delayed method)</button>
<button type="submit" formaction="${base}/abandon">Abandon</button>
</div>
</form>
</section>`
			: '';

	return page(
		`Pay ${total}`,
		`${notices.join('\n')}
<section>
<table>
<thead><tr><th>Item</th><th class="num">Qty</th><th class="num">Unit price</th><th class="num">Amount</th></tr></thead>
<tbody>
${rows}
</tbody>
<tfoot><tr><td colspan="3">Total</td><td class="num">${escapeHtml(total)}</td></tr></tfoot>
</table>
</section>
<section><dl>${details}</dl></section>
${form}`
	);
}

export function renderNotFound(id: string): string {
	return page('Not found', `<section><p>There is no payment with the id <code>${escapeHtml(id)}</code>.</p></section>`);
}

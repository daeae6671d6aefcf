/**
 * The onboarding page an account link opens: a plain page of our own (it does not imitate
 * Stripe's), where a test either completes the connected account's set-up or leaves it unfinished.
 */
import type { Account } from './objects.js';
import { type Banner, escapeHtml, page } from './paypage.js';

const ONBOARDING: Banner = {
	heading: 'Slateroom test payment accounts',
	tagline: 'A local stand-in for setting up a studio’s payment account. No identity is checked and no bank is linked.'
};

export function renderOnboardPage(account: Account, base: string): string {
	const due = account.requirements.currently_due;
	const details = [
		['Account', `<code>${escapeHtml(account.id)}</code>`],
		...(account.business_profile.name ? [['Business name', escapeHtml(account.business_profile.name)]] : []),
		...(account.email ? [['E-mail', escapeHtml(account.email)]] : []),
		['Country', escapeHtml(account.country)],
		['Currency', escapeHtml(account.default_currency.toUpperCase())],
		['Can take payments', account.charges_enabled ? 'yes' : 'not yet'],
		['Can receive payouts', account.payouts_enabled ? 'yes' : 'not yet']
	]
		.map(([k, v]) => `<dt>${k}</dt><dd>${v}</dd>`)
		.join('');
	const list =
		due.length > 0
			? `<p>Still to give:</p><ul>${due.map((d) => `<li><code>${escapeHtml(d)}</code></li>`).join('')}</ul>`
			: '<p>Nothing is missing.</p>';
	return page(
		'Set up the payment account',
		`<section><dl>${details}</dl></section>
<section>
${list}
<form method="post" action="${base}/complete">
<div class="actions">
<button class="primary" type="submit">Complete set-up</button>
<button type="submit" formaction="${base}/leave">Leave unfinished</button>
</div>
</form>
</section>`,
		ONBOARDING
	);
}

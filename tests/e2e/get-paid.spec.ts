// Get paid in the browser: the owner of a new studio goes to Stripe's onboarding (the Stripe
// fake's own page) from the set-up, leaves it unfinished and is told what is still missing, on the
// return page, the desk and a storefront that says bookings open soon; then finishes it, and the
// storefront offers its room for booking.
import type { Page } from '@playwright/test';
import {
	acceptSteps,
	addRoom,
	createStudio,
	expect,
	getPaid,
	publishStudio,
	saveAddress,
	saveVat,
	signUp,
	test
} from './support';

/** With SETUP_SCREENSHOTS=<folder>, each screen is also saved at 1280 and 390 px, to look at. */
async function shot(page: Page, name: string) {
	const folder = process.env.SETUP_SCREENSHOTS;
	if (!folder) return;
	const size = page.viewportSize() ?? { width: 1280, height: 720 };
	for (const width of [1280, 390]) {
		await page.setViewportSize({ width, height: 800 });
		await page.screenshot({ path: `${folder}/get-paid-${name}-${width}.png`, fullPage: true });
	}
	await page.setViewportSize(size);
}

test('an owner leaves Stripe’s onboarding unfinished, is told what is missing, then finishes it and the storefront opens', async ({
	page
}) => {
	const tag = crypto.randomUUID().slice(0, 6).replace(/[0-9]/g, 'x');
	const name = `Saltmarsh Sound ${tag}`;
	const slug = `saltmarsh-sound-${tag}`;

	await page.goto('/sign-up?next=%2Fstudios%2Fnew');
	await signUp(page, { name: 'Oona Rannikko', email: `getpaid-${tag}@slateroom.test`, password: 'a-long-enough-pass' });
	await createStudio(page, { name, slug, country: 'Finland' });
	await saveAddress(page, { street: 'Suolakatu 9', postalCode: '33200', city: 'Tampere' });
	await saveVat(page, '25.5');
	await addRoom(page, { name: 'Marsh room', currency: 'EUR', hourly: '35', halfDay: '120', fullDay: '220' });
	await page.getByRole('button', { name: 'Continue', exact: true }).click();
	await acceptSteps(page);

	// The set-up's Get paid step: nothing yet, the platform's fee read-only.
	await expect(page.getByRole('heading', { level: 1, name: 'Get paid' })).toBeVisible();
	await expect(page.getByTestId('payout-state')).toHaveAttribute('data-state', 'none');
	await expect(page.getByTestId('platform-fee')).toContainText('Slateroom’s fee: 0 %');
	await shot(page, '01-step');

	// Onboarding left unfinished: back on our return page, which says what Stripe still needs.
	await getPaid(page, 'Leave unfinished');
	await expect(page.getByRole('heading', { level: 1 })).toHaveText('Payments are not set up yet');
	await expect(page.getByTestId('payout-state')).toHaveAttribute('data-state', 'incomplete');
	await expect(page.getByTestId('payout-missing').getByRole('listitem').first()).toBeVisible();
	await shot(page, '02-return-unfinished');

	// Published all the same: the storefront shows the room and its rates, and takes no bookings.
	await page.getByRole('link', { name: 'On to the review and publishing' }).click();
	await publishStudio(page, slug);
	await page.goto('/studio');
	await expect(page.getByTestId('payout-card')).toContainText('The studio takes no bookings yet');
	await expect(page.getByTestId('payout-card').getByRole('listitem').first()).toBeVisible();
	await shot(page, '03-desk');
	await page.goto(`/${slug}`);
	await expect(page.getByTestId('bookings-soon')).toContainText('Bookings open soon');
	await expect(page.getByTestId('rate-card').filter({ hasText: 'Marsh room' })).toBeVisible();
	await expect(page.getByRole('link', { name: 'Book the marsh room' })).toHaveCount(0);
	await shot(page, '04-storefront-soon');
	await page.goto(`/${slug}/book`);
	await expect(page.getByTestId('bookings-soon-book')).toBeVisible();
	await expect(page.getByRole('button', { name: 'Confirm and pay the deposit' })).toHaveCount(0);
	await shot(page, '05-book-soon');

	// From the desk's card back to Stripe, finished this time: the studio opens for bookings.
	await page.goto('/studio');
	await page.getByTestId('payout-card').getByRole('link', { name: 'Finish setting up payments' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Get paid' })).toBeVisible();
	await shot(page, '06-page-incomplete');
	await getPaid(page, 'Complete set-up');
	await expect(page.getByRole('heading', { level: 1 })).toHaveText('Payments are set up');
	await expect(page.getByTestId('payout-state')).toHaveAttribute('data-state', 'ready');
	await shot(page, '07-return-ready');
	await page.goto('/studio');
	await expect(page.getByTestId('payout-card')).toHaveCount(0);
	await page.goto(`/${slug}`);
	await expect(page.getByTestId('bookings-soon')).toHaveCount(0);
	await page.getByRole('link', { name: 'Book the marsh room' }).click();
	await expect(page.getByRole('button', { name: 'Confirm and pay the deposit' })).toBeVisible();
});

import type { Page } from '@playwright/test';
import { acceptSteps, addRoom, expect, publishStudio, saveVat, signUp, skipGetPaid, test } from './support';

/**
 * With SETUP_SCREENSHOTS=<folder>, each screen of the flow is also saved at a desktop (1280 px) and
 * a phone (390 px) width, to look at; without it nothing is written.
 */
async function shot(page: Page, name: string) {
	const folder = process.env.SETUP_SCREENSHOTS;
	if (!folder) return;
	const size = page.viewportSize() ?? { width: 1280, height: 720 };
	for (const width of [1280, 390]) {
		await page.setViewportSize({ width, height: 800 });
		await page.screenshot({ path: `${folder}/${name}-${width}.png`, fullPage: true });
	}
	await page.setViewportSize(size);
}

test('a new person signs up, sets up a studio with a room, publishes it and finds it on the front page', async ({ page }) => {
	const tag = crypto.randomUUID().slice(0, 6).replace(/[0-9]/g, 'x');
	const name = `Quiet Harbour Tapes ${tag}`;
	const slug = `quiet-harbour-tapes-${tag}`;

	// The front page's call to action: sign up first, then the set-up.
	await page.goto('/');
	await expect(page.getByRole('heading', { level: 1 })).toContainText('Your rooms on a calendar');
	await shot(page, '01-front');
	await page.getByTestId('set-up-cta').click();
	await expect(page).toHaveURL(/\/sign-up\?next=%2Fstudios%2Fnew$/);
	await signUp(page, { name: 'Harriet Quay', email: `harbour-${tag}@slateroom.test`, password: 'a-long-enough-pass' });
	await expect(page).toHaveURL(/\/studios\/new$/);

	// The short name follows the name as typed and is checked; the country proposes zone and currency.
	await page.getByLabel('Studio name').fill(name);
	await expect(page.getByLabel('Short name')).toHaveValue(slug);
	await expect(page.getByTestId('slug-free')).toBeVisible();
	await page.getByLabel('Short name').fill('admin');
	await expect(page.getByTestId('slug-problem')).toHaveText('That short name is kept for Slateroom itself; choose another.');
	await page.getByLabel('Short name').fill('hollow-pine');
	await expect(page.getByTestId('slug-problem')).toHaveText('That short name is taken; choose another.');
	await page.getByLabel('Short name').fill(slug);
	await expect(page.getByTestId('slug-free')).toBeVisible();
	await page.getByRole('combobox', { name: /^Country/ }).selectOption({ label: 'Norway' });
	await expect(page.getByRole('combobox', { name: /^Time zone/ })).toHaveValue('Europe/Oslo');
	await expect(page.getByRole('combobox', { name: /^Currency/ })).toHaveValue('NOK');
	await shot(page, '02-studios-new');
	await page.getByRole('button', { name: 'Create the studio' }).click();

	// The set-up, step by step; bad input keeps what was typed.
	await expect(page).toHaveURL(/\/studio\/setup$/);
	await expect(page.getByRole('heading', { level: 1, name: 'Address' })).toBeVisible();
	await shot(page, '03-address');
	await page.getByLabel('Street and number').fill('Bryggen 7');
	await page.getByLabel('Postal code').fill('5003');
	await page.getByRole('button', { name: 'Save and continue' }).click();
	await expect(page.getByText('Give the town or city.')).toBeVisible();
	await expect(page.getByLabel('Street and number')).toHaveValue('Bryggen 7');
	await shot(page, '03-address-refused');
	await page.getByLabel('Town or city').fill('Bergen');
	await page.getByRole('button', { name: 'Save and continue' }).click();

	await expect(page.getByRole('heading', { level: 1, name: 'VAT' })).toBeVisible();
	await shot(page, '04-vat');
	await saveVat(page, '25');

	// Left half-way, the owner's desk leads back into the set-up.
	await expect(page.getByRole('heading', { level: 1, name: 'Rooms' })).toBeVisible();
	await page.goto('/studio');
	await expect(page.getByTestId('setup-progress')).toContainText('Set-up: 2 of 8 done');
	await shot(page, '05-desk-half-way');
	await page.getByRole('link', { name: 'Continue the set-up' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Rooms' })).toBeVisible();

	// Without a room the set-up does not move on.
	await page.getByRole('button', { name: 'Continue', exact: true }).click();
	await expect(page.getByText('Add at least one bookable room first.')).toBeVisible();
	await addRoom(page, { name: 'Tracking room', currency: 'NOK', hourly: '450', halfDay: '1600', fullDay: '3000' });
	await shot(page, '06-rooms');
	await page.getByRole('button', { name: 'Continue', exact: true }).click();

	await acceptSteps(page, undefined, (heading) => shot(page, `07-${heading.toLowerCase().replace(/ /g, '-')}`));
	await shot(page, '07-get-paid');
	await skipGetPaid(page);

	await expect(page.getByRole('heading', { level: 1, name: 'Review and publish' })).toBeVisible();
	await expect(page.getByTestId('review')).toContainText('Bryggen 7');
	await expect(page.getByTestId('review')).toContainText('Tracking room');
	await shot(page, '08-review');
	await publishStudio(page, slug);

	await page.goto('/studio');
	await expect(page.getByTestId('setup-progress')).toHaveCount(0);

	// Published: on the platform's front page, with its town and country.
	await page.goto('/');
	const listed = page.locator(`[data-studio="${slug}"]`);
	await expect(listed).toContainText(name);
	await expect(listed).toContainText('Bergen, Norway');
	await expect(listed).toHaveAttribute('href', `/${slug}`);
	await shot(page, '09-front-listed');
});

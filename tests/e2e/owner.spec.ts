import { signIn, expect, test } from './support';

test('the owner opens Rates & policy, sees the demo values, and a bad rate is refused with the typed value kept', async ({
	page
}) => {
	await signIn(page, 'owner@slateroom.test');
	await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Rates & policy' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Rates & policy' })).toBeVisible();

	// The demo studio: engineer 35.00 per hour, VAT 25.5 % included, deposit 30 %, at least 50.00.
	const hourly = page.getByLabel('Per hour');
	await expect(hourly).toHaveValue('35.00');
	await expect(page.getByLabel('VAT rate (%)')).toHaveValue('25.5');
	await expect(page.getByLabel('Rate cards include VAT')).toBeChecked();
	await expect(page.getByLabel('Deposit (% of the total)')).toHaveValue('30');
	await expect(page.getByLabel('Monday opens at')).toHaveValue('09:00');
	await expect(page.getByTestId('snapshot-note')).toContainText('keeps the price');

	await hourly.fill('12,5x');
	await page.getByRole('button', { name: 'Save rates & policy' }).click();
	await expect(page.getByText('Write the amount with digits and a point')).toBeVisible();
	await expect(hourly).toHaveAttribute('aria-invalid', 'true');
	await expect(hourly).toHaveValue('12,5x');

	// The server says the same when the browser's check is skipped: a reload shows nothing was saved.
	await page.reload();
	await expect(page.getByLabel('Per hour')).toHaveValue('35.00');
});

import { expect, signUp, test } from './support';
import { workdaysAhead } from '../support/dates';
import { pdfRows } from '../support/pdf-text';

// An artist keeps an organisation's billing details in their account and books with them: the
// booking page says whom it is billed to, and the deposit invoice's PDF names them. FI12345671 follows Finland's check digit rule, worked
// out by hand in src/lib/domain/billing.spec.ts; FI12345672 is one off.

const DAYS = workdaysAhead(51, 6);

test('an artist saves organisation billing details and books with them', async ({ page }) => {
	await page.goto('/sign-up');
	await signUp(page, {
		name: 'Billing Journey',
		email: `billing-e2e-${crypto.randomUUID()}@slateroom.test`,
		password: 'billing-journey-pass'
	});
	await expect(page.getByTestId('signed-in-as')).toBeVisible();

	// 1. The account page, from the navigation.
	await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Billing details' }).click();
	await expect(page).toHaveURL(/\/account$/);
	await page.getByRole('radio', { name: 'An organisation' }).check();
	await page.getByLabel('Registered name of the organisation').fill('Orchard Tapes Oy');
	await page.getByLabel('Street address').fill('Satamakatu 4');
	await page.getByLabel('Postal code').fill('33200');
	await page.getByLabel('Town or city').fill('Tampere');
	await page.locator('#field-country').selectOption('FI');
	await page.getByLabel('VAT ID (optional)').fill('FI12345672');
	await page.getByRole('button', { name: 'Save billing details' }).click();

	// A wrong check digit: said beside the VAT ID, every other field kept.
	const vatField = page.getByLabel('VAT ID (optional)');
	await expect(page.locator('#field-vatId-error')).toContainText('check digit');
	await expect(vatField).toHaveAttribute('aria-invalid', 'true');
	await expect(page.getByLabel('Registered name of the organisation')).toHaveValue('Orchard Tapes Oy');
	await expect(page.getByLabel('Postal code')).toHaveValue('33200');
	await expect(page.locator('#field-country')).toHaveValue('FI');

	await vatField.fill('fi 1234567-1');
	await page.getByRole('button', { name: 'Save billing details' }).click();
	await expect(page.getByTestId('form-message')).toContainText('Saved');
	await expect(vatField).toHaveValue('FI12345671');

	// 2. Booking: the saved details are offered first.
	let booked = false;
	for (const day of DAYS) {
		await page.goto(`/hollow-pine/book?room=vocal-booth&date=${day}&kind=hourly&hours=2`);
		await expect(page.locator('#field-start-hint')).toContainText('fit');
		const starts = page.locator('#field-start option:not([disabled])');
		if ((await starts.count()) === 0) continue;
		await page.locator('#field-start').selectOption((await starts.first().getAttribute('value')) ?? '');
		await expect(page.getByTestId('quote-total')).toBeVisible();
		const billTo = page.getByTestId('bill-to');
		await expect(billTo.getByRole('radio', { name: /My saved billing details/ })).toBeChecked();
		await expect(billTo.getByTestId('saved-billing')).toContainText(
			'Orchard Tapes Oy, Satamakatu 4, 33200 Tampere, Finland, VAT ID FI12345671'
		);
		await page.getByRole('button', { name: 'Confirm and pay the deposit' }).click();
		// Stripe's page (the local fake), or the form's word that the time was just taken.
		const pay = page.getByRole('button', { name: 'Pay', exact: true });
		await expect(pay.or(page.getByTestId('form-message'))).toBeVisible();
		if (await pay.isVisible()) {
			booked = true;
			break;
		}
	}
	expect(booked, 'a free two hours in the vocal booth on one of this file’s days').toBe(true);

	// 3. Pay the deposit on the Stripe fake; back on the booking, it says whom it is billed to.
	await page.getByRole('button', { name: 'Pay', exact: true }).click();
	await expect(page).toHaveURL(/\/bookings\/[0-9a-f-]{36}\?paid=1/);
	const billed = page.getByTestId('billed-to');
	await expect(billed).toContainText('Orchard Tapes Oy');
	await expect(billed).toContainText('Satamakatu 4');
	await expect(billed).toContainText('33200 Tampere, Finland');
	await expect(billed).toContainText('VAT ID FI12345671');
	const panel = page.getByTestId('money-panel');
	const deposit = panel.getByTestId('invoices').locator('li[data-type="386"]');
	await expect(deposit).toContainText(/DEP-\d{4}-\d{4}/);

	// 4. The deposit invoice's PDF is made out to them.
	const pdf = await page.request.get((await deposit.locator('a').getAttribute('href')) ?? '');
	expect(pdf.headers()['content-type']).toBe('application/pdf');
	const text = (await pdfRows(new Uint8Array(await pdf.body()))).map((r) => r.text).join('\n');
	for (const words of ['Billed to', 'Orchard Tapes Oy', 'Satamakatu 4', '33200 Tampere', 'Finland', 'VAT ID FI12345671']) {
		expect(text, words).toContain(words);
	}
});

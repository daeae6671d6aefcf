// Rules a person sees on the pages, in Chromium against the production build:
// - back from Checkout, the booking waits for Stripe's word with one notice and offers no second
//   payment (Stripe docs, "Fulfill orders": the webhook confirms, not the return address);
// - before a session starts, the owner and engineer are told when its end can be recorded, with
//   no control to record it;
// - the rate cards note what is odd beside the field and refuse what can only be a typo.
// Screenshots at desk and phone sizes go to the test's output folder.
// The slot: the control room, 14:00–16:00 on a working weekday from 20 days ahead (nothing else books it).
import { expect, test, type Page, type TestInfo } from '@playwright/test';
import { workdaysAhead } from '../support/dates';
import { holdFirstFree, signIn } from './support';

const STRIPE = process.env.STRIPE_API_BASE ?? 'http://127.0.0.1:12112';
const DESK = { width: 1280, height: 900 };
const PHONE = { width: 390, height: 844 };

/** Working weekdays from 20 days ahead, tried in order. */
const DAYS = workdaysAhead(20, 14);

async function shoot(page: Page, info: TestInfo, name: string) {
	for (const [size, viewport] of [
		['desk', DESK],
		['phone', PHONE]
	] as const) {
		await page.setViewportSize(viewport);
		await page.screenshot({ path: info.outputPath(`${name}-${size}.png`), fullPage: true });
	}
	await page.setViewportSize(DESK);
}

async function fakeControl(path: string) {
	const res = await fetch(`${STRIPE}/_control/${path}`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: '{}'
	});
	expect(res.status).toBe(200);
	await res.body?.cancel();
}

test('back from Checkout: one waiting notice, no second payment, then confirmed; closing waits for the start', async ({
	page,
	browser
}, info) => {
	await signIn(page, 'artist@slateroom.test');
	const { id } = await holdFirstFree(page.request, 'control-room', DAYS, [['14:00', '16:00']]);
	expect(id, 'a free afternoon in the control room from 20 days ahead').not.toBe('');

	await page.goto(`/bookings/${id}`);
	const panel = page.getByTestId('money-panel');
	await panel.getByTestId('pay-deposit').click();
	await expect(page).toHaveURL(/\/pay\/cs_test_/);

	// Stripe's word is held back, so the page stays in its waiting state as long as we look.
	await fakeControl('hold-deliveries');
	try {
		await page.getByRole('button', { name: 'Pay', exact: true }).click();
		await expect(page).toHaveURL(new RegExp(`/bookings/${id}\\?paid=1`));
		await expect(panel.getByTestId('money-confirming')).toBeVisible();
		await expect(page.locator('[data-testid="money-confirming"], [data-testid="paid-waiting"]')).toHaveCount(1);
		await expect(page.getByTestId('pay-deposit')).toHaveCount(0);
		await expect(page.getByTestId('status-line')).toHaveText('Held while your deposit payment is confirmed.');
		// The page looks again by itself every moment: still one notice and no button after two looks.
		for (let look = 0; look < 2; look++) {
			await page.waitForResponse((r) => r.url().includes(`/bookings/${id}/__data.json`));
		}
		await expect(page.locator('[data-testid="money-confirming"], [data-testid="paid-waiting"]')).toHaveCount(1);
		await expect(page.getByTestId('pay-deposit')).toHaveCount(0);
		await shoot(page, info, 'booking-paid-waiting');
	} finally {
		await fakeControl('release-deliveries');
	}
	await expect(page.getByTestId('booking-status')).toHaveAttribute('data-status', 'confirmed');
	await expect(page.getByTestId('money-confirming')).toHaveCount(0);
	await expect(page.getByTestId('pay-deposit')).toHaveCount(0);
	await expect(page.getByTestId('quote-balance')).toHaveCount(1);
	await expect(page.getByTestId('money-balance')).toHaveCount(0);
	await shoot(page, info, 'booking-confirmed-artist');

	// Weeks before the session, the engineer is told when its end can be recorded, and cannot yet.
	const context = await browser.newContext();
	const engineer = await context.newPage();
	await signIn(engineer, 'engineer@slateroom.test');
	await engineer.goto(`/bookings/${id}`);
	await expect(engineer.getByTestId('record-end-later')).toContainText('available from the start of the session');
	await expect(engineer.getByTestId('record-end')).toHaveCount(0);
	await expect(engineer.getByRole('button', { name: /Close the session/ })).toHaveCount(0);
	await expect(engineer.getByTestId('back-link')).toHaveAttribute('href', /^\/plan\?date=\d{4}-\d{2}-\d{2}$/);
	await shoot(engineer, info, 'booking-engineer-before-start');
	await context.close();
});

test('the rate cards note odd values beside the field and refuse a typo, keeping what was typed', async ({ page }, info) => {
	await signIn(page, 'owner@slateroom.test');
	await page.goto('/studio/settings');
	const half = page.locator('#field-engineerHalfDay');
	await expect(half).toHaveValue('120.00');

	// 4 h at 35.00 is 140.00: a half day of 150.00 is odd, not wrong.
	await half.fill('150.00');
	await expect(page.locator('#field-engineerHalfDay-warning')).toContainText('costs more than its 4 h by the hour (€140.00)');

	const adding = page.getByRole('form', { name: 'Add a surcharge' });
	await adding.getByLabel('Surcharge (%)').fill('150');
	await adding.getByLabel('From').fill('22:00');
	await adding.getByLabel('Until').fill('02:00');
	await expect(adding.getByTestId('field-warning').first()).toContainText('+150 % is above 100 %');
	await expect(adding.getByTestId('field-warning').last()).toContainText(
		'runs past midnight: 22:00 to 02:00 the next morning, 4 h a night'
	);
	await shoot(page, info, 'settings-warnings');

	// Dearer than the full day can only be a typo: refused in the field, the value kept, nothing saved.
	await half.fill('250.00');
	await page.getByRole('button', { name: /^Save/ }).first().click();
	await expect(page.locator('#field-engineerHalfDay-error')).toContainText('costs more than the full day (€230.00)');
	await expect(half).toHaveValue('250.00');
	await shoot(page, info, 'settings-error');
	await page.goto('/studio/settings');
	await expect(page.locator('#field-engineerHalfDay')).toHaveValue('120.00');
});

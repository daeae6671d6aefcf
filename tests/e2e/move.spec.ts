// An artist moves a booked session from the booking page to a longer, dearer time and pays the
// difference in deposit on the Stripe fake's own page; the booking shows "Move waits for payment"
// until the webhook applies the move, then the new time.
//
// The slot: the live room on the first working weekday from 14 days ahead (more than the free
// notice of the demo policy, 7 days) whose whole day is free, 13:00–15:00 (90.00 hourly, deposit
// 50.00 minimum), moved to 09:00–17:00 (a full day, 300.00, deposit 90.00): 40.00 to pay.
import { signIn, expect, test } from './support';
import { workdaysAhead } from '../support/dates';

test('an artist moves a session from the booking page and pays the difference', async ({ page }) => {
	await signIn(page, 'artist@slateroom.test');

	let booking: { id: string } | null = null;
	let day = '';
	for (const candidate of workdaysAhead(14, 20)) {
		const free = await page.request.get(`/api/studios/hollow-pine/availability?room=live-room&from=${candidate}&to=${candidate}`);
		const body = (await free.json()) as { busy: unknown[]; closed: unknown[] };
		if (body.busy.length || body.closed.length) continue;
		const res = await page.request.post('/api/studios/hollow-pine/bookings', {
			data: { room: 'live-room', start: `${candidate}T13:00`, end: `${candidate}T15:00` }
		});
		if (res.status() !== 201) continue;
		booking = (await res.json()) as { id: string };
		day = candidate;
		break;
	}
	expect(booking, 'a wholly free day in the live room').not.toBeNull();
	const id = booking!.id;

	// The deposit first, on the fake's page.
	await page.goto(`/bookings/${id}`);
	await page.getByTestId('money-panel').getByTestId('pay-deposit').click();
	await expect(page).toHaveURL(/\/pay\/cs_test_/);
	await page.getByRole('button', { name: 'Pay', exact: true }).click();
	await expect(page).toHaveURL(new RegExp(`/bookings/${id}\\?paid=1`));
	await expect(page.getByTestId('booking-status')).toHaveAttribute('data-status', 'confirmed', { timeout: 60_000 });

	// Move it: the rule and the outcome before confirming.
	const move = page.getByTestId('move-session');
	await expect(move.getByTestId('move-policy-words')).toContainText("Free with 7 days' notice or more");
	await move.getByLabel('New date').fill(day);
	await move.getByLabel('From').fill('09:00');
	await move.getByLabel('To').fill('17:00');
	await move.getByTestId('move-check').click();
	const outcome = move.getByTestId('move-outcome');
	await expect(outcome).toBeVisible();
	await expect(outcome.getByTestId('move-new-total')).toHaveText('€300.00');
	await expect(outcome.getByTestId('move-settlement')).toContainText('To pay now: €40.00');
	await outcome.getByTestId('move-confirm').click();

	// The fake's page for the difference; back on the booking the move waits for the webhook, then applies.
	await expect(page).toHaveURL(/\/pay\/cs_test_/);
	await expect(page.getByText('40.00').first()).toBeVisible();
	await page.getByRole('button', { name: 'Pay', exact: true }).click();
	await expect(page).toHaveURL(new RegExp(`/bookings/${id}\\?moved=1`));
	await expect
		.poll(
			async () => {
				await page.reload();
				return (await page.getByTestId('booking-when').textContent()) ?? '';
			},
			{ timeout: 60_000 }
		)
		.toContain('09:00–17:00');
	await expect(page.getByTestId('move-waiting')).toHaveCount(0);
	await expect(page.getByTestId('money-panel').getByTestId('invoices').locator('li[data-type="386"]')).toHaveCount(2);
});

// The owner settles a completed session's balance in cash at the desk, on the booking page in
// Chromium: the "Record a payment" form offers what is owed and today, the payment is recorded,
// the panel lists it ("Cash, 3 Dec, €110.00") and the balance reads 0. The session is booked and
// paid as the artist does, over the API and the Stripe fake, then moved into the past and closed
// (tests/support/started.ts), so its final invoice is issued and a balance is owed.
import { expect, newContext, signIn, test } from './support';
import { signedIn } from '../support/http';
import { testDb } from '../support/db';
import { bookAndPay } from '../support/booking';
import { moveIntoPast } from '../support/started';
import { DEMO } from '../support/env';
import { studioToday, workdaysAhead } from '../support/dates';
import { formatMoney } from '../../src/lib/domain/money';
import { formatCalendarDate } from '../../src/lib/domain/time';

const { db, client } = testDb();
test.afterAll(() => client.end());

test('the owner records a cash payment for the whole balance of a completed session and the balance reads 0', async ({
	page,
	browser
}, testInfo) => {
	const b = await bookAndPay(db, await signedIn(DEMO.artist), {
		room: 'live-room',
		days: workdaysAhead(47, 10),
		slots: [
			['09:00', '13:00'],
			['13:30', '17:30']
		]
	});
	const past = await moveIntoPast(db, b.id);
	const closed = await (await signedIn(DEMO.engineer)).json(`/api/bookings/${b.id}/close`, { actualEnd: past.end });
	expect(closed.status).toBe(200);
	const { invoice } = (await closed.json()) as { invoice: { amountDue: number } };
	expect(invoice.amountDue).toBeGreaterThan(0);
	const owed = formatMoney(invoice.amountDue, 'EUR');

	await signIn(page, DEMO.owner);
	await page.goto(`/bookings/${b.id}`);
	const panel = page.getByTestId('money-panel');
	await expect(panel.getByTestId('money-balance')).toHaveText(owed);

	const form = panel.getByTestId('record-payment');
	await form.getByText('Record a payment').click();
	// What is owed and today are offered; cash is the default.
	await expect(form.getByLabel(/^Amount/)).toHaveValue((invoice.amountDue / 100).toFixed(2));
	await expect(form.getByLabel('Paid on')).toHaveValue(studioToday());
	await expect(form.getByLabel('Cash')).toBeChecked();
	await form.getByLabel('Note (optional)').fill('Settled at the desk');
	await page.screenshot({ path: testInfo.outputPath('record-form-1280.png'), fullPage: true });
	await form.getByTestId('confirm-record').click();

	await expect(panel.getByRole('status').first()).toContainText('The payment is recorded');
	await expect(panel.getByTestId('money-balance')).toHaveText(formatMoney(0, 'EUR'));
	const day = formatCalendarDate(studioToday(), { day: 'numeric', month: 'short' });
	await expect(panel.getByTestId('recorded-line')).toHaveText(`Cash, ${day}, ${owed}`);
	await expect(panel.getByTestId('pay-balance')).toHaveCount(0);
	// Nothing is owed, so nothing more is offered to record.
	await expect(panel.getByTestId('record-payment')).toHaveCount(0);
	await page.screenshot({ path: testInfo.outputPath('recorded-1280.png'), fullPage: true });
	await page.setViewportSize({ width: 390, height: 900 });
	await page.screenshot({ path: testInfo.outputPath('recorded-390.png'), fullPage: true });

	// The artist sees the same line on their own booking page, and no form.
	const context = await newContext(browser);
	const artist = await context.newPage();
	await signIn(artist, DEMO.artist);
	await artist.goto(`/bookings/${b.id}`);
	await expect(artist.getByTestId('recorded-line')).toHaveText(`Cash, ${day}, ${owed}`);
	await expect(artist.getByTestId('money-balance')).toHaveText(formatMoney(0, 'EUR'));
	await expect(artist.getByTestId('record-payment')).toHaveCount(0);
	await expect(artist.getByTestId('reverse')).toHaveCount(0);
	await context.close();
});

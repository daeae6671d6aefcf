// The artist's money journey in Chromium against the production build: book, pay the deposit on
// the Stripe fake's own page, come back to the booking confirmed with its deposit invoice, then
// cancel with more than 7 days' notice and see the whole deposit refunded and the credit note.
// Sources: PRODUCT.md (deposit at least 50.00; 7 days' notice or more refunds the whole
// deposit); Stripe docs, "Fulfill orders" (the booking is confirmed by the webhook, not by the
// return to the success page); UNTDID 1001 (386 deposit invoice, 381 credit note).
import { expect, test } from '@playwright/test';
import { signIn } from './support';

function farWeekday(): string {
	for (;;) {
		const d = new Date(Date.now() + (100 + Math.floor(Math.random() * 70)) * 86_400_000);
		const day = d.getUTCDay();
		if (day >= 1 && day <= 5) return d.toISOString().slice(0, 10);
	}
}

test('pay the deposit on Stripe’s page, see the booking confirmed, cancel and see the refund and credit note', async ({
	page
}) => {
	await signIn(page, 'artist@slateroom.test');

	let booking: { id: string; checkoutUrl: string; quote: { deposit: number } } | null = null;
	for (let attempt = 0; attempt < 10 && !booking; attempt++) {
		const ymd = farWeekday();
		const res = await page.request.post('/api/bookings', {
			data: { room: 'vocal-booth', start: `${ymd}T10:00`, end: `${ymd}T14:00` }
		});
		if (res.status() === 201) booking = await res.json();
		else expect(res.status()).toBe(409);
	}
	expect(booking).not.toBeNull();
	const { id, quote } = booking!;

	await page.goto(`/bookings/${id}`);
	const panel = page.getByTestId('money-panel');
	await expect(panel).toBeVisible();
	await panel.getByTestId('pay-deposit').click();

	// The fake's hosted page ("Slateroom test payments"): pay by card.
	await expect(page).toHaveURL(/\/pay\/cs_test_/);
	await expect(page.getByText('Slateroom test payments').first()).toBeVisible();
	await page.getByRole('button', { name: 'Pay', exact: true }).click();

	// Back on the booking; the webhook confirms it (the page looks again by itself).
	await expect(page).toHaveURL(new RegExp(`/bookings/${id}\\?paid=1`));
	await expect(panel.getByTestId('payments').locator('li[data-status="paid"]')).toHaveCount(1, { timeout: 20_000 });
	await expect(panel.getByTestId('invoices').locator('li[data-type="386"]')).toContainText(/DEP-\d{4}-\d{4}/);
	const api = await page.request.get(`/api/bookings/${id}`);
	expect(((await api.json()) as { status: string }).status).toBe('confirmed');
	await expect(page.getByText(/confirmed/i).first()).toBeVisible();

	// The deposit invoice downloads as a PDF.
	const pdfHref = await panel.getByTestId('invoices').locator('li[data-type="386"] a').getAttribute('href');
	const pdf = await page.request.get(pdfHref!);
	expect(pdf.headers()['content-type']).toBe('application/pdf');

	// Cancelling: the refund is shown before confirming.
	await panel.getByText('Cancel booking').click();
	const preview = panel.getByTestId('cancel-preview');
	await expect(preview).toContainText("7 days' notice or more: whole deposit refunded");
	const deposit = new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'EUR' }).format(quote.deposit / 100);
	await expect(preview).toContainText(`${deposit} goes back to the card`);
	await panel.getByTestId('confirm-cancel').click();

	await expect(page).toHaveURL(/money=cancelled/);
	await expect(panel.getByTestId('refunds').locator('li[data-status="succeeded"]')).toContainText(deposit);
	await expect(panel.getByTestId('invoices').locator('li[data-type="381"]')).toContainText(/CN-\d{4}-\d{4}/);
	await expect(panel.getByTestId('cancel')).toHaveCount(0);
});

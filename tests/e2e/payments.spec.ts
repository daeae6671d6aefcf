// The artist's money journey in Chromium against the production build: book, pay the deposit on
// the Stripe fake's own page, come back to the booking confirmed with its deposit invoice, then
// cancel with eight days' notice or more and see the whole deposit refunded and the credit note.
// Sources: the demo policy (deposit at least 50.00; 7 days' notice or more refunds the whole
// deposit); Stripe docs, "Fulfill orders" (the booking is confirmed by the webhook, not by the
// return to the success page); UNTDID 1001 (386 deposit invoice, 381 credit note).
//
// The slot: the vocal booth for two hours in the evening, on the first working weekday that gives
// eight days' notice and more (the top rung with a day to spare), whatever the day and hour of the
// run. The evening hour is 19:00, or 21:00 when the run is within an hour of 19:00 studio time, so
// the whole days of notice cannot change while the test runs and the text it expects is exact.
// Nothing else books it: tests/e2e/booking.spec.ts takes the live room in the morning from 20 days
// ahead, the demo bookings (scripts/seed-bookings.ts) use days 3, 6 and 10 in the daytime, and the
// integration specs book the daytime. The calendar is asked first anyway.
import { type APIRequestContext } from '@playwright/test';
import { signIn, expect, test } from './support';
import { addDays, isWorkday, noticeDays, studioInstant, studioToday } from '../support/dates';

const HOUR = 3_600_000;
/** The studio's turnaround after each booking (the demo policy's 30 minutes). */
const TURNAROUND_MS = 30 * 60_000;

interface Slot {
	day: string;
	from: string;
	to: string;
	start: number;
}

/** Evenings from eight days and two hours of notice on, nearest first, each well away from a whole day of notice. */
function candidateSlots(now = Date.now()): Slot[] {
	const slots: Slot[] = [];
	for (let day = addDays(studioToday(now), 8); slots.length < 5; day = addDays(day, 1)) {
		if (!isWorkday(day)) continue;
		for (const [from, to] of [
			['19:00', '21:00'],
			['21:00', '23:00']
		] as const) {
			const start = studioInstant(day, from);
			const rest = (start - now) % (24 * HOUR);
			if (start - now >= 8 * 24 * HOUR + 2 * HOUR && rest >= HOUR && rest <= 23 * HOUR) {
				slots.push({ day, from, to, start });
				break;
			}
		}
	}
	return slots;
}

/** The calendar says the vocal booth is free for the slot (plus turnaround). */
async function isFree(request: APIRequestContext, slot: Slot): Promise<boolean> {
	const res = await request.get(`/api/studios/hollow-pine/availability?room=vocal-booth&from=${slot.day}&to=${slot.day}`);
	expect(res.status()).toBe(200);
	const body = (await res.json()) as { busy: { start: string; end: string }[]; open: { start: string; end: string }[] };
	const start = slot.start;
	const end = studioInstant(slot.day, slot.to);
	const inOpen = body.open.some((w) => Date.parse(w.start) <= start && Date.parse(w.end) >= end);
	const clash = body.busy.some((b) => Date.parse(b.start) < end + TURNAROUND_MS && Date.parse(b.end) > start);
	return inOpen && !clash;
}

test('pay the deposit on Stripe’s page, see the booking confirmed, cancel and see the refund and credit note', async ({
	page
}) => {
	await signIn(page, 'artist@slateroom.test');

	type Held = { id: string; checkoutUrl: string; quote: { deposit: number } };
	let booking: Held | null = null;
	let slot: Slot | undefined;
	for (const candidate of candidateSlots()) {
		if (!(await isFree(page.request, candidate))) continue;
		const res = await page.request.post('/api/studios/hollow-pine/bookings', {
			data: { room: 'vocal-booth', start: `${candidate.day}T${candidate.from}`, end: `${candidate.day}T${candidate.to}` }
		});
		if (res.status() === 201) {
			booking = (await res.json()) as Held;
			slot = candidate;
			break;
		}
		expect(res.status()).toBe(409);
	}
	expect(booking, 'a free evening in the vocal booth with eight days of notice or more').not.toBeNull();
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
	await expect(panel.getByTestId('payments').locator('li[data-status="paid"]')).toHaveCount(1);
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
	// Eight days' notice or more: the top rung. The whole days are the same from booking to now (the
	// slot was chosen an hour or more away from a whole day of notice).
	const days = noticeDays(slot!.start);
	expect(days).toBeGreaterThanOrEqual(8);
	await expect(preview).toContainText(`Cancelling now gives ${days} days' notice.`);
	await expect(preview).toContainText("7 days' notice or more: whole deposit refunded");
	const deposit = new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'EUR' }).format(quote.deposit / 100);
	await expect(preview).toContainText(`${deposit} goes back to the card`);
	await panel.getByTestId('confirm-cancel').click();

	await expect(page).toHaveURL(/money=cancelled/);
	// The whole deposit back, and the credit note for the same amount.
	await expect(panel.getByTestId('refunds').locator('li')).toHaveCount(1);
	await expect(panel.getByTestId('refunds').locator('li[data-status="succeeded"]')).toContainText(deposit);
	const creditNote = panel.getByTestId('invoices').locator('li[data-type="381"]');
	await expect(creditNote).toContainText(/CN-\d{4}-\d{4}/);
	await expect(creditNote).toContainText(deposit);
	const after = (await (await page.request.get(`/api/bookings/${id}/cancellation`)).json()) as { status: string };
	expect(after.status).toBe('cancelled');
	await expect(panel.getByTestId('cancel')).toHaveCount(0);
});

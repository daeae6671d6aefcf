import { readFile } from 'node:fs/promises';
import { signIn, expect, test } from './support';
import { parse } from 'csv-parse/sync';
import { signedIn } from '../support/http';
import { ymdInZone } from '../support/dates';
import { DEMO_BOOKING_IDS } from '../../src/lib/domain/demo';

// The engineer's and the accountant's journeys, in the browser, on the seeded demo
// studio (scripts/seed-bookings.ts places its sessions relative to the day of the seed; the app
// gives them their money history at start-up, src/lib/server/demo-ledger.ts). Days are read from
// the seeded bookings, never counted from the clock now.

/** The third seeded session as the API gives it to the engineer. */
async function demoSession(): Promise<{ reference: string; start: string }> {
	const res = await (await signedIn('engineer@slateroom.test')).fetch('/api/bookings?studio=hollow-pine');
	const { bookings } = (await res.json()) as { bookings: { id: string; reference: string; start: string }[] };
	const demo = bookings.find((b) => b.id === DEMO_BOOKING_IDS[2]);
	expect(demo, 'the third seeded session').toBeDefined();
	return demo!;
}

test('the engineer opens the day plan, reads the carried-over recall sheet and writes this session’s', async ({ page }) => {
	await signIn(page, 'engineer@slateroom.test');
	const { bookings } = (await (await page.request.get('/api/bookings?studio=hollow-pine')).json()) as {
		bookings: { id: string; reference: string; start: string }[];
	};
	const demo = bookings.find((b) => b.id === DEMO_BOOKING_IDS[2]);
	expect(demo, 'the third seeded session').toBeDefined();
	const date = demo!.start.slice(0, 10); // local date: the start carries the studio's offset

	await page.goto(`/plan?date=${date}`);
	const session = page.getByTestId('plan-session').filter({ hasText: demo!.reference });
	await expect(session).toBeVisible();
	await expect(session.getByTestId('previous-recall')).toContainText('Kick drum');
	await expect(session).toContainText('Noa Virta');

	const notes = `Re-amped the bass DI, ${Date.now()}`;
	await session.getByText('Recall sheet for this session').click();
	await session.getByLabel('Session notes').fill(notes);
	await session.getByRole('button', { name: 'Save recall sheet' }).click();
	await expect(session.getByRole('status')).toContainText('Recall sheet saved.');

	await page.reload();
	const again = page.getByTestId('plan-session').filter({ hasText: demo!.reference });
	await again.getByText('Recall sheet for this session').click();
	await expect(again.getByLabel('Session notes')).toHaveValue(notes);
});

test('the accountant opens a month and takes its documents away as CSV that matches the page', async ({ page }) => {
	await signIn(page, 'accountant@slateroom.test');
	// The demo ledger pays each demo deposit ten days before its session: the month of that day.
	const demo = await demoSession();
	const month = ymdInZone(Date.parse(demo.start) - 10 * 86_400_000).slice(0, 7);
	await page.goto(`/accounts?month=${month}`);
	const rows = page.getByTestId('documents').locator('tbody tr');
	await expect(rows.first()).toBeVisible();
	const numbers = await rows.locator('td:first-child').allInnerTexts();
	expect(numbers.some((n) => n.startsWith('DEP-'))).toBe(true);

	const [download] = await Promise.all([
		page.waitForEvent('download'),
		page.getByRole('link', { name: 'Documents (CSV)' }).click()
	]);
	expect(download.suggestedFilename()).toBe(`documents-${month}.csv`);
	const csv = parse<Record<string, string>>(await readFile(await download.path(), 'utf8'), { columns: true });
	expect(csv.map((r) => r.Number)).toEqual(numbers.map((n) => n.trim()));
});

// The owner records that nobody came, in Chromium against the production build: an artist's paid
// session is moved into the past (as tests/integration/no-show.test.ts does), and the owner ends
// it from its page through the confirm step and sees it marked as such. Screenshots at desk and
// phone widths.
import type { Page, TestInfo } from '@playwright/test';
import { eq } from 'drizzle-orm';
import { expect, holdFirstFree, newContext, signIn, test } from './support';
import { testDb } from '../support/db';
import { workdaysAhead } from '../support/dates';
import { moveIntoPast } from '../support/started';
import { payOnFake } from '../support/stripe-fake';
import { sessionOf } from '../support/booking';
import { waitFor } from '../support/wait';
import * as t from '../../src/lib/server/db/schema';

const DESK = { width: 1280, height: 900 };
const PHONE = { width: 390, height: 844 };

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

test('the owner marks a past confirmed session as “Nobody came” and sees it so', async ({ page, browser }, info) => {
	const { db, client } = testDb();
	try {
		// The artist books and pays, weeks ahead.
		const artistContext = await newContext(browser);
		const artist = await artistContext.newPage();
		await signIn(artist, 'artist@slateroom.test');
		const held = await holdFirstFree(artist.request, 'live-room', workdaysAhead(115, 30), [
			['09:00', '11:00'],
			['12:00', '14:00']
		]);
		expect(await payOnFake(sessionOf(held.checkoutUrl))).toBe(200);
		await waitFor(async () => {
			const [row] = await db.select({ status: t.booking.status }).from(t.booking).where(eq(t.booking.id, held.id));
			return row?.status === 'confirmed';
		}, 'the booking confirmed');
		await artistContext.close();

		await signIn(page, 'owner@slateroom.test');
		// Before its start, "Nobody came" is not offered.
		await page.goto(`/bookings/${held.id}`);
		await expect(page.getByTestId('booking-status')).toHaveAttribute('data-status', 'confirmed');
		await expect(page.getByTestId('no-show')).toHaveCount(0);

		// The session's time comes and goes.
		await moveIntoPast(db, held.id);
		await page.goto(`/bookings/${held.id}`);
		const offer = page.getByTestId('no-show');
		await expect(offer).toBeVisible();
		await offer.locator('summary').click();
		await expect(offer).toContainText('No final invoice is issued');
		await expect(offer).toContainText('the studio keeps');
		await shoot(page, info, 'no-show-confirm-step');
		await page.getByTestId('confirm-no-show').click();

		await expect(page.getByTestId('booking-status')).toHaveAttribute('data-status', 'no_show');
		await expect(page.getByTestId('booking-status')).toHaveText('Nobody came');
		await expect(page.getByTestId('status-line')).toContainText('Nobody came to this session');
		await expect(page.getByTestId('no-show')).toHaveCount(0);
		await expect(page.getByTestId('record-end')).toHaveCount(0);
		await shoot(page, info, 'no-show-recorded');
	} finally {
		await client.end();
	}
});

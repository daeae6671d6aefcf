import { test as base, expect, type APIRequestContext, type Browser, type BrowserContext, type Page } from '@playwright/test';
import { firstFree, type Slot, type SlotTimes } from '../support/slots';

export { expect };

/**
 * Under `npm run test:clock` the test process runs on a faked clock that Chromium does not share
 * (it runs without libfaketime, see playwright.config.ts): each browser context gets the same
 * clock, ticking from the test process's now.
 */
async function shareClock(context: BrowserContext) {
	if (process.env.FAKETIME) await context.clock.install({ time: Date.now() });
}

/** Playwright's test, with every page on the run's clock. */
export const test = base.extend({
	context: async ({ context }, use) => {
		await shareClock(context);
		await use(context);
	}
});

/** A second browser context (another person), on the run's clock too. */
export async function newContext(browser: Browser): Promise<BrowserContext> {
	const context = await browser.newContext();
	await shareClock(context);
	return context;
}

export const DEMO_PASSWORD = 'slateroom-demo';

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByTestId('signed-in-as')).toBeVisible();
}

/**
 * Holds the first free slot of `days` × `slots` in `room` with the signed-in page's own cookies
 * (`page.request`); taken slots are passed over, anything else fails.
 */
export async function holdFirstFree(
	request: APIRequestContext,
	room: string,
	days: readonly string[],
	slots: SlotTimes
): Promise<{ id: string; checkoutUrl: string } & Slot> {
	return firstFree(days, slots, async ({ start, end }) => {
		const res = await request.post('/api/studios/hollow-pine/bookings', { data: { room, start, end } });
		return { status: res.status(), body: () => res.json() };
	});
}

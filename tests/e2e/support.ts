import { test as base, expect, type APIRequestContext, type Browser, type BrowserContext, type Page } from '@playwright/test';
import { firstFree, type Slot, type SlotTimes } from '../support/slots';
import { invitationIdIn, mailTo } from '../support/team';
import { waitFor } from '../support/wait';

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

/** Creates an account on /sign-up (the page may carry a `next`), as a new person does. */
export async function signUp(page: Page, who: { name: string; email: string; password: string }) {
	await page.getByLabel('Your name or band').fill(who.name);
	await page.getByLabel('E-mail').fill(who.email);
	await page.getByLabel('Password').fill(who.password);
	await page.getByRole('button', { name: 'Create account' }).click();
}

/** On /studios/new: names the studio, checks its short name is free, picks the country and creates it. */
export async function createStudio(page: Page, studio: { name: string; slug: string; country: string }) {
	await page.getByLabel('Studio name').fill(studio.name);
	await page.getByLabel('Short name').fill(studio.slug);
	await expect(page.getByTestId('slug-free')).toBeVisible();
	await page.getByRole('combobox', { name: /^Country/ }).selectOption({ label: studio.country });
	await page.getByRole('button', { name: 'Create the studio' }).click();
	await expect(page).toHaveURL(/\/studio\/setup$/);
}

/** The set-up's address step, filled and saved. */
export async function saveAddress(page: Page, address: { street: string; postalCode: string; city: string }) {
	await expect(page.getByRole('heading', { level: 1, name: 'Address' })).toBeVisible();
	await page.getByLabel('Street and number').fill(address.street);
	await page.getByLabel('Postal code').fill(address.postalCode);
	await page.getByLabel('Town or city').fill(address.city);
	await page.getByRole('button', { name: 'Save and continue' }).click();
}

/** The set-up's VAT step, with one rate. */
export async function saveVat(page: Page, percent: string) {
	await expect(page.getByRole('heading', { level: 1, name: 'VAT' })).toBeVisible();
	await page.getByLabel('VAT rate (%)').fill(percent);
	await page.getByRole('button', { name: 'Save and continue' }).click();
}

/** On the set-up's Rooms step: adds a room with its rates (in the studio's currency, as typed). */
export async function addRoom(
	page: Page,
	room: { name: string; currency: string; hourly: string; halfDay: string; fullDay: string }
) {
	const adding = page.getByRole('form', { name: 'Add a room' });
	await adding.getByLabel('Name').fill(room.name);
	await adding.getByLabel(`Per hour (${room.currency})`).fill(room.hourly);
	await adding.getByLabel(/^Half day/).fill(room.halfDay);
	await adding.getByLabel(/^Full day/).fill(room.fullDay);
	await adding.getByRole('button', { name: 'Add room' }).click();
	await expect(page.getByRole('form', { name: `Rate card: ${room.name}` })).toBeVisible();
}

/** The set-up steps after Rooms, each saved as it comes (the defaults a new studio starts with). */
export const DEFAULT_STEPS = ['Engineer rates', 'Opening hours', 'Booking rules', 'Public holidays'] as const;

/** Saves each of `headings` as it stands, in order. */
export async function acceptSteps(
	page: Page,
	headings: readonly string[] = DEFAULT_STEPS,
	onEach?: (heading: string) => Promise<void>
) {
	for (const heading of headings) {
		await expect(page.getByRole('heading', { level: 1, name: heading })).toBeVisible();
		await onEach?.(heading);
		await page.getByRole('button', { name: 'Save and continue' }).click();
	}
}

/**
 * On the set-up's Get paid step or the Get paid page: goes to Stripe's onboarding (the Stripe
 * fake's page), presses `finish` there ("Complete set-up" or "Leave unfinished") and is sent back
 * to the return page.
 */
export async function getPaid(page: Page, finish: 'Complete set-up' | 'Leave unfinished' = 'Complete set-up') {
	await page.getByRole('button', { name: /^(Set up payments with Stripe|Continue on Stripe)$/ }).click();
	await page.getByRole('button', { name: finish }).click();
	await expect(page).toHaveURL(/\/studio\/get-paid\/return$/);
}

/** On the set-up's Get paid step: leaves payments for later and goes on to the review. */
export async function skipGetPaid(page: Page) {
	await expect(page.getByRole('heading', { level: 1, name: 'Get paid' })).toBeVisible();
	await page.getByRole('link', { name: 'Do this later and go on to the review' }).click();
}

/** On the set-up's last step: publishes the studio under its short name. */
export async function publishStudio(page: Page, slug: string) {
	await expect(page.getByRole('heading', { level: 1, name: 'Review and publish' })).toBeVisible();
	await page.getByRole('button', { name: 'Publish the studio' }).click();
	await expect(page.getByTestId('published')).toContainText(`/${slug}`);
}

/** On /studio/people: invites an address in a role and sees it waiting. */
export async function invite(page: Page, email: string, role: 'owner' | 'engineer' | 'accountant') {
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Role', { exact: true }).selectOption(role);
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(page.getByRole('status')).toContainText(`Invitation sent to ${email}`);
	await expect(page.getByTestId('pending-invitations')).toContainText(email);
}

/**
 * The invited person's own browser: opens the link from the e-mail the mail catcher holds for
 * `who.email`, creates an account with that address and accepts. Returns their page, on the home
 * of their role in that studio.
 */
export async function acceptInvitationAsNewcomer(
	browser: Browser,
	studioName: string,
	roleWords: string,
	who: { name: string; email: string; password: string }
): Promise<Page> {
	const mail = await waitFor(async () => (await mailTo(who.email))[0], `the invitation e-mail to ${who.email}`);
	const id = invitationIdIn(mail.text);
	expect(id).toBeDefined();
	const context = await newContext(browser);
	const page = await context.newPage();
	await page.goto(`/invitations/${id}`);
	await expect(page.getByTestId('invitation-summary')).toContainText(`${studioName}'s team as ${roleWords}`);
	await page.getByRole('link', { name: 'Create an account' }).click();
	await signUp(page, who);
	await page.getByRole('button', { name: `Accept and join ${studioName}` }).click();
	return page;
}

import { signIn, expect, test } from './support';

test('the storefront shows the studio, its three rooms and their rates', async ({ page }) => {
	await page.goto('/hollow-pine');
	await expect(page.getByRole('heading', { level: 1, name: 'Hollow Pine Studio' })).toBeVisible();
	const card = (slug: string) => page.locator(`[data-testid="rate-card"][data-room="${slug}"]`);
	await expect(card('live-room')).toContainText('Live room');
	await expect(card('live-room')).toContainText('€45.00');
	await expect(card('live-room')).toContainText('€160.00');
	await expect(card('live-room')).toContainText('€300.00');
	await expect(card('vocal-booth')).toContainText('€190.00');
	await expect(card('control-room')).toContainText('€260.00');
});

// `nav`: the menu where they land (a page of the platform, no studio's rooms or calendar);
// `storefront`: the links the menu adds inside the demo studio's storefront, to its own pages.
const roles: { email: string; lands: string; nav: string[]; storefront: Record<string, string> }[] = [
	{ email: 'owner@slateroom.test', lands: '/studio', nav: ['Studio desk', 'All bookings', 'People', 'Accounts'], storefront: {} },
	{
		email: 'engineer@slateroom.test',
		lands: '/plan',
		nav: ['Day plan'],
		storefront: { 'Rooms & rates': '/hollow-pine/rooms', Calendar: '/hollow-pine/calendar' }
	},
	{ email: 'accountant@slateroom.test', lands: '/accounts', nav: ['Accounts'], storefront: {} },
	{
		email: 'artist@slateroom.test',
		lands: '/bookings',
		nav: ['My bookings', 'Billing details'],
		storefront: { 'Book a session': '/hollow-pine/book', Calendar: '/hollow-pine/calendar' }
	},
	{
		email: 'artist2@slateroom.test',
		lands: '/bookings',
		nav: ['My bookings', 'Billing details'],
		storefront: { 'Book a session': '/hollow-pine/book' }
	}
];

for (const r of roles) {
	test(`${r.email} signs in, lands on ${r.lands} and sees their own navigation`, async ({ page }) => {
		await signIn(page, r.email);
		await expect(page).toHaveURL(new RegExp(`${r.lands}$`));
		const nav = page.getByRole('navigation', { name: 'Main' });
		for (const label of r.nav) await expect(nav.getByRole('link', { name: label })).toBeVisible();
		if (!r.email.startsWith('owner')) await expect(nav.getByRole('link', { name: 'People' })).toHaveCount(0);
		await expect(nav.getByRole('link', { name: 'Calendar' })).toHaveCount(0);
		await page.goto('/hollow-pine');
		for (const [label, href] of Object.entries(r.storefront)) {
			await expect(nav.getByRole('link', { name: label })).toHaveAttribute('href', href);
		}
	});
}

test('a visitor in a storefront is offered its rooms, calendar and booking page, and none on the platform’s pages', async ({
	page
}) => {
	const nav = page.getByRole('navigation', { name: 'Main' });
	await page.goto('/hollow-pine/rooms');
	await expect(nav.getByRole('link', { name: 'Rooms & rates' })).toHaveAttribute('href', '/hollow-pine/rooms');
	await expect(nav.getByRole('link', { name: 'Calendar' })).toHaveAttribute('href', '/hollow-pine/calendar');
	await expect(nav.getByRole('link', { name: 'Book a session' })).toHaveAttribute('href', '/hollow-pine/book');
	await expect(page.locator('[data-testid="rate-card"][data-room="live-room"]').getByRole('link')).toHaveAttribute(
		'href',
		'/hollow-pine/book?room=live-room'
	);
	await page.goto('/sign-in');
	await expect(nav.getByRole('link', { name: 'Calendar' })).toHaveCount(0);
	await expect(nav.getByRole('link', { name: 'Book a session' })).toHaveCount(0);
});

test('an artist who opens an owner page gets a calm 403', async ({ page }) => {
	await signIn(page, 'artist@slateroom.test');
	const res = await page.goto('/studio/people');
	expect(res?.status()).toBe(403);
	await expect(page.getByRole('heading', { name: 'Not part of your role' })).toBeVisible();
});

test('an anonymous visitor is sent to sign-in and comes back after it', async ({ page }) => {
	await page.goto('/accounts');
	await expect(page).toHaveURL(/\/sign-in\?next=%2Faccounts/);
	await page.getByLabel('E-mail').fill('accountant@slateroom.test');
	await page.getByLabel('Password').fill('slateroom-demo');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).toHaveURL(/\/accounts$/);
});

test('a wrong password shows a clear message and keeps the e-mail', async ({ page }) => {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill('owner@slateroom.test');
	await page.getByLabel('Password').fill('wrong-password');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('alert')).toContainText('That e-mail and password do not match');
	await expect(page.getByLabel('E-mail')).toHaveValue('owner@slateroom.test');
});

test('an unknown page shows the 404 page', async ({ page }) => {
	const res = await page.goto('/nothing-here');
	expect(res?.status()).toBe(404);
	await expect(page.getByRole('heading', { name: 'This page is not here' })).toBeVisible();
});

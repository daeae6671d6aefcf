// A brand-new studio from its first page to its first team: a new person signs up, creates and
// sets up a studio (address, VAT, one room, the defaults for the rest, and its payment account on
// the Stripe fake's onboarding page) and publishes it; a new artist finds it, books a half day in
// its room and pays the deposit on the Stripe fake's page; the owner invites an accountant and an
// engineer, who accept from the e-mailed links; the accountant's month shows the new deposit
// invoice and the engineer's day plan the session, each of that studio alone (nothing of the demo
// studio Hollow Pine, whose rooms are the live room, vocal booth and control room, and whose
// references start "HP-": scripts/seed.ts).
//
// The day: a new studio opens every day from 10:00 to 22:00, asks 24 hours' notice and books 180
// days ahead (src/lib/domain/setup.ts); the first Finnish working weekday three days or more ahead
// is inside all of that, whatever the hour of the run, and is nobody else's (a studio of its own).
import { referencePrefixFromName } from '../../src/lib/domain/setup';
import { addDays, studioToday, workdayFrom } from '../support/dates';
import {
	acceptInvitationAsNewcomer,
	acceptSteps,
	addRoom,
	createStudio,
	expect,
	getPaid,
	invite,
	newContext,
	publishStudio,
	saveAddress,
	saveVat,
	signIn,
	signUp,
	test
} from './support';

const HOLLOW_PINE_ROOMS = ['Live room', 'Vocal booth', 'Control room'];

test('a new studio is set up, booked and paid, and its own accountant and engineer see it alone', async ({ page, browser }) => {
	const tag = crypto.randomUUID().slice(0, 6).replace(/[0-9]/g, 'x');
	const name = `Birch Loft Recorders ${tag}`;
	const slug = `birch-loft-recorders-${tag}`;
	const prefix = referencePrefixFromName(name);
	const password = 'journey-e2e-password';
	const room = 'Attic room';

	// 1. The owner signs up, creates the studio and goes through the set-up.
	await page.goto('/sign-up?next=%2Fstudios%2Fnew');
	await signUp(page, { name: 'Saara Koivisto', email: `owner-${tag}@journey-e2e.slateroom.test`, password });
	await expect(page).toHaveURL(/\/studios\/new$/);
	await createStudio(page, { name, slug, country: 'Finland' });
	await saveAddress(page, { street: 'Koivukuja 3', postalCode: '33100', city: 'Tampere' });
	await saveVat(page, '25.5');
	await expect(page.getByRole('heading', { level: 1, name: 'Rooms' })).toBeVisible();
	await addRoom(page, { name: room, currency: 'EUR', hourly: '40', halfDay: '140', fullDay: '260' });
	await page.getByRole('button', { name: 'Continue', exact: true }).click();
	await acceptSteps(page);
	// Deposits are paid into the studio's own payment account: the owner sets it up on Stripe's onboarding.
	await expect(page.getByRole('heading', { level: 1, name: 'Get paid' })).toBeVisible();
	await getPaid(page);
	await expect(page.getByTestId('payout-state')).toHaveAttribute('data-state', 'ready');
	await page.getByRole('link', { name: 'On to the review and publishing' }).click();
	await publishStudio(page, slug);

	// 2. An artist of their own finds the studio, books a half day in its room and pays the deposit.
	const day = workdayFrom(addDays(studioToday(), 3));
	const artistContext = await newContext(browser);
	const artist = await artistContext.newPage();
	await artist.goto('/sign-up');
	await signUp(artist, { name: 'Veera Lumi (Glass Meadow)', email: `artist-${tag}@journey-e2e.slateroom.test`, password });
	await expect(artist.getByTestId('signed-in-as')).toBeVisible();
	await artist.goto(`/${slug}`);
	await expect(artist.getByRole('heading', { level: 1 })).toContainText(name);
	await artist.getByRole('link', { name: 'See free times' }).click();
	await expect(artist.getByTestId('studio-calendar')).toHaveAttribute('data-ready', 'true');
	await artist.getByLabel('Go to date').fill(day);
	await artist.getByRole('button', { name: 'Go' }).click();
	await expect(artist.getByTestId('list-status')).not.toContainText('Loading');
	const opening = artist.locator(
		`[data-testid="calendar-day"][data-date="${day}"] [data-testid="free-window"][data-start="10:00"]`
	);
	await expect(opening).toHaveAttribute('data-end', '22:00');
	await opening.getByRole('link').click();

	await expect(artist).toHaveURL(new RegExp(`/${slug}/book\\?.*date=${day}`));
	await expect(artist.getByRole('radio', { name: new RegExp(room) })).toBeChecked();
	await artist.getByLabel('Half day (4 h)').check();
	await artist.getByLabel('Start').selectOption('12:00');
	const quote = artist.getByTestId('quote');
	// 140.00 with VAT included; the default deposit is 30 %, 42.00.
	await expect(quote.getByTestId('quote-total')).toHaveText('€140.00');
	await expect(quote.getByTestId('quote-deposit')).toHaveText('€42.00');
	await artist.getByRole('button', { name: 'Confirm and pay the deposit' }).click();

	await expect(artist).toHaveURL(/\/pay\/cs_test_/);
	await artist.getByRole('button', { name: 'Pay', exact: true }).click();
	await expect(artist).toHaveURL(/\/bookings\/[0-9a-f-]{36}\?paid=1/);
	// The webhook confirms it; the page looks again by itself.
	await expect(artist.getByTestId('booking-status')).toHaveAttribute('data-status', 'confirmed');
	const reference = (await artist.getByTestId('booking-reference').textContent())!.replace('Ref.', '').trim();
	expect(reference).toMatch(new RegExp(`^${prefix}-[A-Z0-9]{4}-[A-Z0-9]{4}$`));
	const depositInvoice = artist.getByTestId('money-panel').getByTestId('invoices').locator('li[data-type="386"]');
	await expect(depositInvoice).toContainText(/DEP-\d{4}-\d{4}/);
	const invoiceNumber = (await depositInvoice.textContent())!.match(/DEP-\d{4}-\d{4}/)![0];
	// The month the deposit invoice was issued in, on the studio's calendar.
	const month = studioToday().slice(0, 7);
	await artistContext.close();

	// 3. The owner invites an accountant and an engineer; each accepts from the e-mailed link.
	await page.goto('/studio/people');
	await expect(page).toHaveTitle(`People · ${name}`);
	const accountantEmail = `accountant-${tag}@journey-e2e.slateroom.test`;
	const engineerEmail = `engineer-${tag}@journey-e2e.slateroom.test`;
	await invite(page, accountantEmail, 'accountant');
	await invite(page, engineerEmail, 'engineer');

	// 4. The accountant's month: the new deposit invoice and payment, nothing of Hollow Pine.
	const accountant = await acceptInvitationAsNewcomer(browser, name, 'an accountant', {
		name: 'Oskari Tili',
		email: accountantEmail,
		password
	});
	await expect(accountant).toHaveURL(/\/accounts$/);
	await accountant.goto(`/accounts?month=${month}`);
	await expect(accountant).toHaveTitle(`Accounts · ${name}`);
	await expect(accountant.getByRole('banner')).toContainText(name);
	const documents = accountant.getByTestId('documents').locator('tbody tr');
	await expect(documents).toHaveCount(1);
	await expect(documents).toContainText(invoiceNumber);
	const payments = accountant.getByTestId('payments').locator('tbody tr');
	await expect(payments).toHaveCount(1);
	await expect(payments).toContainText(reference);
	await expect(payments).toContainText('€42.00');
	await expect(documents).toContainText('Veera Lumi (Glass Meadow)');
	// What the demo studio's own accountant sees in that month appears nowhere here: its booking
	// references and its artists (its document numbers run in its own series, so the same number
	// can stand on both studios' pages; the one row above is the new studio's).
	const demoContext = await newContext(browser);
	const demo = await demoContext.newPage();
	await signIn(demo, 'accountant@slateroom.test');
	await demo.goto(`/accounts?month=${month}`);
	await expect(demo).toHaveTitle('Accounts · Hollow Pine Studio');
	const demoReferences = (await demo.getByTestId('payments').locator('tbody tr td:first-child').allTextContents()).map((r) =>
		r.trim()
	);
	for (const ref of demoReferences) {
		expect(ref).toMatch(/^HP-/);
		await expect(accountant.locator('main')).not.toContainText(ref);
	}
	await demoContext.close();
	await expect(accountant.locator('main')).not.toContainText('HP-');
	await expect(accountant.locator('main')).not.toContainText('Noa Virta');
	await expect(accountant.locator('body')).not.toContainText('Hollow Pine');
	await accountant.context().close();

	// 5. The engineer's day plan: the session in the new room, nothing of Hollow Pine's rooms.
	const engineer = await acceptInvitationAsNewcomer(browser, name, 'an engineer', {
		name: 'Ilmari Kaapeli',
		email: engineerEmail,
		password
	});
	await expect(engineer).toHaveURL(/\/plan$/);
	await engineer.goto(`/plan?date=${day}`);
	await expect(engineer).toHaveTitle(`Day plan · ${name}`);
	await expect(engineer.getByRole('banner')).toContainText(name);
	const rooms = engineer.getByTestId('plan-room');
	await expect(rooms).toHaveCount(1);
	await expect(rooms.getByRole('heading', { level: 2 })).toHaveText(room);
	const session = rooms.getByTestId('plan-session');
	await expect(session).toHaveCount(1);
	await expect(session).toContainText(reference);
	await expect(session).toContainText('Veera Lumi (Glass Meadow)');
	await expect(session).toContainText('12:00');
	for (const other of HOLLOW_PINE_ROOMS) await expect(engineer.locator('main')).not.toContainText(other);
	await expect(engineer.locator('main')).not.toContainText('HP-');
	await expect(engineer.locator('body')).not.toContainText('Hollow Pine');
	await engineer.context().close();
});

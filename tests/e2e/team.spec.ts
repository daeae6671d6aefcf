import { expect, newContext, signIn, test } from './support';
import { Client } from '../support/http';
import { testDb } from '../support/db';
import { waitFor } from '../support/wait';
import { invitationIdIn, joinTeam, mailTo, makeStudio, userIdOf } from '../support/team';

// An owner builds a team in the browser: invites an engineer by e-mail on the People page; the
// engineer opens the link from the e-mail, creates an account with that address, accepts, and
// lands on the day plan of that studio. A studio of its own, so the demo team stays as it is.

const { db, client } = testDb();
test.afterAll(() => client.end());

test('an owner invites an engineer, who accepts in the browser and sees that studio on the day plan', async ({
	page,
	browser
}) => {
	const run = crypto.randomUUID().slice(0, 8);
	const studio = await makeStudio(db, `Cedar Attic ${run}`);
	const ownerEmail = `owner-${run}@team-e2e.slateroom.test`;
	const password = 'team-e2e-password';
	await new Client().signUp('Ilona Cedar', ownerEmail, password);
	await joinTeam(db, studio.id, await userIdOf(db, ownerEmail), 'owner');

	await signIn(page, ownerEmail, password);
	await page.goto('/studio/people');
	await expect(page).toHaveTitle(`People · ${studio.name}`);
	const engineerEmail = `engineer-${run}@team-e2e.slateroom.test`;
	await page.getByLabel('E-mail').fill(engineerEmail);
	await page.getByLabel('Role', { exact: true }).selectOption('engineer');
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(page.getByRole('status')).toContainText(`Invitation sent to ${engineerEmail}`);
	await expect(page.getByTestId('pending-invitations')).toContainText(engineerEmail);

	// The engineer's own browser, with the link from the e-mail.
	const mail = await waitFor(async () => (await mailTo(engineerEmail))[0], 'the invitation e-mail');
	const id = invitationIdIn(mail.text);
	expect(id).toBeDefined();
	const context = await newContext(browser);
	const engineer = await context.newPage();
	await engineer.goto(`/invitations/${id}`);
	await expect(engineer.getByTestId('invitation-summary')).toContainText(`${studio.name}'s team as an engineer`);
	await engineer.getByRole('link', { name: 'Create an account' }).click();
	await engineer.getByLabel('Your name or band').fill('Aarne Koski');
	await engineer.getByLabel('E-mail').fill(engineerEmail);
	await engineer.getByLabel('Password').fill(password);
	await engineer.getByRole('button', { name: 'Create account' }).click();
	await engineer.getByRole('button', { name: `Accept and join ${studio.name}` }).click();

	await expect(engineer).toHaveURL(/\/plan$/);
	await expect(engineer).toHaveTitle(`Day plan · ${studio.name}`);
	await expect(engineer.locator('header')).toContainText(studio.name);
	await expect(engineer.getByTestId('signed-in-as')).toContainText('Engineer');
	await context.close();

	// The owner's list: the engineer is in the team, the invitation no longer waits.
	await page.reload();
	await expect(page.getByRole('row').filter({ hasText: engineerEmail })).toBeVisible();
	await expect(page.getByTestId('pending-invitations')).toHaveCount(0);
});

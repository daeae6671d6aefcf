import { acceptInvitationAsNewcomer, expect, invite, signIn, test } from './support';
import { Client } from '../support/http';
import { testDb } from '../support/db';
import { joinTeam, makeStudio, userIdOf } from '../support/team';

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
	await invite(page, engineerEmail, 'engineer');

	// The engineer's own browser, with the link from the e-mail.
	const engineer = await acceptInvitationAsNewcomer(browser, studio.name, 'an engineer', {
		name: 'Aarne Koski',
		email: engineerEmail,
		password
	});

	await expect(engineer).toHaveURL(/\/plan$/);
	await expect(engineer).toHaveTitle(`Day plan · ${studio.name}`);
	await expect(engineer.getByRole('banner')).toContainText(studio.name);
	await expect(engineer.getByTestId('signed-in-as')).toContainText('Engineer');
	await engineer.context().close();

	// The owner's list: the engineer is in the team, the invitation no longer waits.
	await page.reload();
	await expect(page.getByRole('row').filter({ hasText: engineerEmail })).toBeVisible();
	await expect(page.getByTestId('pending-invitations')).toHaveCount(0);
});

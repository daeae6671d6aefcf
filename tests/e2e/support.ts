import { expect, type Page } from '@playwright/test';

export const DEMO_PASSWORD = 'slateroom-demo';

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByTestId('signed-in-as')).toBeVisible();
}

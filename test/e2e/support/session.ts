import type { Page } from 'playwright-core';
import demo from '../../../database/demo-accounts.json';

export const DEMO_PASSWORD = demo.password;

/** Signs in through the sign-in page, as a person would. */
export async function signIn(page: Page, email: string, password = demo.password): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
}

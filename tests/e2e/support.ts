import { expect, type Page } from '@playwright/test';
import accounts from '../../seeders/demo-accounts.json' with { type: 'json' };

export const DEMO_PASSWORD = accounts.password;
export const demo = (key: string) => accounts.users.find((u) => u.key === key)!;

/** Signs in through the sign-in form, as a person would. */
export async function signInAs(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto('/signin');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByTestId('current-user')).toBeVisible();
}

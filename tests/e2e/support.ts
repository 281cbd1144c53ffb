import { expect, type Page } from '@playwright/test';
import accounts from '../../seeders/demo-accounts.json' with { type: 'json' };

export const DEMO_PASSWORD = accounts.password;
export const demo = (key: string) => accounts.users.find((u) => u.key === key)!;

/**
 * Waits until every React island on the page has hydrated (Astro drops the `ssr` attribute),
 * so typing is not wiped by hydration.
 */
export async function hydrated(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelectorAll('astro-island[ssr]').length === 0);
}

/** Opens a page and waits for its islands. */
export async function open(page: Page, path: string): Promise<void> {
  await page.goto(path);
  await hydrated(page);
}

/** Follows a link of the main navigation, as a person would, and waits for the new page's islands. */
export async function navigate(page: Page, label: string, path: string): Promise<void> {
  await page.getByRole('navigation', { name: 'Main', exact: true }).getByRole('link', { name: label }).click();
  await page.waitForURL((url) => url.pathname === path);
  await hydrated(page);
}

/** Signs in through the sign-in form, as a person would. */
export async function signInAs(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await open(page, '/signin');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByTestId('current-user')).toBeVisible();
}

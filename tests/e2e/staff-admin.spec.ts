import { expect, test } from '@playwright/test';
import { demo, open, signInAs, navigate } from './support';

test('the manager creates a sonographer account that can then sign in', async ({ page, browser }) => {
  const email = `new-sono-${Date.now()}@tests.test`;
  await signInAs(page, demo('admin').email);
  await navigate(page, 'Staff & access', '/admin/users');
  await page.getByRole('button', { name: 'New account' }).click();
  const form = page.getByRole('form', { name: 'New account' });
  await form.getByLabel('Full name').fill('Noor Testwell');
  await form.getByLabel('E-mail').fill(email);
  await form.getByLabel('Role').selectOption('sonographer');
  await form.getByLabel('First password').fill('short');
  await form.getByRole('button', { name: 'Create account' }).click();
  await expect(form.getByText('Use at least 12 characters.')).toBeVisible();
  await form.getByLabel('First password').fill('a long first password');
  await form.getByRole('button', { name: 'Create account' }).click();
  await expect(page.getByRole('status')).toContainText('Account created for Noor Testwell');
  await page.getByLabel('Search').fill('Noor');
  await expect(page.getByRole('cell', { name: email })).toBeVisible();

  const other = await browser.newPage();
  await signInAs(other, email, 'a long first password');
  await expect(other.getByTestId('current-role')).toHaveText('Sonographer');
  await other.close();
});

test('the manager deactivates an account and it can no longer sign in', async ({ page, browser }) => {
  const email = `leaver-${Date.now()}@tests.test`;
  await signInAs(page, demo('admin').email);
  await open(page, '/admin/users');
  await page.getByRole('button', { name: 'New account' }).click();
  const form = page.getByRole('form', { name: 'New account' });
  await form.getByLabel('Full name').fill('Leaving Soon');
  await form.getByLabel('E-mail').fill(email);
  await form.getByLabel('First password').fill('a long first password');
  await form.getByRole('button', { name: 'Create account' }).click();
  // As a person would: see the account made, then look it up.
  await expect(page.getByRole('status')).toContainText('Account created for Leaving Soon');
  await page.getByLabel('Search').fill(email);
  await page.getByRole('button', { name: 'Manage Leaving Soon' }).click();
  await page.getByRole('button', { name: 'Deactivate account' }).click();
  await expect(page.getByRole('status')).toContainText('can no longer sign in');
  await expect(page.getByRole('row', { name: /Leaving Soon/ })).toContainText('Deactivated');

  const other = await browser.newPage();
  await open(other, '/signin');
  await other.getByLabel('E-mail').fill(email);
  await other.getByLabel('Password').fill('a long first password');
  await other.getByRole('button', { name: 'Sign in' }).click();
  await expect(other.getByRole('alert')).toContainText('deactivated');
  await other.close();
});

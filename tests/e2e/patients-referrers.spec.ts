import { expect, test } from '@playwright/test';
import { demo, signInAs, navigate } from './support';

test('the front desk adds a referring clinician, is told about a taken e-mail, and deactivates the entry', async ({ page }) => {
  const stamp = Date.now();
  const email = `dr.lowen.${stamp}@referrers.test`;
  await signInAs(page, demo('desk').email);
  await navigate(page, 'Referring clinicians', '/referrers');
  // Wait for the island to hydrate, so the first click is not lost.
  await expect(page.locator('astro-island[ssr]')).toHaveCount(0);
  await page.getByRole('button', { name: 'New referring clinician' }).click();
  let form = page.getByRole('form', { name: 'New referring clinician' });
  await form.getByLabel('Name').fill(`Dr Marit Lowen ${stamp}`);
  await form.getByLabel('Practice').fill('Saltmarsh Road Health Centre');
  await form.getByLabel('E-mail').fill(email);
  await form.getByRole('button', { name: 'Add to directory' }).click();
  await expect(page.getByRole('status')).toContainText('added to the directory');

  await page.getByRole('button', { name: 'New referring clinician' }).click();
  form = page.getByRole('form', { name: 'New referring clinician' });
  await form.getByLabel('Name').fill('Dr Another Person');
  await form.getByLabel('Practice').fill('Elsewhere Practice');
  await form.getByLabel('E-mail').fill(email.toUpperCase());
  await form.getByRole('button', { name: 'Add to directory' }).click();
  await expect(form.getByText('Already used by another referring clinician.')).toBeVisible();
  await form.getByRole('button', { name: 'Cancel' }).click();

  await page.getByLabel('Search').fill(String(stamp));
  await page.getByRole('button', { name: `Edit Dr Marit Lowen ${stamp}` }).click();
  await page.getByRole('button', { name: 'Deactivate' }).click();
  await expect(page.getByRole('status')).toContainText('is deactivated');
  await expect(page.getByRole('cell', { name: email })).toHaveCount(0);
  await page.getByLabel('Show').selectOption('false');
  await expect(page.getByRole('row', { name: new RegExp(`Dr Marit Lowen ${stamp}`) })).toContainText('Deactivated');
});

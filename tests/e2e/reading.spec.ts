import { expect, test } from '@playwright/test';
import { demo, open, signInAs } from './support';

test('the reading physician claims a report from the queue, writes the impression and signs it with the password', async ({ page, browser }) => {
  test.setTimeout(60_000);
  await signInAs(page, demo('reader').email);
  await open(page, '/reading');
  // The last row: the longest-waiting ones are taken by other tests against the same database.
  const row = page.getByRole('table', { name: 'Reading queue' }).getByRole('row').filter({ hasText: 'nobody yet' }).last();
  // "MRN · accession": the accession number names the exam (a patient may have several waiting).
  const accession = (await row.locator('td').nth(1).locator('span').innerText()).split('·')[1]!.trim();
  await row.getByRole('link').first().click();
  await page.waitForURL(/\/exams\/\d+\/report$/);
  await expect(page.getByTestId('claim-status')).toHaveText('You are reading this report.');

  // Another physician sees who is reading it, in the queue.
  const other = await browser.newPage();
  await signInAs(other, demo('admin').email);
  await open(other, '/reading');
  await expect(other.getByRole('row').filter({ hasText: accession })).toContainText(demo('reader').displayName);
  await other.close();

  const findings = page.getByRole('textbox', { name: 'Findings' });
  await expect(findings).not.toBeEmpty(); // starts from the generated sentences
  const impression = page.getByRole('textbox', { name: 'Impression' });
  await impression.click();
  await page.getByRole('toolbar', { name: 'Impression formatting' }).getByRole('button', { name: 'Bold' }).click();
  await page.keyboard.type('No acute abnormality.');
  await expect(page.getByTestId('reading-status')).toHaveText('Not saved yet');
  await page.getByRole('button', { name: 'Save', exact: true }).click();
  await expect(page.getByTestId('reading-status')).toContainText('Saved');

  await page.getByRole('button', { name: 'Sign report…' }).click();
  const form = page.getByRole('form', { name: 'Sign the report' });
  await form.getByLabel('Your password').fill('not my password');
  await form.getByRole('button', { name: 'Sign', exact: true }).click();
  await expect(form.getByRole('alert')).toHaveText('That is not your password.');
  await form.getByLabel('Your password').fill('crestline-demo');
  await form.getByRole('button', { name: 'Sign', exact: true }).click();

  await expect(page.getByTestId('report-status')).toHaveText('Report: Final');
  await expect(page.getByTestId('signed-impression')).toContainText('No acute abnormality.');
  await expect(page.getByTestId('signed-impression').locator('strong')).toHaveText('No acute abnormality.');
  await expect(page.getByTestId('signature')).toContainText(`Electronically signed by ${demo('reader').displayName}`);
  await expect(page.getByTestId('signature')).toContainText(/SHA-256\)\s+[0-9a-f]{64}/);
  // Signed: no editor any more, and it has left the queue.
  await expect(page.getByRole('textbox', { name: 'Impression' })).toHaveCount(0);
  await open(page, '/reading');
  await expect(page.getByRole('row').filter({ hasText: accession })).toHaveCount(0);
});

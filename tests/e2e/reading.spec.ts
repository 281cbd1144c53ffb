import { expect, test } from '@playwright/test';
import { QueryTypes } from 'sequelize';
import { User } from '../../src/db/models';
import { closeTestDb, testDb } from '../helpers/db';
import { DEMO_PASSWORD, demo, hydrated, open, signInAs } from './support';

// One after the other: both sign a waiting report, and must not pick the same one.
test.describe.configure({ mode: 'serial' });

test.afterAll(async () => {
  await closeTestDb();
});

test('the reading physician claims a report from the queue, writes the impression and signs it with the password', async ({ page, browser }) => {
  test.setTimeout(60_000);
  await signInAs(page, demo('reader').email);
  await open(page, '/reading');
  // The longest-waiting report nobody reads yet: a seeded one, never a report another browser
  // test has just submitted (those wait at the bottom of the queue).
  const row = page.getByRole('table', { name: 'Reading queue' }).getByRole('row').filter({ hasText: 'nobody yet' }).first();
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

test('the referring clinician opens the link from the e-mail, signs in, and reads the final report', async ({ page, browser }) => {
  test.setTimeout(60_000);
  testDb();
  // A waiting report of the demo referrer's practice, from the middle of the list (the
  // integration tests that ran before on this database signed some at both ends).
  const referrer = (await User.findOne({ where: { email: demo('referrer').email } }))!;
  const rows = await testDb().query<{ id: number; version: number; accession_number: string }>(
    `SELECT r.id, r.version, e.accession_number FROM reports r JOIN exams e ON e.id = r.exam_id
      WHERE r.status = 'preliminary' AND r.claimed_by IS NULL AND e.referrer_id = ? ORDER BY r.id`,
    { replacements: [referrer.referrerId], type: QueryTypes.SELECT },
  );
  const report = rows[Math.floor(rows.length / 2) + 2] ?? rows.at(-1)!;

  // The physician signs (through the API here; the test above signs through the page).
  const reader = await browser.newContext({ baseURL: process.env.APP_URL });
  const readerPage = await reader.newPage();
  await signInAs(readerPage, demo('reader').email);
  const headers = { Origin: process.env.APP_URL! };
  const saved = await readerPage.request.put(`/api/reports/${report.id}/reading`, { headers, data: { version: report.version, findingsHtml: '', impressionHtml: '<p>Benign-appearing study.</p>' } });
  expect(saved.status()).toBe(200);
  const signed = await readerPage.request.post(`/api/reports/${report.id}/sign`, { headers, data: { version: (await saved.json()).report.version, password: DEMO_PASSWORD } });
  expect(signed.status()).toBe(200);
  await reader.close();

  // The worker sends the e-mail on its own; it says where, not what.
  let mail: { subject: string; text: string } | undefined;
  await expect
    .poll(async () => {
      const inbox = (await (await fetch(`${process.env.MAILDEV_URL}/email`)).json()) as Array<{ subject: string; text: string }>;
      mail = inbox.find((m) => m.subject.includes(report.accession_number) && m.subject.startsWith('Report ready'));
      return mail !== undefined;
    }, { timeout: 20_000 })
    .toBe(true);
  expect(mail!.text).not.toContain('Benign-appearing');
  const link = /https?:\/\/\S+\/r\/[A-Za-z0-9_-]+/.exec(mail!.text)![0];

  // Signed out, the link asks for sign-in first, then opens the report.
  await page.goto(new URL(link).pathname);
  await expect(page).toHaveURL(/\/signin/);
  await hydrated(page);
  await page.getByLabel('E-mail').fill(demo('referrer').email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page).toHaveURL(new RegExp(`/reports/${report.id}$`));
  await expect(page.getByTestId('report-status')).toHaveText('Report: Final');
  await expect(page.getByTestId('signed-impression')).toHaveText('Benign-appearing study.');
  await expect(page.getByTestId('signature')).toContainText(demo('reader').displayName);
  await expect(page.getByRole('link', { name: 'Exam details' })).toHaveCount(0);
  // The PDF of the same report, for the same referrer.
  const pdf = await page.request.get(await page.getByRole('link', { name: 'Report as PDF' }).getAttribute('href') as string);
  expect(pdf.status()).toBe(200);
  expect(pdf.headers()['content-type']).toBe('application/pdf');
  expect((await pdf.body()).subarray(0, 5).toString()).toBe('%PDF-');
});

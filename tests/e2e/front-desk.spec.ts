import { expect, test } from '@playwright/test';
import { demo, hydrated, open, signInAs, navigate } from './support';

test('the front desk books a self-pay abdomen exam, takes the deposit, and checks the patient in', async ({ page }) => {
  await signInAs(page, demo('desk').email);
  await navigate(page, 'Worklist', '/worklist');
  await page.getByRole('link', { name: 'Book an exam' }).click();
  await hydrated(page);

  // Find the patient by the MRN on their card.
  await page.getByLabel('Patient').fill('P0000012');
  const matches = page.getByRole('list', { name: 'Matching patients' });
  await expect(matches.getByRole('button').first()).toBeVisible();
  const chosen = (await matches.getByRole('button').first().innerText()).split('·')[0]!.trim();
  await matches.getByRole('button').first().click();

  await page.getByLabel('Exam', { exact: true }).selectOption({ label: 'Abdomen, complete (45 min)' });
  await page.getByLabel('Indication').fill('Right upper quadrant pain after meals');
  await expect(page.getByLabel('Self-pay')).toBeChecked();
  // A free slot that fits: the form offers them.
  const slots = page.getByRole('group', { name: 'Next free times' });
  await slots.getByRole('button').last().click();
  await page.getByRole('button', { name: 'Book exam' }).click();

  await expect(page.getByRole('heading', { name: /Booked: Abdomen, complete/ })).toBeVisible();
  await page.getByLabel('Test card — payment succeeds').check();
  await page.getByRole('button', { name: 'Take deposit of $75.00' }).click();
  await expect(page.getByRole('status')).toHaveText('Payment received.');

  await page.getByRole('link', { name: 'Worklist for that day' }).click();
  await hydrated(page);
  const row = page.getByRole('row', { name: new RegExp(chosen) }).filter({ hasText: 'Abdomen, complete' }).filter({ hasText: 'Deposit paid' });
  await expect(row).toHaveCount(1);
  await row.getByRole('button', { name: /Check in/ }).click();
  await expect(page.getByRole('status')).toContainText('is checked in');
  await expect(row.getByText('Arrived')).toBeVisible();
});

test('a declined card leaves the exam booked with the deposit due and says so', async ({ page }) => {
  await signInAs(page, demo('desk').email);
  await open(page, '/exams/new');
  await page.getByLabel('Patient').fill('P0000013');
  await page.getByRole('list', { name: 'Matching patients' }).getByRole('button').first().click();
  await page.getByLabel('Indication').fill('Neck swelling for assessment');
  await page.getByLabel('Room').selectOption({ label: 'Room 2' });
  await page.getByRole('group', { name: 'Next free times' }).getByRole('button').nth(2).click();
  await page.getByRole('button', { name: 'Book exam' }).click();
  await page.getByLabel('Test card — declined').check();
  await page.getByRole('button', { name: /Take deposit/ }).click();
  await expect(page.getByRole('alert')).toContainText('declined');
  await page.getByRole('link', { name: 'Open the exam' }).click();
  await expect(page.getByText('Self-pay · Deposit due')).toBeVisible();
  await expect(page.getByRole('region', { name: 'Payment ledger' })).toContainText('declined');
});

test('the schedule shows rooms side by side with the free time marked', async ({ page }) => {
  await signInAs(page, demo('desk').email);
  await page.goto('/schedule');
  await page.getByRole('link', { name: 'Next day' }).click();
  const rooms = page.getByRole('region', { name: /^Room \d/ });
  if ((await rooms.count()) > 0) {
    await expect(rooms).toHaveCount(3);
    await expect(page.getByRole('link', { name: /^Free \d\d:\d\d–\d\d:\d\d/ }).first()).toBeVisible();
  } else {
    await expect(page.getByText(/The clinic is closed/)).toBeVisible();
  }
});

import { expect, test } from '@playwright/test';
import { addDays, zonedDate } from '../../src/lib/time';
import { demo, hydrated, navigate, signInAs } from './support';

// The demo clinic's time zone (seeders/demo-clinic-data.ts, CLINIC.timeZone).
const CLINIC_TIME_ZONE = 'America/Chicago';
const TITLES = ['Exams by type and status', 'Turnaround by exam type', 'Reading turnaround by radiologist', 'Room utilisation', 'Takings by day'];

test('the manager sees the dashboard for the demo week, each chart with its table and CSV', async ({ page }) => {
  // The demo clinic is seeded from three days back to three days ahead of today (clinic time).
  const today = zonedDate(new Date(), CLINIC_TIME_ZONE);
  const [from, to] = [addDays(today, -3), addDays(today, 3)];

  await signInAs(page, demo('admin').email);
  await navigate(page, 'Clinic dashboard', '/admin/dashboard');
  await expect(page.getByRole('heading', { name: 'Clinic dashboard' })).toBeVisible();

  const period = page.getByRole('form', { name: 'Period' });
  await period.getByLabel('Period').selectOption({ label: 'Chosen dates' });
  await period.getByLabel('From').fill(to);
  await period.getByLabel('To').fill(from);
  await period.getByRole('button', { name: 'Show' }).click();
  await expect(period.getByText('The last day comes before the first.')).toBeVisible();
  await period.getByLabel('From').fill(from);
  await period.getByLabel('To').fill(to);
  await period.getByRole('button', { name: 'Show' }).click();
  await expect(page).toHaveURL(new RegExp(`from=${from}&to=${to}`));
  await expect(page.getByRole('status').filter({ hasText: '7 days' })).toBeVisible();

  for (const title of TITLES) {
    const section = page.getByRole('region', { name: title });
    await expect(section.getByRole('figure', { name: `Chart: ${title}` }).locator('svg.recharts-surface').first()).toBeVisible();
    await expect(section.getByRole('table', { name: title })).toBeVisible();
    const link = section.getByRole('link', { name: `Export CSV: ${title}` });
    await expect(link).toHaveAttribute('href', new RegExp(`^/api/dashboard/export\\?table=[a-z-]+&from=${from}&to=${to}$`));
  }

  // The demo week has exams; the card and its table's total agree, and the bars are drawn.
  const exams = page.getByRole('region', { name: 'Exams by type and status' });
  const totalRow = exams.getByRole('row').filter({ hasText: 'All exam types' });
  const total = (await totalRow.getByRole('cell').nth(7).innerText()).replace(/,/g, '');
  expect(Number(total)).toBeGreaterThan(0);
  await expect(page.getByRole('term').filter({ hasText: 'Exams' }).locator('xpath=following-sibling::dd[1]')).toHaveText(Number(total).toLocaleString('en-US'));
  await expect(exams.locator('.recharts-bar-rectangle').first()).toBeVisible();

  // A reload keeps the chosen period (it is in the address).
  await page.reload();
  await hydrated(page);
  await expect(page.getByRole('form', { name: 'Period' }).getByLabel('From')).toHaveValue(from);
  await expect(page.getByRole('region', { name: 'Room utilisation' }).getByRole('table')).toContainText('All rooms');
});

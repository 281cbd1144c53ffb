import { expect, test, type Page } from '@playwright/test';
import { addDays, formatDay, zonedDate } from '../../src/lib/time';
import { demo, hydrated, navigate, signInAs } from './support';

// Other browser tests run beside this one on the same clinic: the closed date lies far ahead,
// and whatever this test changed is put back through the API even when a step fails.
type Settings = { hours: { value: { weekly: unknown; closedDates: string[] }; version: string }; delivery: { value: { linkDays: number; attachPdf: boolean }; version: string } };

async function current(page: Page): Promise<Settings> {
  const res = await page.request.get('/api/admin/settings');
  expect(res.status()).toBe(200);
  return (await res.json()).settings;
}

async function putBack(page: Page, before: Settings, closed: string): Promise<void> {
  const now = await current(page);
  if (now.hours.value.closedDates.includes(closed)) {
    const closedDates = now.hours.value.closedDates.filter((d) => d !== closed);
    await page.request.put('/api/admin/settings/hours', { data: { ...now.hours.value, closedDates, version: now.hours.version } });
  }
  if (now.delivery.value.attachPdf !== before.delivery.value.attachPdf) {
    await page.request.put('/api/admin/settings/delivery', { data: { ...now.delivery.value, attachPdf: before.delivery.value.attachPdf, version: now.delivery.version } });
  }
}

test('the manager closes a day and attaches the PDF to report e-mails, sees both kept after a reload, then puts them back', async ({ page }) => {
  const closed = addDays(zonedDate(new Date(), 'America/Chicago'), 500);
  const label = formatDay(closed);
  await signInAs(page, demo('admin').email);
  const before = await current(page);
  try {
    await navigate(page, 'Clinic settings', '/admin/settings');
    const hours = page.getByRole('form', { name: 'Opening hours' });
    const delivery = page.getByRole('form', { name: 'Report delivery' });
    const attach = delivery.getByRole('switch', { name: 'Attach the report PDF to the e-mail' });
    await expect(attach).not.toBeChecked();

    // Choosing another time zone warns that only the display changes; it is not saved here.
    const clinic = page.getByRole('form', { name: 'Clinic' });
    await clinic.getByLabel('Time zone').selectOption('Europe/Lisbon');
    await expect(clinic.getByRole('note')).toContainText('changes only how times are shown');
    await clinic.getByLabel('Time zone').selectOption('America/Chicago');
    await expect(clinic.getByRole('note')).toHaveCount(0);

    await hours.getByLabel('Add a closed date').fill(closed);
    await hours.getByRole('button', { name: 'Add date' }).click();
    await expect(hours.getByRole('list', { name: 'Closed dates' })).toContainText(label);
    await hours.getByRole('button', { name: 'Save opening hours' }).click();
    await expect(hours.getByRole('status')).toHaveText('Opening hours saved.');

    await attach.check();
    await delivery.getByRole('button', { name: 'Save report delivery' }).click();
    await expect(delivery.getByRole('status')).toHaveText('Report delivery saved.');

    await page.reload();
    await hydrated(page);
    await expect(hours.getByRole('button', { name: `Remove ${label}` })).toBeVisible();
    await expect(attach).toBeChecked();

    // Put both back the same way, and see that they stay back.
    await hours.getByRole('button', { name: `Remove ${label}` }).click();
    await hours.getByRole('button', { name: 'Save opening hours' }).click();
    await expect(hours.getByRole('status')).toHaveText('Opening hours saved.');
    await attach.uncheck();
    await delivery.getByRole('button', { name: 'Save report delivery' }).click();
    await expect(delivery.getByRole('status')).toHaveText('Report delivery saved.');

    await page.reload();
    await hydrated(page);
    await expect(hours.getByRole('button', { name: `Remove ${label}` })).toHaveCount(0);
    await expect(attach).not.toBeChecked();
  } finally {
    await putBack(page, before, closed);
  }
});

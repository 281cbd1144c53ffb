import { expect, test, type Page } from '@playwright/test';
import { demo, signInAs, navigate } from './support';

// Names may not hold digits: each test spells a time stamp in letters.
const letters = (n: number) => [...String(n)].map((d) => 'abcdefghij'[Number(d)]).join('');

/** Waits until every React island on the page is hydrated, so a click is not lost. */
async function ready(page: Page) {
  await expect(page.locator('astro-island[ssr]')).toHaveCount(0);
}

async function openPatients(page: Page) {
  await page.goto('/patients');
  await ready(page);
}

async function fillNewPatient(page: Page, p: { family: string; given: string; birthDate: string }) {
  const form = page.getByRole('form', { name: 'New patient' });
  await form.getByLabel('Family name').fill(p.family);
  await form.getByLabel('Given name').fill(p.given);
  await form.getByLabel('Birth date').fill(p.birthDate);
  await form.getByRole('radio', { name: 'Female' }).check();
  await form.getByLabel('Phone').fill('+1 555 0142 311');
  await form.getByLabel('Address').fill('17 Gannet Close');
  await form.getByLabel('City').fill('East Quillby');
  await form.getByLabel('Postal code').fill('40822');
  return form;
}

test('the front desk finds a patient by part of the name and opens the record', async ({ page }) => {
  await signInAs(page, demo('desk').email);
  await navigate(page, 'Patients', '/patients');
  await expect(page.getByRole('heading', { name: 'Patients', level: 1 })).toBeVisible();
  await ready(page);

  // A seeded patient, whoever the demo seed made first in the alphabet.
  const { rows } = await (await page.request.get('/api/patients?pageSize=1&sort=name')).json();
  const seeded = rows[0] as { id: number; familyName: string; givenName: string; mrn: string };
  const fullName = `${seeded.familyName}, ${seeded.givenName}`;

  await page.getByLabel('Find a patient').fill(`${seeded.givenName.slice(0, 3)} ${seeded.familyName.slice(0, 4)}`);
  await expect(page.getByRole('status')).toContainText('Names starting with');
  await page.getByRole('link', { name: fullName }).click();

  await expect(page).toHaveURL(new RegExp(`/patients/${seeded.id}$`));
  await expect(page.getByRole('heading', { name: fullName, level: 1 })).toBeVisible();
  await expect(page.getByText(seeded.mrn).first()).toBeVisible();
  await expect(page.getByRole('heading', { name: 'Exams' })).toBeVisible();
  await expect(page.locator('#patient-actions')).toHaveCount(1);
});

test('the front desk registers a patient, and registering them again shows the duplicate warning', async ({ page }) => {
  const p = { family: `Wrenfield${letters(Date.now())}`, given: 'Odalys', birthDate: '1988-04-23' };
  await signInAs(page, demo('desk').email);
  await openPatients(page);
  await page.getByRole('button', { name: 'New patient' }).click();

  // Nothing typed: each missing field says so, before anything is sent.
  const empty = page.getByRole('form', { name: 'New patient' });
  await empty.getByRole('button', { name: 'Save patient' }).click();
  await expect(empty.getByText('Enter the family name.')).toBeVisible();
  await expect(empty.getByLabel('Family name')).toHaveAttribute('aria-invalid', 'true');

  let form = await fillNewPatient(page, p);
  await form.getByRole('button', { name: 'Save patient' }).click();
  await expect(page).toHaveURL(/\/patients\/\d+\?created=1$/);
  await expect(page.getByRole('status')).toContainText('Patient record created.');
  await expect(page.getByRole('heading', { name: `${p.family}, ${p.given}`, level: 1 })).toBeVisible();
  const firstRecord = new URL(page.url()).pathname;

  await openPatients(page);
  await page.getByRole('button', { name: 'New patient' }).click();
  form = await fillNewPatient(page, { ...p, family: p.family.toUpperCase() });
  await form.getByRole('button', { name: 'Save patient' }).click();

  const warning = page.getByRole('region', { name: 'Possible duplicate record' });
  await expect(warning).toBeVisible();
  await expect(warning.getByRole('alert')).toContainText('already has a record');
  const link = warning.getByRole('link', { name: `${p.family}, ${p.given}` });
  await expect(link).toHaveAttribute('href', firstRecord);
  await expect(warning).toContainText('Born 23 Apr 1988');
  await expect(form.getByRole('button', { name: 'Save patient' })).toBeDisabled();

  // Opening the existing record is one click away.
  await link.click();
  await expect(page).toHaveURL(new RegExp(`${firstRecord}$`));
});

test('saving anyway after the warning makes a second record, deliberately', async ({ page }) => {
  const p = { family: `Ashcombe${letters(Date.now())}`, given: 'Temperance', birthDate: '1961-11-05' };
  await signInAs(page, demo('admin').email);
  for (const attempt of [1, 2]) {
    await openPatients(page);
    await page.getByRole('button', { name: 'New patient' }).click();
    const form = await fillNewPatient(page, p);
    await form.getByRole('button', { name: 'Save patient' }).click();
    if (attempt === 2) {
      await page.getByRole('button', { name: 'This is a different person — save anyway' }).click();
    }
    await expect(page.getByRole('status')).toContainText('Patient record created.');
  }
  await openPatients(page);
  await page.getByLabel('Find a patient').fill(p.family);
  await expect(page.getByRole('link', { name: `${p.family}, ${p.given}` })).toHaveCount(2);
});

test('an edit made by someone else first is refused, and what was typed stays in the form', async ({ page }) => {
  const p = { family: `Pellow${letters(Date.now())}`, given: 'Ines', birthDate: '1990-01-31' };
  await signInAs(page, demo('desk').email);
  await openPatients(page);
  await page.getByRole('button', { name: 'New patient' }).click();
  await (await fillNewPatient(page, p)).getByRole('button', { name: 'Save patient' }).click();
  await expect(page.getByRole('status')).toContainText('Patient record created.');
  const id = Number(new URL(page.url()).pathname.split('/').pop());
  await ready(page);

  await page.getByRole('button', { name: 'Edit details' }).click();
  const form = page.getByRole('form', { name: 'Edit patient details' });
  await form.getByLabel('City').fill('Fernhollow');

  // Meanwhile, a colleague saves a change to the same record.
  const current = (await (await page.request.get(`/api/patients/${id}`)).json()).patient;
  const other = await page.request.patch(`/api/patients/${id}`, { data: { version: current.version, phone: '+1 555 0142 999' } });
  expect(other.status()).toBe(200);

  await form.getByRole('button', { name: 'Save changes' }).click();
  await expect(form.getByRole('alert')).toContainText('Someone else changed this patient record');
  await expect(form.getByLabel('City')).toHaveValue('Fernhollow');

  await form.getByRole('button', { name: 'load the latest version' }).click();
  await expect(form.getByLabel('Phone')).toHaveValue('+1 555 0142 999');
  await form.getByLabel('City').fill('Fernhollow');
  await form.getByRole('button', { name: 'Save changes' }).click();
  await expect(page.getByRole('status')).toContainText('Changes saved.');
  await expect(page.getByText('17 Gannet Close, 40822 Fernhollow')).toBeVisible();
});

test('a sonographer sees the patient list but cannot register or edit patients', async ({ page }) => {
  await signInAs(page, demo('sono1').email);
  await navigate(page, 'Patients', '/patients');
  await expect(page.getByRole('table')).toBeVisible();
  await expect(page.getByRole('link').filter({ hasText: ', ' }).first()).toBeVisible();
  await expect(page.getByRole('button', { name: 'New patient' })).toHaveCount(0);
  await page.getByRole('link').filter({ hasText: ', ' }).first().click();
  await expect(page.getByRole('heading', { name: 'Details' })).toBeVisible();
  await ready(page);
  await expect(page.getByRole('button', { name: 'Edit details' })).toHaveCount(0);
});

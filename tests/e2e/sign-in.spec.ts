import { expect, test } from '@playwright/test';
import { demo, hydrated, open, signInAs, navigate } from './support';

// What each role sees in the navigation rail (src/lib/navigation.ts).
const EXPECTED_NAV: Record<string, { role: string; sees: string[]; doesNotSee: string[] }> = {
  admin: { role: 'Clinic manager', sees: ['Today', 'Worklist', 'Schedule', 'Patients', 'Referring clinicians', 'Staff & access', 'Audit trail', 'Reference ranges', 'My account'], doesNotSee: [] },
  desk: { role: 'Front desk', sees: ['Today', 'Worklist', 'Schedule', 'Patients', 'Referring clinicians', 'My account'], doesNotSee: ['Staff & access', 'Audit trail', 'Reference ranges'] },
  sono1: { role: 'Sonographer', sees: ['Today', 'Worklist', 'Schedule', 'Patients', 'Reference ranges', 'My account'], doesNotSee: ['Referring clinicians', 'Staff & access', 'Audit trail'] },
  reader: { role: 'Reading physician', sees: ['Today', 'Worklist', 'Schedule', 'Patients', 'Reference ranges', 'My account'], doesNotSee: ['Referring clinicians', 'Staff & access', 'Audit trail'] },
  referrer: { role: 'Referring clinician', sees: ['Today', 'My account'], doesNotSee: ['Worklist', 'Schedule', 'Patients', 'Referring clinicians', 'Staff & access', 'Audit trail', 'Reference ranges'] },
};

for (const [key, expected] of Object.entries(EXPECTED_NAV)) {
  test(`${expected.role} signs in and sees their navigation`, async ({ page }) => {
    await signInAs(page, demo(key).email);
    await expect(page.getByTestId('current-role')).toHaveText(expected.role);
    const nav = page.getByRole('navigation', { name: 'Main', exact: true });
    for (const label of expected.sees) await expect(nav.getByRole('link', { name: label })).toBeVisible();
    for (const label of expected.doesNotSee) await expect(nav.getByRole('link', { name: label })).toHaveCount(0);
    await expect(page.getByRole('contentinfo')).toContainText('decision support');
  });
}

test('the sonographer home page lists their own exams for today', async ({ page }) => {
  await signInAs(page, demo('sono1').email);
  await expect(page.getByRole('region', { name: 'Your exams today' })).toBeVisible();
});

test('a front-desk user is turned away from the staff page', async ({ page }) => {
  await signInAs(page, demo('desk').email);
  const res = await page.goto('/admin/users');
  expect(res?.status()).toBe(403);
  await expect(page.getByRole('heading', { name: 'This page is not available for your role' })).toBeVisible();
});

test('a signed-out visitor is sent to sign in and returned afterwards', async ({ page }) => {
  await page.goto('/admin/audit');
  await expect(page).toHaveURL(/\/signin\?next=%2Fadmin%2Faudit/);
  await hydrated(page);
  await page.getByLabel('E-mail').fill(demo('admin').email);
  await page.getByLabel('Password').fill('crestline-demo');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByRole('heading', { name: 'Audit trail' })).toBeVisible();
});

test('a wrong password gets a clear message and no session', async ({ page }) => {
  await open(page, '/signin');
  await page.getByLabel('E-mail').fill(demo('reader').email);
  await page.getByLabel('Password').fill('not the password');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByRole('alert')).toContainText('do not match');
  await page.goto('/');
  await expect(page).toHaveURL(/\/signin/);
});

test('empty fields are announced before anything is sent', async ({ page }) => {
  await open(page, '/signin');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByText('Enter your e-mail address.')).toBeVisible();
  await expect(page.getByLabel('E-mail')).toHaveAttribute('aria-invalid', 'true');
});

test('signing out ends the session', async ({ page }) => {
  await signInAs(page, demo('sono2').email);
  await page.getByRole('button', { name: 'Sign out' }).first().click();
  await expect(page.getByText('You have signed out.')).toBeVisible();
  await page.goto('/account');
  await expect(page).toHaveURL(/\/signin/);
});

test('a reading physician looks up a reference range with its source and version', async ({ page }) => {
  await signInAs(page, demo('reader').email);
  await navigate(page, 'Reference ranges', '/admin/reference-ranges');
  await page.getByLabel('Measurement').fill('lvmi');
  await page.getByRole('button', { name: 'Show' }).click();
  const women = page.getByRole('row', { name: /LV mass index.*Women/ });
  await expect(women).toContainText('43–95');
  await expect(women).toContainText('Lang RM et al.');
  await expect(page.getByText(/Reference set crestline-ref-1\.0\.0/)).toBeVisible();
});

import { expect, test } from '@playwright/test';
import { ExamType } from '../../src/db/models';
import { closeTestDb, testDb } from '../helpers/db';
import { demo, hydrated, navigate, signInAs } from './support';

// Other browser tests book thyroid exams: its price and preparation text are put back at the end.
let restore: (() => Promise<void>) | null = null;
test.afterAll(async () => {
  await restore?.();
  await closeTestDb();
});

test("the manager changes an exam type's price and preparation text, and they are kept", async ({ page }) => {
  testDb();
  const type = (await ExamType.findOne({ where: { code: 'thyroid' } }))!;
  const before = { selfPayPriceCents: type.selfPayPriceCents, preparationText: type.preparationText };
  restore = async () => {
    await type.reload();
    await type.update({ ...before, version: type.version + 1 });
  };
  const preparation = `No preparation is needed. Please arrive ten minutes early (${Date.now()}).`;

  await signInAs(page, demo('admin').email);
  await navigate(page, 'Catalog', '/admin/catalog');
  const row = page.getByRole('table', { name: 'Exam types' }).getByRole('row', { name: /Thyroid ultrasound/ });
  await expect(row).toContainText('$180.00');

  await page.getByRole('button', { name: 'Edit Thyroid ultrasound' }).click();
  const form = page.getByRole('form', { name: 'Edit Thyroid ultrasound' });
  const price = form.getByLabel(/^Self-pay price/);
  await price.fill('one ninety');
  await form.getByRole('button', { name: 'Save changes' }).click();
  await expect(form.getByText('Enter an amount such as 180 or 180.00.')).toBeVisible();

  await price.fill('195.50');
  await form.getByLabel('Preparation instructions').fill(preparation);
  await form.getByRole('button', { name: 'Save changes' }).click();
  await expect(page.getByRole('status')).toHaveText('Changes to Thyroid ultrasound saved.');
  await expect(form).toBeHidden();
  await expect(row).toContainText('$195.50');
  await expect(row).toContainText('$50.00');

  // Saved, not just shown: a fresh page reads them back.
  await page.reload();
  await hydrated(page);
  await page.getByRole('button', { name: 'Edit Thyroid ultrasound' }).click();
  await expect(form.getByLabel(/^Self-pay price/)).toHaveValue('195.50');
  await expect(form.getByLabel('Preparation instructions')).toHaveValue(preparation);
  await type.reload();
  expect({ selfPayPriceCents: type.selfPayPriceCents, preparationText: type.preparationText, version: type.version }).toEqual({
    selfPayPriceCents: 19_550,
    preparationText: preparation,
    version: expect.any(Number),
  });
});

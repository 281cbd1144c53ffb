import { expect, test, type Page } from '@playwright/test';
import { QueryTypes } from 'sequelize';
import { ExamType, Patient, Referrer, User } from '../../src/db/models';
import { closeTestDb, testDb } from '../helpers/db';
import { DEMO_PASSWORD, demo, hydrated, open, signInAs } from './support';

// The whole journey of one exam, each step by its own person in their own browser session:
// the front desk books and checks in, the sonographer records a thyroid exam with a nodule and
// submits, the reading physician records the urgent call the engine suggests, edits the
// impression and signs, the referrer opens the link in the e-mail and reads the final report
// and its PDF; then an addendum reaches the referrer the same way.

test.afterAll(async () => {
  await closeTestDb();
});

type Mail = { subject: string; text: string };
async function mailFor(accession: string, subjectStart: string): Promise<Mail> {
  let mail: Mail | undefined;
  await expect
    .poll(async () => {
      const inbox = (await (await fetch(`${process.env.MAILDEV_URL}/email`)).json()) as Mail[];
      mail = inbox.find((m) => m.subject.includes(accession) && m.subject.startsWith(subjectStart));
      return mail !== undefined;
    }, { timeout: 20_000, message: `the "${subjectStart}" e-mail for ${accession}` })
    .toBe(true);
  return mail!;
}

async function signedInPage(page: Page, key: string): Promise<Page> {
  const context = await page.context().browser()!.newContext({ baseURL: process.env.APP_URL });
  const p = await context.newPage();
  await signInAs(p, demo(key).email);
  return p;
}

test('desk books, sonographer records a thyroid nodule, physician signs, referrer reads the report and its PDF, then an addendum', async ({ page }) => {
  test.setTimeout(150_000);
  testDb();
  const referrerUser = (await User.findOne({ where: { email: demo('referrer').email } }))!;
  const referrer = (await Referrer.findByPk(referrerUser.referrerId!))!;
  const thyroid = (await ExamType.findOne({ where: { templateId: 'thyroid' } }))!;
  const patient = (await Patient.findOne({ where: { sex: 'female' }, order: [['id', 'DESC']] }))!;

  // 1. The front desk books the exam for the demo referrer's patient and checks her in.
  await signInAs(page, demo('desk').email);
  await open(page, '/exams/new');
  await page.getByLabel('Patient').fill(patient.mrn);
  await page.getByRole('list', { name: 'Matching patients' }).getByRole('button').first().click();
  await page.getByLabel('Exam', { exact: true }).selectOption({ label: `${thyroid.name} (${thyroid.durationMinutes} min)` });
  await page.getByLabel(/^Referring clinician/).fill(referrer.name.replace(/^Dr /, ''));
  await page.getByRole('list', { name: 'Matching referring clinicians' }).getByRole('button').first().click();
  await page.getByLabel('Indication').fill('Palpable nodule, right neck');
  await page.getByLabel('Insurer').check();
  await page.getByLabel('Room').selectOption({ label: 'Room 1' });
  await page.getByRole('group', { name: 'Next free times' }).getByRole('button').first().click();
  await page.getByRole('button', { name: 'Book exam' }).click();
  await expect(page.getByRole('heading', { name: /^Booked: / })).toBeVisible();
  await page.getByRole('link', { name: 'Open the exam' }).click();
  await page.waitForURL(/\/exams\/\d+$/);
  const examId = Number(new URL(page.url()).pathname.split('/').pop());
  await hydrated(page);
  await page.getByRole('button', { name: 'Check in' }).click();
  await expect(page.getByRole('status')).toContainText('Checked in');
  const accession = (await testDb().query<{ accession_number: string }>('SELECT accession_number FROM exams WHERE id = ?', { replacements: [examId], type: QueryTypes.SELECT }))[0]!.accession_number;

  // 2. The sonographer starts the scan and records the thyroid with one nodule.
  const sono = await signedInPage(page, 'sono1');
  await open(sono, `/exams/${examId}`);
  await sono.getByRole('button', { name: 'Start scan' }).click();
  await sono.waitForURL(new RegExp(`/exams/${examId}/report$`));
  await hydrated(sono);
  const lobe = (name: string) => sono.getByRole('region', { name });
  await lobe('Right lobe').getByRole('textbox', { name: 'Length (craniocaudal), cm' }).fill('5.1');
  await lobe('Right lobe').getByRole('textbox', { name: 'Width (transverse), cm' }).fill('1.9');
  await lobe('Right lobe').getByRole('textbox', { name: 'Depth (anteroposterior), cm' }).fill('1.7');
  await lobe('Left lobe').getByRole('textbox', { name: 'Length (craniocaudal), cm' }).fill('4.6');
  await lobe('Left lobe').getByRole('textbox', { name: 'Width (transverse), cm' }).fill('1.5');
  await lobe('Left lobe').getByRole('textbox', { name: 'Depth (anteroposterior), cm' }).fill('1.4');
  await sono.getByRole('textbox', { name: 'Isthmus thickness (AP), mm' }).fill('3');
  await sono.getByRole('radio', { name: 'Homogeneous' }).check();
  // ACR TI-RADS (Tessler et al. JACR 2017, CLINICAL.md §3): solid 2 + very hypoechoic 3 +
  // taller-than-wide 3 + smooth 0 + no foci 0 = 8 points, TR5; 14 mm meets the TR5 FNA size (≥ 1.0 cm).
  await sono.getByRole('button', { name: 'Add nodule' }).click();
  const nodule = sono.getByRole('group', { name: 'Nodule N1' });
  await nodule.getByLabel('Location').selectOption('right');
  await nodule.getByRole('textbox', { name: 'Length (craniocaudal), mm' }).fill('14');
  await nodule.getByRole('textbox', { name: 'Width (transverse), mm' }).fill('9');
  await nodule.getByRole('textbox', { name: 'Depth (AP), mm' }).fill('11');
  await nodule.getByLabel('Composition').selectOption('solid');
  await nodule.getByLabel('Echogenicity').selectOption('very-hypoechoic');
  await nodule.getByLabel('Shape').selectOption('taller-than-wide');
  await nodule.getByLabel('Margin').selectOption('smooth');
  await nodule.getByLabel(/^No echogenic foci/).check();
  await expect(nodule.getByTestId('nodule-result')).toContainText('8 pts');
  await expect(nodule.getByTestId('nodule-result')).toContainText('TR5');
  await expect(nodule.getByTestId('nodule-result')).toContainText('FNA');
  await sono.getByRole('button', { name: 'Submit preliminary' }).click();
  await expect(sono.getByRole('heading', { name: 'Submitted: waiting for the reading physician' })).toBeVisible();

  // 3. The reading physician opens it from the queue, records the call the engine suggests,
  //    writes the impression and signs with the password.
  const reader = await signedInPage(page, 'reader');
  await open(reader, '/reading');
  await reader.getByRole('row').filter({ hasText: accession }).getByRole('link').first().click();
  await reader.waitForURL(new RegExp(`/exams/${examId}/report$`));
  await hydrated(reader);
  await expect(reader.getByTestId('claim-status')).toHaveText('You are reading this report.');
  await expect(reader.getByTestId('nodule-N1')).toContainText('TR5');
  const urgent = reader.getByRole('region', { name: 'Urgent communication' });
  await urgent.getByRole('button', { name: 'Record a call about this' }).click();
  const call = urgent.getByRole('form', { name: 'Record an urgent communication' });
  await expect(call.getByLabel('Finding communicated')).toHaveValue(/TR5 nodule meeting FNA size/);
  await expect(call.getByLabel('Told to')).toHaveValue(referrer.name);
  await call.getByLabel('They read the finding back to me, and I confirmed it.').check();
  await call.getByRole('button', { name: 'Record communication' }).click();
  await expect(reader.getByTestId('communications')).toContainText(`Told to ${referrer.name} (referring physician) by telephone`);
  await hydrated(reader);
  await reader.getByRole('textbox', { name: 'Impression' }).click();
  await reader.keyboard.type('TR5 nodule of the right lobe, 14 mm: fine-needle aspiration recommended.');
  await reader.getByRole('button', { name: 'Save', exact: true }).click();
  await expect(reader.getByTestId('reading-status')).toContainText('Saved');
  await reader.getByRole('button', { name: 'Sign report…' }).click();
  const signForm = reader.getByRole('form', { name: 'Sign the report' });
  await signForm.getByLabel('Your password').fill(DEMO_PASSWORD);
  await signForm.getByRole('button', { name: 'Sign', exact: true }).click();
  await expect(reader.getByTestId('report-status')).toHaveText('Report: Final');
  await expect(reader.getByTestId('signed-impression')).toContainText('fine-needle aspiration recommended');

  // 4. The referrer follows the e-mailed link, signs in, reads the final report and its PDF.
  const ready = await mailFor(accession, 'Report ready');
  expect(ready.text).not.toContain('TR5');
  expect(ready.text).not.toContain(patient.familyName);
  const link = new URL(/https?:\/\/\S+\/r\/[A-Za-z0-9_-]+/.exec(ready.text)![0]).pathname;
  const referrerContext = await page.context().browser()!.newContext({ baseURL: process.env.APP_URL });
  const ref = await referrerContext.newPage();
  await ref.goto(link);
  await expect(ref).toHaveURL(/\/signin/);
  await hydrated(ref);
  await ref.getByLabel('E-mail').fill(demo('referrer').email);
  await ref.getByLabel('Password').fill(DEMO_PASSWORD);
  await ref.getByRole('button', { name: 'Sign in' }).click();
  await expect(ref).toHaveURL(/\/reports\/\d+$/);
  await expect(ref.getByTestId('report-status')).toHaveText('Report: Final');
  await expect(ref.getByTestId('signed-impression')).toContainText('fine-needle aspiration recommended');
  await expect(ref.getByTestId('communications')).toContainText('the finding was read back');
  const pdf = await ref.request.get((await ref.getByRole('link', { name: 'Report as PDF' }).getAttribute('href'))!);
  expect(pdf.status()).toBe(200);
  expect(pdf.headers()['content-type']).toBe('application/pdf');
  expect((await pdf.body()).subarray(0, 5).toString()).toBe('%PDF-');

  // 5. A correction is an addendum: signed the same way, the report becomes amended, and the
  //    referrer is told again.
  await open(reader, `/exams/${examId}/report`);
  const addendum = reader.getByRole('region', { name: 'Addendum' });
  await addendum.getByRole('button', { name: 'Write an addendum…' }).click();
  await addendum.getByRole('textbox', { name: 'Addendum text' }).click();
  await reader.keyboard.type('Aspiration booked with the endocrine clinic.');
  await addendum.getByLabel('Your password').fill(DEMO_PASSWORD);
  await addendum.getByRole('button', { name: 'Sign addendum' }).click();
  await expect(reader.getByTestId('report-status')).toHaveText('Report: Amended');
  await expect(reader.getByTestId('addendum')).toContainText('Aspiration booked with the endocrine clinic.');
  const corrected = await mailFor(accession, 'Report corrected');
  await ref.goto(new URL(/https?:\/\/\S+\/r\/[A-Za-z0-9_-]+/.exec(corrected.text)![0]).pathname);
  await expect(ref.getByTestId('addendum')).toContainText('Aspiration booked with the endocrine clinic.');
  await referrerContext.close();
});

import sharp from 'sharp';
import { expect, test, type APIRequestContext, type Browser, type BrowserContext, type Page } from '@playwright/test';
import { ExamType, Patient, Room, Scanner, User } from '../../src/db/models';
import { addDays, zonedDate, zonedTimeToUtc } from '../../src/lib/time';
import { clinicProfile } from '../../src/server/services/settings';
import { closeTestDb, testDb } from '../helpers/db';
import { demo, open, signInAs } from './support';

// The API is driven through signed-in browser contexts (the shared HTTP helpers import JSON
// in a way Playwright's loader refuses); the catalog is read from the test database.
const baseURL = process.env.APP_URL;
let timeZone = 'UTC';
let rooms: Array<{ id: number; scannerId: number; sonographerId: number }> = [];
let types: Record<string, number> = {};
let patients: Patient[] = [];
let desk: BrowserContext;

async function signedIn(browser: Browser, key: string): Promise<BrowserContext> {
  const context = await browser.newContext({ baseURL });
  const page = await context.newPage();
  await signInAs(page, demo(key).email);
  await page.close();
  return context;
}

/** A JSON request with the session of `who`; returns status and body. */
async function send(who: APIRequestContext, method: string, path: string, data?: unknown): Promise<{ status: number; body: any }> {
  const res = await who.fetch(path, { method, data, headers: { Origin: baseURL! } });
  return { status: res.status(), body: await res.json().catch(() => null) };
}

test.beforeAll(async ({ browser }) => {
  testDb();
  timeZone = (await clinicProfile()).timeZone;
  const [roomRows, scanners, sonographers, typeRows] = await Promise.all([
    Room.findAll({ order: [['id', 'ASC']] }),
    Scanner.findAll({ order: [['id', 'ASC']] }),
    User.findAll({ where: { role: 'sonographer', active: true }, order: [['id', 'ASC']] }),
    ExamType.findAll(),
  ]);
  // Room i is worked by the i-th sonographer, as in the demo clinic (sono1 in Room 1 … sono3 in Room 3).
  rooms = roomRows.map((r, i) => ({ id: r.id, scannerId: scanners.find((s) => s.roomId === r.id)!.id, sonographerId: sonographers[i % sonographers.length]!.id }));
  types = Object.fromEntries(typeRows.map((t) => [t.code, t.id]));
  patients = await Patient.findAll({ where: { sex: ['female', 'male'] }, order: [['id', 'ASC']], limit: 12 });
  desk = await signedIn(browser, 'desk');
});
test.afterAll(async () => {
  await desk?.close();
  await closeTestDb();
});

/** A weekday well after the demo week, different for each n (as tests/helpers/booking.ts testDay). */
function testDay(n: number): string {
  let day = addDays(zonedDate(new Date(), timeZone), 40 + n * 3);
  while ([0, 6].includes(new Date(`${day}T12:00:00Z`).getUTCDay())) day = addDays(day, 1);
  return day;
}

const ROOM = { thyroid: 0, 'abdomen-complete': 0, 'echo-tte': 2 } as const;

/**
 * Books an exam as the front desk on a test day of its own (n 50–60), checks the patient in,
 * and starts the scan as the signed-in sonographer of `page`: the draft report exists.
 */
async function startedExam(page: Page, type: keyof typeof ROOM, n: number, patientIndex: number) {
  const room = rooms[ROOM[type]]!;
  for (let hour = 8; hour < 17; hour += 1) {
    const res = await send(desk.request, 'POST', '/api/exams', {
      patientId: patients[patientIndex]!.id, examTypeId: types[type], referrerId: null, indication: 'Structured report test', priority: 'routine', payer: 'insured',
      roomId: room.id, scannerId: room.scannerId, sonographerId: room.sonographerId, start: zonedTimeToUtc(testDay(n), hour, 0, timeZone).toISOString(),
    });
    if (res.status === 409) continue; // a slot taken by an earlier run against the same database
    expect(res.status).toBe(201);
    const exam = res.body.exam as { id: number; accessionNumber: string };
    expect((await send(desk.request, 'POST', `/api/exams/${exam.id}/status`, { version: 0, to: 'arrived' })).status).toBe(200);
    const started = await send(page.request, 'POST', `/api/exams/${exam.id}/start`, { version: 1 });
    expect(started.status).toBe(200);
    return { ...exam, reportId: started.body.reportId as number };
  }
  throw new Error('no free slot on the test day');
}

const section = (page: Page, name: string | RegExp) => page.getByRole('region', { name });
const savedStatus = /^Saved \d\d:\d\d:\d\d/;

test('the sonographer records a thyroid exam, it is saved, and the submitted report reaches the reading queue', async ({ page, browser }) => {
  test.setTimeout(90_000);
  await signInAs(page, demo('sono1').email);
  const exam = await startedExam(page, 'thyroid', 50, 0);
  await open(page, `/exams/${exam.id}/report`);
  await expect(page.getByTestId('save-status')).toHaveText('Nothing entered yet');
  await expect(page.getByTestId('caution')).toContainText('decision support');

  // Enter moves along the scan: the three right-lobe diameters without touching the mouse.
  const right = section(page, 'Right lobe');
  await right.getByRole('textbox', { name: 'Length (craniocaudal), cm' }).click();
  await page.keyboard.type('4.8');
  await page.keyboard.press('Enter');
  await page.keyboard.type('1.6');
  await page.keyboard.press('Enter');
  await page.keyboard.type('1.5');
  await expect(right.getByRole('textbox', { name: 'Depth (anteroposterior), cm' })).toHaveValue('1.5');
  // CLINICAL.md §1.1: 4.8 × 1.6 × 1.5 cm, π/6 → 6.0 mL
  await expect(page.getByTestId('derived-rightLobeVolumeMl')).toContainText('6.0 mL');

  const left = section(page, 'Left lobe');
  await left.getByRole('textbox', { name: 'Length (craniocaudal), cm' }).fill('4.5');
  await left.getByRole('textbox', { name: 'Width (transverse), cm' }).fill('1.5');
  await left.getByRole('textbox', { name: 'Depth (anteroposterior), cm' }).fill('1.4');
  // §1.1: left 4.5 × 1.5 × 1.4 → 4.9 mL; total of the lobes 10.98 → 11.0 mL
  await expect(page.getByTestId('derived-leftLobeVolumeMl')).toContainText('4.9 mL');
  await expect(page.getByTestId('derived-thyroidVolumeMl')).toContainText('11.0 mL');

  // §3.4 T1: solid, hypoechoic, wider-than-tall, smooth, no foci → 4 points, TR4; 1.2 cm → follow-up.
  await page.getByRole('button', { name: 'Add nodule' }).click();
  const nodule = page.getByRole('group', { name: 'Nodule N1' });
  await nodule.getByLabel('Location').selectOption('right');
  await nodule.getByRole('textbox', { name: 'Length (craniocaudal), mm' }).fill('12');
  await nodule.getByRole('textbox', { name: 'Width (transverse), mm' }).fill('10');
  await nodule.getByRole('textbox', { name: 'Depth (AP), mm' }).fill('8');
  await expect(nodule).toContainText('Still needed to score this nodule: composition, echogenicity, shape, margin');
  await nodule.getByLabel('Composition').selectOption('solid');
  await nodule.getByLabel('Echogenicity').selectOption('hypoechoic');
  await nodule.getByLabel('Shape').selectOption('wider-than-tall');
  await nodule.getByLabel('Margin').selectOption('smooth');
  await nodule.getByLabel(/^No echogenic foci/).check();
  await expect(nodule.getByTestId('nodule-result')).toContainText('4 pts');
  await expect(nodule.getByTestId('nodule-result')).toContainText('TR4, moderately suspicious');
  await expect(nodule.getByTestId('nodule-result')).toContainText('Follow-up at 1, 2, 3 and 5 years');
  await expect(page.getByTestId('findings-preview')).toContainText('Total thyroid volume 11.0 mL');

  await expect(page.getByTestId('save-status')).toHaveText(savedStatus);
  await open(page, `/exams/${exam.id}/report`);
  await expect(section(page, 'Right lobe').getByRole('textbox', { name: 'Length (craniocaudal), cm' })).toHaveValue('4.8');
  await expect(section(page, 'Left lobe').getByRole('textbox', { name: 'Depth (anteroposterior), cm' })).toHaveValue('1.4');
  await expect(page.getByRole('group', { name: 'Nodule N1' }).getByLabel('Margin')).toHaveValue('smooth');
  await expect(page.getByTestId('derived-thyroidVolumeMl')).toContainText('11.0 mL');

  // The isthmus and the echotexture are still missing: the server says so and the form goes there.
  await page.getByRole('button', { name: 'Submit preliminary' }).click();
  await expect(page.getByRole('alert').filter({ hasText: 'Not submitted: 2 required values are still missing' })).toBeVisible();
  const isthmus = page.getByRole('textbox', { name: 'Isthmus thickness (AP), mm' });
  await expect(isthmus).toBeFocused();
  await expect(isthmus).toHaveAttribute('aria-invalid', 'true');
  await expect(page.getByRole('radiogroup', { name: 'Echotexture' })).toHaveAttribute('aria-invalid', 'true');

  await page.keyboard.type('3');
  await page.getByRole('radio', { name: 'Homogeneous' }).check();
  await expect(isthmus).not.toHaveAttribute('aria-invalid', 'true');

  // An image of the scan goes with the report, from the same page.
  const png = await sharp({ create: { width: 320, height: 240, channels: 3, background: '#1d4f6e' } }).png().toBuffer();
  const images = page.getByRole('region', { name: 'Images' });
  await images.getByLabel('Add images').setInputFiles([{ name: 'right-lobe-transverse.png', mimeType: 'image/png', buffer: png }]);
  await expect(images.getByRole('list', { name: 'Uploads' }).getByRole('listitem').filter({ hasText: 'right-lobe-transverse.png' })).toContainText('Added');

  await page.getByRole('button', { name: 'Submit preliminary' }).click();
  await expect(page.getByRole('heading', { name: 'Submitted: waiting for the reading physician' })).toBeVisible();
  await expect(page.getByRole('link', { name: 'Back to the worklist' })).toHaveAttribute('href', '/worklist');

  const readerContext = await signedIn(browser, 'reader');
  const reader = await readerContext.newPage();
  await open(reader, '/reading');
  const row = reader.getByRole('row').filter({ hasText: exam.accessionNumber });
  await expect(row).toHaveCount(1);
  await row.getByRole('link').first().click();
  await expect(reader.getByTestId('report-status')).toHaveText('Report: Preliminary');
  await expect(reader.getByTestId('derived-thyroidVolumeMl')).toContainText('11.0 mL');
  await expect(reader.getByTestId('nodule-N1')).toContainText('TR4');
  await expect(reader.getByTestId('flag-thyroidVolumeMl')).toContainText('crestline-ref');
  // The measurements are read-only for the physician; what they write is findings and impression.
  await expect(reader.getByTestId('report-summary').getByRole('textbox')).toHaveCount(0);
  await expect(reader.getByRole('textbox', { name: 'Impression' })).toBeVisible();
  await readerContext.close();
});

test('a stale save shows who saved, keeps what was typed, and saves over it only when asked', async ({ page, browser }) => {
  test.setTimeout(60_000);
  await signInAs(page, demo('sono1').email);
  const exam = await startedExam(page, 'thyroid', 52, 1);
  await open(page, `/exams/${exam.id}/report`);
  const right = section(page, 'Right lobe');
  await right.getByRole('textbox', { name: 'Length (craniocaudal), cm' }).fill('4.8');
  await expect(page.getByTestId('save-status')).toHaveText(savedStatus);

  // Meanwhile a colleague saves the same draft from another workstation.
  const colleague = await signedIn(browser, 'sono2');
  const theirs = await send(colleague.request, 'PUT', `/api/reports/${exam.reportId}/draft`, { version: 1, measurements: { rightLobeLengthCm: 5.0 }, nodules: [], heightCm: null, weightKg: null, probeId: null });
  expect(theirs.status).toBe(200);

  await right.getByRole('textbox', { name: 'Width (transverse), cm' }).fill('1.6');
  const notice = page.getByRole('alert').filter({ hasText: 'saved this report' });
  await expect(notice).toContainText(`${demo('sono2').displayName} saved this report`);
  await expect(notice).toContainText('Right lobe: Length (craniocaudal)');
  await expect(page.getByTestId('save-status')).toContainText('Not saved');
  await expect(right.getByRole('textbox', { name: 'Width (transverse), cm' })).toHaveValue('1.6');
  await expect(right.getByRole('textbox', { name: 'Length (craniocaudal), cm' })).toHaveValue('4.8');

  await notice.getByRole('button', { name: 'Keep mine and save over it' }).click();
  await expect(page.getByTestId('save-status')).toHaveText(savedStatus);
  await expect(notice).toHaveCount(0);
  const stored = await send(colleague.request, 'GET', `/api/reports/${exam.reportId}`);
  expect(stored.body.report).toMatchObject({ version: 3, measurements: { rightLobeLengthCm: 4.8, rightLobeWidthCm: 1.6 } });

  // Once more, and this time take theirs.
  expect((await send(colleague.request, 'PUT', `/api/reports/${exam.reportId}/draft`, { version: 3, measurements: { rightLobeLengthCm: 5.2 }, nodules: [], heightCm: null, weightKg: null, probeId: null })).status).toBe(200);
  await right.getByRole('textbox', { name: 'Depth (anteroposterior), cm' }).fill('1.5');
  await page.getByRole('alert').filter({ hasText: 'saved this report' }).getByRole('button', { name: 'Load their version' }).click();
  await expect(right.getByRole('textbox', { name: 'Length (craniocaudal), cm' })).toHaveValue('5.2');
  await expect(right.getByRole('textbox', { name: 'Width (transverse), cm' })).toHaveValue('');
  await expect(page.getByTestId('save-status')).toHaveText(savedStatus);
  await colleague.close();
});

test('the echo form shows LVMI with its flag, and the flag’s range and source open on keyboard focus', async ({ page }) => {
  test.setTimeout(60_000);
  await signInAs(page, demo('sono3').email);
  const exam = await startedExam(page, 'echo-tte', 54, 2);
  await open(page, `/exams/${exam.id}/report`);
  await page.getByRole('textbox', { name: 'Height, cm' }).fill('170');
  await page.getByRole('textbox', { name: 'Weight, kg' }).fill('70');
  // CLINICAL.md §1.3 M1: 1.0 / 5.0 / 1.0 cm, 170 cm / 70 kg → LV mass 182 g, BSA 1.82 m², LVMI 100 g/m²
  const plax = section(page, /^Parasternal long axis/);
  await plax.getByRole('textbox', { name: 'IVSd, cm' }).fill('1.0');
  await plax.getByRole('textbox', { name: 'LVIDd, cm' }).fill('5.0');
  await plax.getByRole('textbox', { name: 'PWd, cm' }).fill('1.0');
  await expect(page.getByTestId('derived-bsaM2')).toContainText('1.82 m²');
  await expect(plax.getByTestId('derived-lvMassG')).toContainText('182 g');
  await expect(plax.getByTestId('derived-lvmiGM2')).toContainText('100 g/m²');

  const flag = page.getByTestId('flag-lvmiGM2');
  await expect(flag).toHaveText(/Normal|High|Low|not applied/);
  // Reach it with the keyboard alone, from the PWd box.
  await plax.getByRole('textbox', { name: 'PWd, cm' }).focus();
  for (let i = 0; i < 40 && !(await flag.evaluate((el) => el === document.activeElement)); i += 1) await page.keyboard.press('Tab');
  await expect(flag).toBeFocused();
  const tip = page.locator(`[id="${await flag.getAttribute('aria-describedby')}"]`);
  await expect(tip).toBeVisible();
  await expect(tip).toContainText(/Reference 43–95 g\/m² \(women\)|Reference 49–115 g\/m² \(men\)/);
  await expect(tip).toContainText('Source: Lang RM et al.');
  await expect(tip).toContainText('Reference set crestline-ref');
  await page.keyboard.press('Tab');
  await expect(tip).toBeHidden();
});

test('the abdomen form computes the spleen volume', async ({ page }) => {
  await signInAs(page, demo('sono1').email);
  await startedExam(page, 'abdomen-complete', 56, 3).then((exam) => open(page, `/exams/${exam.id}/report`));
  const spleen = section(page, 'Spleen');
  // CLINICAL.md §1.1: 12.0 × 7.0 × 4.5 cm, π/6 → 197.9 → 198 mL
  await spleen.getByRole('textbox', { name: 'Spleen length, cm' }).fill('12');
  await spleen.getByRole('textbox', { name: 'Spleen width, cm' }).fill('7');
  await expect(spleen.getByTestId('derived-spleenVolumeMl')).toHaveCount(0);
  await spleen.getByRole('textbox', { name: 'Spleen depth, cm' }).fill('4.5');
  await expect(spleen.getByTestId('derived-spleenVolumeMl')).toContainText('198 mL');
  // A value in the wrong unit is refused on its field, not flagged.
  await spleen.getByRole('textbox', { name: 'Spleen width, cm' }).fill('70');
  await expect(spleen.getByRole('textbox', { name: 'Spleen width, cm' })).toHaveAttribute('aria-invalid', 'true');
  await expect(spleen.getByRole('alert')).toContainText('plausible range');
  await expect(spleen.getByTestId('derived-spleenVolumeMl')).toHaveCount(0);
});

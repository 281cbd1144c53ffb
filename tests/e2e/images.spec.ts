import { expect, test, type Browser } from '@playwright/test';
import sharp from 'sharp';
import { Exam, ExamType, Patient, Room, Scanner, User } from '../../src/db/models';
import { addDays, zonedDate, zonedTimeToUtc } from '../../src/lib/time';
import { clinicProfile } from '../../src/server/services/settings';
import { closeTestDb, testDb } from '../helpers/db';
import { makeUltrasoundDicom } from '../helpers/dicom';
import { demo, open, signInAs } from './support';

test.afterAll(closeTestDb);

/** A weekday of its own for test `n`, after the days the API tests book (as testDay(40 + n) would be). */
function emptyDay(n: number, timeZone: string): string {
  let day = addDays(zonedDate(new Date(), timeZone), 40 + (40 + n) * 3);
  while ([0, 6].includes(new Date(`${day}T12:00:00Z`).getUTCDay())) day = addDays(day, 1);
  return day;
}

/** Books a thyroid exam through the API as the front desk and, unless told, checks the patient in. */
async function examFor(browser: Browser, n: number, arrive = true) {
  testDb();
  const { timeZone } = await clinicProfile();
  const [room] = await Room.findAll({ order: [['id', 'ASC']], limit: 1 });
  const scanner = await Scanner.findOne({ where: { roomId: room!.id } });
  const sonographer = await User.findOne({ where: { role: 'sonographer', active: true }, order: [['id', 'ASC']] });
  const type = await ExamType.findOne({ where: { code: 'thyroid' } });
  const patient = (await Patient.findAll({ order: [['id', 'ASC']], limit: 20 }))[10 + n]!;
  const context = await browser.newContext();
  let id: number;
  try {
    const desk = await context.newPage();
    await signInAs(desk, demo('desk').email);
    const booked = await desk.request.post('/api/exams', {
      data: {
        patientId: patient.id, examTypeId: type!.id, referrerId: null, indication: 'Thyroid nodule follow-up', priority: 'routine', payer: 'insured',
        roomId: room!.id, scannerId: scanner!.id, sonographerId: sonographer!.id, start: zonedTimeToUtc(emptyDay(n, timeZone), 10, 0, timeZone).toISOString(),
      },
    });
    expect(booked.status()).toBe(201);
    id = (await booked.json()).exam.id as number;
    if (arrive) expect((await desk.request.post(`/api/exams/${id}/status`, { data: { version: 0, to: 'arrived' } })).status()).toBe(200);
  } finally {
    await context.close();
  }
  const exam = (await Exam.findByPk(id))!;
  return { id: exam.id, accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid, mrn: patient.mrn };
}

test('a sonographer adds a PNG and a DICOM image, sees both, views the DICOM drawn in the browser, and a wrong-patient file is refused', async ({ page, browser }) => {
  const exam = await examFor(browser, 0);
  const png = await sharp({ create: { width: 320, height: 240, channels: 3, background: '#1d4f6e' } })
    .composite([{ input: Buffer.from('<svg width="320" height="240"><circle cx="160" cy="120" r="60" fill="#f0f0f0"/></svg>') }])
    .png()
    .toBuffer();
  const dicom = makeUltrasoundDicom({ patientId: exam.mrn, accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid, rows: 240, columns: 320 });

  await signInAs(page, demo('sono1').email);
  await open(page, `/exams/${exam.id}`);
  const images = page.getByRole('region', { name: 'Images' });
  await expect(images.getByText('No images yet.')).toBeVisible();

  await images.getByLabel('Add images').setInputFiles([
    { name: 'neck-transverse.png', mimeType: 'image/png', buffer: png },
    { name: 'IM0001.dcm', mimeType: 'application/dicom', buffer: dicom },
  ]);
  const uploads = images.getByRole('list', { name: 'Uploads' });
  await expect(uploads.getByRole('listitem').filter({ hasText: 'neck-transverse.png' })).toContainText('Added');
  await expect(uploads.getByRole('listitem').filter({ hasText: 'IM0001.dcm' })).toContainText('Added');

  // Both thumbnails show, each drawn from a real image the server made.
  const grid = images.getByRole('list', { name: 'Images of this exam' });
  await expect(grid.getByRole('button')).toHaveCount(2);
  for (const name of ['neck-transverse.png', 'IM0001.dcm']) {
    const thumb = grid.getByRole('button', { name: `Open ${name}` }).locator('img');
    await expect.poll(() => thumb.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(320);
  }

  // The DICOM opens in a dialog and is drawn in a canvas: the bright disc in the middle, dark corners.
  await grid.getByRole('button', { name: 'Open IM0001.dcm' }).click();
  const dialog = page.getByRole('dialog', { name: 'IM0001.dcm' });
  await expect(dialog).toBeVisible();
  const canvas = dialog.getByRole('img', { name: 'IM0001.dcm, first frame' });
  await expect(canvas).toBeVisible();
  const pixels = await canvas.evaluate((c: HTMLCanvasElement) => {
    const { data } = c.getContext('2d')!.getImageData(0, 0, c.width, c.height);
    const at = (x: number, y: number) => data[(y * c.width + x) * 4]!;
    let lit = 0;
    for (let i = 0; i < data.length; i += 4) if (data[i]! > 0) lit++;
    return { width: c.width, height: c.height, centre: at(160, 120), corner: at(0, 0), litShare: lit / (c.width * c.height) };
  });
  expect(pixels).toMatchObject({ width: 320, height: 240 });
  expect(pixels.centre).toBeGreaterThan(200);
  expect(pixels.corner).toBeLessThan(20);
  expect(pixels.litShare).toBeGreaterThan(0.5);
  await expect(dialog.getByText('Ultrasound Image')).toBeVisible();
  await page.keyboard.press('Escape');
  await expect(dialog).toBeHidden();
  await expect(grid.getByRole('button', { name: 'Open IM0001.dcm' })).toBeFocused();

  // The PNG opens as itself.
  await grid.getByRole('button', { name: 'Open neck-transverse.png' }).click();
  await expect(page.getByRole('dialog', { name: 'neck-transverse.png' }).getByRole('img', { name: 'neck-transverse.png' })).toBeVisible();
  await page.getByRole('dialog').getByRole('button', { name: 'Close' }).click();

  // A file made for another patient is refused with both identities named, and nothing is added.
  const wrong = makeUltrasoundDicom({ patientId: 'P0000099', accessionNumber: 'A2612010004' });
  await images.getByLabel('Add images').setInputFiles([{ name: 'other-patient.dcm', mimeType: 'application/dicom', buffer: wrong }]);
  await expect(images.getByRole('alert')).toHaveText(
    `This file is for patient ID P0000099 and accession A2612010004, but this exam is ${exam.mrn} / ${exam.accessionNumber}. Nothing was stored.`,
  );
  await expect(grid.getByRole('button')).toHaveCount(2);

  // The same file again is recognised.
  await images.getByLabel('Add images').setInputFiles([{ name: 'IM0001-again.dcm', mimeType: 'application/dicom', buffer: dicom }]);
  await expect(uploads.getByRole('listitem').filter({ hasText: 'IM0001-again.dcm' })).toContainText('Already attached to this exam');
  await expect(grid.getByRole('button')).toHaveCount(2);
});

test('a JPEG-compressed DICOM image is drawn by the browser’s own decoder', async ({ page, browser }) => {
  const exam = await examFor(browser, 3);
  const frame = await sharp({ create: { width: 200, height: 150, channels: 3, background: '#101010' } })
    .composite([{ input: Buffer.from('<svg width="200" height="150"><rect x="75" y="50" width="50" height="50" fill="#f8f8f8"/></svg>') }])
    .jpeg({ quality: 95 })
    .toBuffer();
  const dicom = makeUltrasoundDicom({ patientId: exam.mrn, accessionNumber: exam.accessionNumber, jpegFrame: frame, photometric: 'RGB', rows: 150, columns: 200 });
  await signInAs(page, demo('sono1').email);
  await open(page, `/exams/${exam.id}`);
  const images = page.getByRole('region', { name: 'Images' });
  await images.getByLabel('Add images').setInputFiles([{ name: 'jpeg-loop.dcm', mimeType: 'application/dicom', buffer: dicom }]);
  await images.getByRole('button', { name: 'Open jpeg-loop.dcm' }).click();
  const canvas = page.getByRole('dialog').getByRole('img', { name: 'jpeg-loop.dcm, first frame' });
  await expect(canvas).toBeVisible();
  const [centre, corner, width] = await canvas.evaluate((c: HTMLCanvasElement) => {
    const ctx = c.getContext('2d')!;
    return [ctx.getImageData(100, 75, 1, 1).data[0], ctx.getImageData(2, 2, 1, 1).data[0], c.width];
  });
  expect(width).toBe(200);
  expect(centre).toBeGreaterThan(220);
  expect(corner).toBeLessThan(40);
  await expect(page.getByRole('dialog').getByText('JPEG Baseline (Process 1)')).toBeVisible();
});

test('the front desk sees no images on the exam page', async ({ page, browser }) => {
  const exam = await examFor(browser, 1);
  await signInAs(page, demo('desk').email);
  await open(page, `/exams/${exam.id}`);
  await expect(page.getByRole('region', { name: 'History' })).toBeVisible();
  await expect(page.getByRole('region', { name: 'Desk actions' })).toBeVisible();
  await expect(page.getByRole('region', { name: 'Images' })).toHaveCount(0);
});

test('a reading physician sees the images but cannot add any', async ({ page, browser }) => {
  const exam = await examFor(browser, 2);
  await signInAs(page, demo('reader').email);
  await open(page, `/exams/${exam.id}`);
  const images = page.getByRole('region', { name: 'Images' });
  await expect(images.getByText('No images yet.')).toBeVisible();
  await expect(images.getByLabel('Add images')).toHaveCount(0);
});

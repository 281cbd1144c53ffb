import { expect, test } from '@playwright/test';
import { Exam, ExamType, Report, Room, Scanner, User } from '../../src/db/models';
import { addDays, zonedDate, zonedTimeToUtc } from '../../src/lib/time';
import { clinicProfile } from '../../src/server/services/settings';
import { closeTestDb, testDb } from '../helpers/db';
import { makeUltrasoundDicom, newUid } from '../helpers/dicom';
import { storeFiles } from '../helpers/scanner';
import { makeEchoSr } from '../helpers/sr';
import { demo, open, signInAs } from './support';

test.afterAll(closeTestDb);

/** A weekday of its own, after the days the API tests and the other browser tests book. */
function emptyDay(timeZone: string): string {
  let day = addDays(zonedDate(new Date(), timeZone), 40 + 95 * 3);
  while ([0, 6].includes(new Date(`${day}T12:00:00Z`).getUTCDay())) day = addDays(day, 1);
  return day;
}

test('values the scanner sent and a length measured on the image go into the echo form, each marked with where it came from', async ({ page, browser }) => {
  testDb();
  const { timeZone } = await clinicProfile();

  // The front desk books an echo in the last room and checks the patient in (in its own browser).
  const deskContext = await browser.newContext();
  const desk = await deskContext.newPage();
  await signInAs(desk, demo('desk').email);
  const rooms = await Room.findAll({ order: [['id', 'ASC']] });
  const room = rooms[rooms.length - 1]!;
  const scanner = (await Scanner.findOne({ where: { roomId: room.id } }))!;
  const sonographer = await User.findOne({ where: { role: 'sonographer', active: true }, order: [['id', 'ASC']] });
  const type = await ExamType.findOne({ where: { code: 'echo-tte' } });
  const booked = await desk.request.post('/api/exams', {
    data: {
      patientId: 7, examTypeId: type!.id, referrerId: null, indication: 'Breathlessness on exertion', priority: 'routine', payer: 'insured',
      roomId: room.id, scannerId: scanner.id, sonographerId: sonographer!.id, start: zonedTimeToUtc(emptyDay(timeZone), 10, 0, timeZone).toISOString(),
    },
  });
  expect(booked.status()).toBe(201);
  const examId = (await booked.json()).exam.id as number;
  expect((await desk.request.post(`/api/exams/${examId}/status`, { data: { version: 0, to: 'arrived' } })).status()).toBe(200);
  await deskContext.close();

  await signInAs(page, demo('sono3').email);
  expect((await page.request.post(`/api/exams/${examId}/start`, { data: { version: 1 } })).status()).toBe(200);
  const exam = (await Exam.findByPk(examId, { include: ['patient'] })) as Exam & { patient: { mrn: string } };
  const ids = { patientId: exam.patient.mrn, accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid };

  // The cart sends its measurements (a structured report) and a calibrated image: 0.02 cm a pixel.
  const sent = await storeFiles(scanner.aeTitle, [
    makeEchoSr({
      ...ids,
      measurements: [
        { code: '29436-3', scheme: 'LN', meaning: 'Left Ventricle Internal End Diastolic Dimension', value: 48, unit: 'mm' },
        { code: '18154-5', scheme: 'LN', meaning: 'Interventricular Septum Diastolic Thickness', value: 9, unit: 'mm' },
      ],
    }),
    makeUltrasoundDicom({
      ...ids,
      sopInstanceUid: newUid(),
      rows: 192,
      columns: 256,
      extra: {
        SequenceOfUltrasoundRegions: [
          {
            RegionSpatialFormat: 1, RegionDataType: 1, RegionFlags: 0,
            RegionLocationMinX0: 0, RegionLocationMinY0: 0, RegionLocationMaxX1: 255, RegionLocationMaxY1: 191,
            PhysicalUnitsXDirection: 3, PhysicalUnitsYDirection: 3, PhysicalDeltaX: 0.02, PhysicalDeltaY: 0.02,
          },
        ],
      },
    }),
  ]);
  expect(sent.code, sent.stderr).toBe(0);

  await open(page, `/exams/${examId}/report`);
  const offers = page.getByTestId('scanner-values');
  await expect(offers.getByText('Sent as 48 mm')).toBeVisible();
  await page.getByRole('button', { name: 'Use 4.8 cm for LVIDd' }).click();
  await expect(page.getByLabel('LVIDd, cm')).toHaveValue('4.8');
  await expect(page.getByTestId('source-lviddCm')).toHaveText(/^From the scanner/);
  await page.getByRole('button', { name: /^Reject .* for IVSd$/ }).click();
  await expect(offers).toBeHidden();
  await expect(page.getByLabel('IVSd, cm')).toHaveValue('');

  // Calipers: a line across the image, put into the posterior wall field.
  await page.getByRole('button', { name: /^Open US-/ }).click();
  const viewer = page.getByRole('dialog');
  await viewer.getByRole('button', { name: 'Measure' }).click();
  // The canvas box letterboxes the 256 × 192 image (object-fit: contain): aim at the image itself.
  const box = (await viewer.getByRole('img').boundingBox())!;
  const scale = Math.min(box.width / 256, box.height / 192);
  const left = box.x + (box.width - 256 * scale) / 2;
  const top = box.y + (box.height - 192 * scale) / 2;
  await page.mouse.move(left + 0.2 * 256 * scale, top + 96 * scale);
  await page.mouse.down();
  await page.mouse.move(left + 0.5 * 256 * scale, top + 96 * scale, { steps: 5 });
  await page.mouse.up();
  const length = viewer.getByText(/^Length \d+(\.\d)? mm$/);
  await expect(length).toBeVisible();
  // 30 % of 256 pixels = 76.8 pixels at 0.2 mm each = 15.36 mm (arithmetic; the mouse lands within a pixel).
  const mm = Number((await length.textContent())!.replace(/[^\d.]/g, ''));
  expect(mm).toBeGreaterThan(15.36 - 0.5);
  expect(mm).toBeLessThan(15.36 + 0.5);
  await viewer.getByLabel('Report field').selectOption({ label: 'PWd (cm)' });
  await viewer.getByRole('button', { name: 'Put into form' }).click();
  await expect(viewer.getByRole('status')).toContainText('PWd set to');
  await viewer.getByRole('button', { name: 'Close' }).click();
  await expect(page.getByTestId('source-pwdCm')).toHaveText(/^Measured on the image/);
  expect(Number(await page.getByLabel('PWd, cm').inputValue())).toBeCloseTo(mm / 10, 1);

  // Saved with where each value came from; typing over a value makes it the sonographer's own.
  await expect.poll(async () => (await Report.findOne({ where: { examId } }))?.measurementSources).toEqual({ lviddCm: 'scanner', pwdCm: 'image' });
  await page.getByLabel('LVIDd, cm').fill('4.9');
  await expect(page.getByTestId('source-lviddCm')).toBeHidden();
  await expect.poll(async () => (await Report.findOne({ where: { examId } }))?.measurementSources).toEqual({ pwdCm: 'image' });
  await page.reload();
  await expect(page.getByTestId('source-pwdCm')).toBeVisible();
  await expect(page.getByLabel('LVIDd, cm')).toHaveValue('4.9');
});

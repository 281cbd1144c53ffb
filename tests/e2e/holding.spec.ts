import { createHash, randomBytes } from 'node:crypto';
import { expect, test } from '@playwright/test';
import { Attachment, Exam, ExamType, Patient, Room, Scanner, User } from '../../src/db/models';
import { addDays, zonedDate, zonedTimeToUtc } from '../../src/lib/time';
import { fileStore } from '../../src/server/storage';
import { clinicProfile } from '../../src/server/services/settings';
import { closeTestDb, testDb } from '../helpers/db';
import { EXPLICIT_VR_LITTLE_ENDIAN, makeUltrasoundDicom, newUid, US_IMAGE_STORAGE } from '../helpers/dicom';
import { demo, navigate, open, signInAs } from './support';

test.afterAll(closeTestDb);

/** A weekday of its own, after the days the API tests and the other browser tests book. */
function emptyDay(timeZone: string): string {
  let day = addDays(zonedDate(new Date(), timeZone), 40 + 90 * 3);
  while ([0, 6].includes(new Date(`${day}T12:00:00Z`).getUTCDay())) day = addDays(day, 1);
  return day;
}

test('the front desk attaches an object the scanner sent with a mistyped accession number to the right exam', async ({ page }) => {
  testDb();
  const { timeZone } = await clinicProfile();
  await signInAs(page, demo('desk').email);

  // A booked, checked-in thyroid exam, through the API as the front desk.
  const [room] = await Room.findAll({ order: [['id', 'ASC']], limit: 1 });
  const scanner = await Scanner.findOne({ where: { roomId: room!.id } });
  const sonographer = await User.findOne({ where: { role: 'sonographer', active: true }, order: [['id', 'ASC']] });
  const type = await ExamType.findOne({ where: { code: 'thyroid' } });
  const patient = (await Patient.findAll({ order: [['id', 'ASC']], limit: 20 }))[15]!;
  const day = emptyDay(timeZone);
  const booked = await page.request.post('/api/exams', {
    data: {
      patientId: patient.id, examTypeId: type!.id, referrerId: null, indication: 'Thyroid nodule follow-up', priority: 'routine', payer: 'insured',
      roomId: room!.id, scannerId: scanner!.id, sonographerId: sonographer!.id, start: zonedTimeToUtc(day, 10, 0, timeZone).toISOString(),
    },
  });
  expect(booked.status()).toBe(201);
  const examId = (await booked.json()).exam.id as number;
  expect((await page.request.post(`/api/exams/${examId}/status`, { data: { version: 0, to: 'arrived' } })).status()).toBe(200);
  const exam = (await Exam.findByPk(examId))!;

  // The scanner sent an image with a mistyped accession number; the listener held it.
  const typo = `A${String(Date.now()).slice(-10)}`;
  const sop = newUid();
  const bytes = makeUltrasoundDicom({ patientId: patient.mrn, accessionNumber: typo, sopInstanceUid: sop });
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const storageKey = `attachments/${sha256.slice(0, 2)}/${sha256.slice(2, 4)}/${sha256}-${randomBytes(6).toString('hex')}`;
  await fileStore().put(storageKey, bytes);
  const held = await Attachment.create({
    examId: null, matchStatus: 'unmatched', kind: 'dicom', source: 'network', originalName: `US-${sop}.dcm`, contentType: 'application/dicom',
    sizeBytes: bytes.length, sha256, storageKey, thumbnailKey: null, patientId: patient.mrn, accessionNumber: typo, studyInstanceUid: newUid(),
    seriesInstanceUid: newUid(), sopInstanceUid: sop, sopClassUid: US_IMAGE_STORAGE, modality: 'US', acquiredAt: zonedTimeToUtc(day, 10, 12, timeZone),
    imageRows: 48, imageColumns: 64, frameCount: 1, transferSyntaxUid: EXPLICIT_VR_LITTLE_ENDIAN, uploadedBy: null,
    receivedFrom: 'US_ROOM1', heldReason: `No exam has accession number ${typo}.`,
  });

  await open(page, '/');
  await navigate(page, 'Unmatched images', '/holding');
  await expect(page.getByRole('heading', { name: 'Held for matching' })).toBeVisible();
  const row = page.getByRole('row').filter({ hasText: typo });
  await expect(row).toContainText(`No exam has accession number ${typo}.`);
  await expect(row).toContainText('US_ROOM1');

  // The same patient's exam that day is offered; the person checks it by typing its accession number too.
  await row.getByRole('button', { name: /Attach to exam/ }).click();
  const panel = page.getByRole('region', { name: `Attach ${typo}` });
  await expect(panel.getByRole('radio', { name: new RegExp(exam.accessionNumber) })).toBeVisible();
  await panel.getByLabel('Or find by accession number').fill(exam.accessionNumber.toLowerCase());
  await panel.getByRole('button', { name: 'Find exam' }).click();
  await expect(panel.getByRole('radio', { name: new RegExp(exam.accessionNumber) })).toBeChecked();

  // The accession in the file is not the exam's: the server says so, and a second, explicit step attaches it.
  await panel.getByRole('button', { name: 'Attach', exact: true }).click();
  await expect(panel.getByRole('alert')).toContainText(
    `This file is for patient ID ${patient.mrn} and accession ${typo}, but this exam is ${patient.mrn} / ${exam.accessionNumber}. Attach it anyway only if you are sure it belongs to this exam.`,
  );
  await panel.getByRole('button', { name: 'Attach anyway' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Attached to exam' })).toHaveText(`Attached to exam ${exam.accessionNumber} (identifiers differed; you confirmed it).`);
  await expect(page.getByRole('row').filter({ hasText: typo })).toHaveCount(0);

  await held.reload();
  expect(held.examId).toBe(examId);
  expect(held.matchStatus).toBe('matched');
});

import { createHash, randomBytes } from 'node:crypto';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Attachment, AuditEvent, Exam, Patient } from '../../src/db/models';
import { formatInstant, zonedTimeToUtc } from '../../src/lib/time';
import { fileStore } from '../../src/server/storage';
import { at, book, bookingBody, catalog, testDay, TZ, type Catalog } from '../helpers/booking';
import { closeTestDb, testDb } from '../helpers/db';
import { EXPLICIT_VR_LITTLE_ENDIAN, makeUltrasoundDicom, newUid, US_IMAGE_STORAGE } from '../helpers/dicom';
import { call, sessionFor } from '../helpers/http';

interface TestExam {
  id: number;
  accessionNumber: string;
  mrn: string;
  studyInstanceUid: string;
  day: string;
}

let c: Catalog;
let patients: Patient[];
let slot = 0;

beforeAll(async () => {
  testDb();
  c = await catalog();
  patients = await Patient.findAll({ order: [['id', 'ASC']], limit: 12 });
});
afterAll(closeTestDb);

/** Books an exam on a day of its own (testDay 69 and up belong to these tests) and, unless told, checks the patient in. */
async function exam(opts: { arrive?: boolean; patient?: Patient; day?: string; hour?: number } = {}): Promise<TestExam> {
  const n = slot++;
  const patient = opts.patient ?? patients[n % patients.length]!;
  const day = opts.day ?? testDay(70 + Math.floor(n / 6));
  const res = await book(bookingBody(c, { patientId: patient.id, start: at(day, opts.hour ?? 9 + (n % 6)), payer: 'insured', type: 'thyroid' }));
  expect(res.status).toBe(201);
  if (opts.arrive !== false) {
    const moved = await call('POST', `/api/exams/${res.body.exam.id}/status`, { cookie: await sessionFor('frontdesk'), json: { version: 0, to: 'arrived' } });
    expect(moved.status).toBe(200);
  }
  const row = (await Exam.findByPk(res.body.exam.id))!;
  return { id: row.id, accessionNumber: row.accessionNumber, mrn: patient.mrn, studyInstanceUid: row.studyInstanceUid, day };
}

interface HeldSpec {
  patientId: string;
  accessionNumber: string;
  studyInstanceUid?: string;
  acquiredAt?: Date;
  reason?: string;
  thumbnail?: boolean;
}

/**
 * Puts a held object in place as the DICOM listener does: the file (and a thumbnail) through
 * the file store, then the row with `match_status = 'unmatched'` and no exam.
 */
async function hold(spec: HeldSpec): Promise<{ row: Attachment; bytes: Buffer }> {
  const sop = newUid();
  const study = spec.studyInstanceUid ?? newUid();
  // The name in the file must never reach the list (it is not stored in the row at all).
  const bytes = makeUltrasoundDicom({ patientId: spec.patientId, accessionNumber: spec.accessionNumber, studyInstanceUid: study, sopInstanceUid: sop, patientName: 'Holdsworth^Unseen' });
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const name = `${sha256}-${randomBytes(6).toString('hex')}`;
  const dir = `${sha256.slice(0, 2)}/${sha256.slice(2, 4)}`;
  const storageKey = `attachments/${dir}/${name}`;
  const thumbnailKey = spec.thumbnail ? `thumbnails/${dir}/${name}.jpg` : null;
  await fileStore().put(storageKey, bytes);
  if (thumbnailKey) await fileStore().put(thumbnailKey, await sharp({ create: { width: 64, height: 48, channels: 3, background: '#303030' } }).jpeg().toBuffer());
  const row = await Attachment.create({
    examId: null,
    matchStatus: 'unmatched',
    kind: 'dicom',
    source: 'network',
    originalName: `US-${sop}.dcm`,
    contentType: 'application/dicom',
    sizeBytes: bytes.length,
    sha256,
    storageKey,
    thumbnailKey,
    patientId: spec.patientId || null,
    accessionNumber: spec.accessionNumber || null,
    studyInstanceUid: study,
    seriesInstanceUid: newUid(),
    sopInstanceUid: sop,
    sopClassUid: US_IMAGE_STORAGE,
    modality: 'US',
    acquiredAt: spec.acquiredAt ?? null,
    imageRows: 48,
    imageColumns: 64,
    frameCount: 1,
    transferSyntaxUid: EXPLICIT_VR_LITTLE_ENDIAN,
    uploadedBy: null,
    receivedFrom: 'US_ROOM2',
    heldReason: spec.reason ?? (spec.accessionNumber ? `No exam has accession number ${spec.accessionNumber}.` : 'No exam has this Study Instance UID (the object has no accession number).'),
  });
  // As stored: the database keeps whole seconds.
  return { row: await row.reload(), bytes };
}

const attach = async (id: number, body: unknown, role: 'frontdesk' | 'admin' | 'sonographer' = 'frontdesk') =>
  call('POST', `/api/holding/${id}/attach`, { cookie: await sessionFor(role), json: body });
const discard = async (id: number, body: unknown, role: 'frontdesk' | 'admin' | 'sonographer' = 'frontdesk') =>
  call('POST', `/api/holding/${id}/discard`, { cookie: await sessionFor(role), json: body });
const heldList = async (role: 'frontdesk' | 'admin' | 'sonographer' = 'frontdesk') => call('GET', '/api/holding', { cookie: await sessionFor(role) });
const audits = (action: string, entityType: string, entityId: number) => AuditEvent.findAll({ where: { action, entityType, entityId: String(entityId) } });

describe('the holding list', () => {
  it('shows a held object with the identifiers from its file, where it came from, and likely exams', async () => {
    // A day of its own (69), so the other tests' bookings on days 70+ never clash with these two.
    const patient = patients[7]!;
    const first = await exam({ patient, day: testDay(69), hour: 9 });
    const sameDay = await exam({ patient, day: first.day, hour: 14 });
    const acquiredAt = zonedTimeToUtc(first.day, 10, 30, TZ);
    const { row } = await hold({ patientId: first.mrn, accessionNumber: first.accessionNumber, acquiredAt, thumbnail: true, reason: 'The exam was still booked when the image arrived.' });

    const res = await heldList();
    expect(res.status).toBe(200);
    const mine = res.body.rows.find((r: { id: number }) => r.id === row.id);
    expect(mine).toEqual({
      id: row.id,
      receivedAt: row.createdAt.toISOString(),
      receivedLabel: formatInstant(row.createdAt, TZ),
      receivedFrom: 'US_ROOM2',
      heldReason: 'The exam was still booked when the image arrived.',
      patientId: first.mrn,
      accessionNumber: first.accessionNumber,
      studyInstanceUid: row.studyInstanceUid,
      sopClassName: 'Ultrasound Image',
      modality: 'US',
      acquiredLabel: formatInstant(acquiredAt, TZ),
      thumbnailUrl: `/api/attachments/${row.id}/thumbnail`,
      candidates: [
        expect.objectContaining({ examId: first.id, accessionNumber: first.accessionNumber, mrn: first.mrn, reason: 'accession', status: 'arrived', takesImages: true, identityMatches: true }),
        expect.objectContaining({ examId: sameDay.id, accessionNumber: sameDay.accessionNumber, mrn: first.mrn, reason: 'patient-day', takesImages: true, identityMatches: false }),
      ],
    });
    expect(mine.candidates[0].scheduledLabel).toBe(formatInstant(new Date(at(first.day, 9)), TZ));
    expect(res.body.total).toBeGreaterThanOrEqual(1);
    // The patient's name inside the file is never read into the list.
    expect(JSON.stringify(res.body)).not.toContain('Holdsworth');

    expect((await heldList('sonographer')).status).toBe(200);
    expect((await heldList('admin')).status).toBe(200);
  });

  it('offers the exam of the same Study Instance UID when the file has no accession number', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: 'EXT0000098', accessionNumber: '', studyInstanceUid: e.studyInstanceUid });
    const mine = (await heldList()).body.rows.find((r: { id: number }) => r.id === row.id);
    expect(mine.candidates).toEqual([expect.objectContaining({ examId: e.id, reason: 'study-uid', identityMatches: false })]);
  });

  it('finds an exam by a typed accession number, and checks what is typed', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: e.mrn, accessionNumber: 'UNKNOWN42' });
    const cookie = await sessionFor('frontdesk');
    const found = await call('GET', `/api/holding/${row.id}/candidates?accession=${e.accessionNumber.toLowerCase()}`, { cookie });
    expect(found.status).toBe(200);
    expect(found.body.candidates).toEqual([expect.objectContaining({ examId: e.id, reason: 'typed', identityMatches: false, takesImages: true })]);
    const none = await call('GET', `/api/holding/${row.id}/candidates?accession=A0000000000`, { cookie });
    expect(none.body.candidates).toEqual([]);
    const bad = await call('GET', `/api/holding/${row.id}/candidates?accession=hello`, { cookie });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.accession).toMatch(/looks like A2612020007/);
  });
});

describe('attaching a held object', () => {
  it('files it with the matching exam, clears the held reason, audits it, and the exam lists it', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: e.mrn, accessionNumber: e.accessionNumber, reason: 'The exam was not found at the time.' });
    const res = await attach(row.id, { examId: e.id });
    expect(res.status).toBe(200);
    expect(res.body.attached).toEqual({ attachmentId: row.id, examId: e.id, accessionNumber: e.accessionNumber, mismatchConfirmed: false });

    await row.reload();
    expect(row).toMatchObject({ examId: e.id, matchStatus: 'matched', heldReason: null, source: 'network', receivedFrom: 'US_ROOM2' });
    const events = await audits('attachment.attach', 'exam', e.id);
    expect(events).toHaveLength(1);
    expect(events[0]!.actorUserId).toEqual(expect.any(Number));
    expect(events[0]!.detail).toEqual({
      attachmentId: row.id,
      examId: e.id,
      patientId: e.mrn,
      accessionNumber: e.accessionNumber,
      studyInstanceUid: row.studyInstanceUid,
      sopInstanceUid: row.sopInstanceUid,
      receivedFrom: 'US_ROOM2',
      heldReason: 'The exam was not found at the time.',
      mismatchConfirmed: false,
    });

    const images = await call('GET', `/api/exams/${e.id}/attachments`, { cookie: await sessionFor('sonographer') });
    expect(images.status).toBe(200);
    expect(images.body.attachments).toEqual([expect.objectContaining({ id: row.id, examId: e.id, source: 'network', kind: 'dicom' })]);
    expect((await heldList()).body.rows.map((r: { id: number }) => r.id)).not.toContain(row.id);
  });

  it('answers 409 the second time: someone else already attached it', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: e.mrn, accessionNumber: e.accessionNumber });
    expect((await attach(row.id, { examId: e.id })).status).toBe(200);
    const again = await attach(row.id, { examId: e.id }, 'admin');
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('CONFLICT');
    expect(again.body.error.message).toContain('already attached or discarded by someone else');
    expect(await audits('attachment.attach', 'exam', e.id)).toHaveLength(1);
  });

  it('lets one of two simultaneous attaches win; the other gets 409', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: e.mrn, accessionNumber: e.accessionNumber });
    const answers = await Promise.all([attach(row.id, { examId: e.id }), attach(row.id, { examId: e.id }, 'admin')]);
    expect(answers.map((a) => a.status).sort()).toEqual([200, 409]);
    expect(await audits('attachment.attach', 'exam', e.id)).toHaveLength(1);
  });

  it('refuses another patient’s file (409 IDENTITY_MISMATCH naming both) until the mismatch is confirmed', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: 'EXT0000099', accessionNumber: e.accessionNumber, reason: `This file is for patient ID EXT0000099 and accession ${e.accessionNumber}, but this exam is ${e.mrn} / ${e.accessionNumber}.` });
    const refused = await attach(row.id, { examId: e.id });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('IDENTITY_MISMATCH');
    expect(refused.body.error.message).toBe(
      `This file is for patient ID EXT0000099 and accession ${e.accessionNumber}, but this exam is ${e.mrn} / ${e.accessionNumber}. Attach it anyway only if you are sure it belongs to this exam.`,
    );
    await row.reload();
    expect(row).toMatchObject({ examId: null, matchStatus: 'unmatched' });
    expect(await audits('attachment.attach', 'exam', e.id)).toHaveLength(0);

    const confirmed = await attach(row.id, { examId: e.id, confirmMismatch: true });
    expect(confirmed.status).toBe(200);
    expect(confirmed.body.attached.mismatchConfirmed).toBe(true);
    await row.reload();
    expect(row).toMatchObject({ examId: e.id, matchStatus: 'matched' });
    const [event] = await audits('attachment.attach', 'exam', e.id);
    expect(event!.detail).toMatchObject({ attachmentId: row.id, patientId: 'EXT0000099', accessionNumber: e.accessionNumber, mismatchConfirmed: true });
  });

  it('refuses a file for another exam of the same patient (wrong accession) the same way', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: e.mrn, accessionNumber: 'A2612019999' });
    const refused = await attach(row.id, { examId: e.id });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('IDENTITY_MISMATCH');
    expect(refused.body.error.message).toContain(`patient ID ${e.mrn} and accession A2612019999, but this exam is ${e.mrn} / ${e.accessionNumber}`);
  });

  it('refuses an exam that takes no images yet (422) and keeps the object held', async () => {
    const e = await exam({ arrive: false });
    const { row } = await hold({ patientId: e.mrn, accessionNumber: e.accessionNumber });
    const res = await attach(row.id, { examId: e.id });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toBe(`Images can be attached to an exam only once the patient has arrived; exam ${e.accessionNumber} is booked. The object is still held.`);
    await row.reload();
    expect(row.matchStatus).toBe('unmatched');
  });

  it('answers 404 for an exam or a held object that does not exist', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: e.mrn, accessionNumber: e.accessionNumber });
    expect((await attach(row.id, { examId: 999_999_999 })).status).toBe(404);
    expect((await attach(999_999_999, { examId: e.id })).status).toBe(404);
  });

  it('is for the front desk and the manager: a sonographer gets 403 and nothing changes', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: e.mrn, accessionNumber: e.accessionNumber });
    const res = await attach(row.id, { examId: e.id }, 'sonographer');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('FORBIDDEN');
    expect((await discard(row.id, { reason: 'Not mine to say' }, 'sonographer')).status).toBe(403);
    await row.reload();
    expect(row.matchStatus).toBe('unmatched');
    expect((await attach(row.id, { examId: e.id }, 'admin')).status).toBe(200);
  });

  it('answers 400 with field errors for a bad body', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: e.mrn, accessionNumber: e.accessionNumber });
    const empty = await attach(row.id, {});
    expect(empty.status).toBe(400);
    expect(empty.body.error.code).toBe('VALIDATION');
    expect(empty.body.error.fields.examId).toBe('Choose an exam.');
    const wrong = await attach(row.id, { examId: 'seven', confirmMismatch: 'yes' });
    expect(wrong.status).toBe(400);
    expect(Object.keys(wrong.body.error.fields).sort()).toEqual(['confirmMismatch', 'examId']);
    expect((await attach(row.id, { examId: -3 })).body.error.fields.examId).toBe('Choose an exam.');
    const badId = await call('POST', '/api/holding/abc/attach', { cookie: await sessionFor('frontdesk'), json: { examId: e.id } });
    expect(badId.status).toBe(400);
    expect(badId.body.error.fields.id).toBeDefined();
    await row.reload();
    expect(row.matchStatus).toBe('unmatched');
  });
});

describe('discarding a held object', () => {
  it('removes the row and its files, and audits the identifiers and the reason', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: 'EXT0000097', accessionNumber: e.accessionNumber, thumbnail: true });
    const store = fileStore();
    expect(await store.exists(row.storageKey)).toBe(true);
    expect(await store.exists(row.thumbnailKey!)).toBe(true);

    const res = await discard(row.id, { reason: '  Test image from the service engineer  ' });
    expect(res.status).toBe(200);
    expect(await Attachment.findByPk(row.id)).toBeNull();
    expect(await store.exists(row.storageKey)).toBe(false);
    expect(await store.exists(row.thumbnailKey!)).toBe(false);
    const events = await audits('attachment.discard', 'attachment', row.id);
    expect(events).toHaveLength(1);
    expect(events[0]!.detail).toMatchObject({
      attachmentId: row.id,
      sha256: row.sha256,
      patientId: 'EXT0000097',
      accessionNumber: e.accessionNumber,
      sopInstanceUid: row.sopInstanceUid,
      receivedFrom: 'US_ROOM2',
      reason: 'Test image from the service engineer',
    });
    expect((await heldList()).body.rows.map((r: { id: number }) => r.id)).not.toContain(row.id);

    // Whoever comes second learns that someone else got there first.
    const again = await discard(row.id, { reason: 'Also a test image' });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toContain('already attached or discarded by someone else');
    expect((await attach(row.id, { examId: e.id })).status).toBe(409);
  });

  it('will not discard an object that is already filed with an exam', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: e.mrn, accessionNumber: e.accessionNumber });
    expect((await attach(row.id, { examId: e.id })).status).toBe(200);
    const res = await discard(row.id, { reason: 'Wrong one' });
    expect(res.status).toBe(409);
    expect(await Attachment.findByPk(row.id)).not.toBeNull();
    expect(await fileStore().exists(row.storageKey)).toBe(true);
  });

  it('answers 400 with a field error when the reason is missing, too short or too long', async () => {
    const e = await exam();
    const { row } = await hold({ patientId: e.mrn, accessionNumber: e.accessionNumber });
    for (const body of [{}, { reason: '  ab  ' }, { reason: 'x'.repeat(201) }, { reason: 42 }]) {
      const res = await discard(row.id, body);
      expect(res.status).toBe(400);
      expect(res.body.error.fields.reason).toEqual(expect.any(String));
    }
    expect(await Attachment.findByPk(row.id)).not.toBeNull();
  });
});

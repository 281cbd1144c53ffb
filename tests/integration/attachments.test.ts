import { createHash } from 'node:crypto';
import http from 'node:http';
import { readdir } from 'node:fs/promises';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Attachment, AuditEvent, Exam, Patient } from '../../src/db/models';
import { SIZE_LIMITS } from '../../src/lib/attachments/file-types';
import { fileStore, LocalDiskStore } from '../../src/server/storage';
import { at, book, bookingBody, catalog, testDay, type Catalog } from '../helpers/booking';
import { closeTestDb, testDb } from '../helpers/db';
import { makeUltrasoundDicom, newUid, postFiles, type UploadPart } from '../helpers/dicom';
import { testEnv } from '../helpers/env';
import { call, sessionFor } from '../helpers/http';

interface TestExam {
  id: number;
  accessionNumber: string;
  mrn: string;
  studyInstanceUid: string;
}

let c: Catalog;
let patients: Patient[];
let root: string;
let slot = 0;

beforeAll(async () => {
  testDb();
  c = await catalog();
  patients = await Patient.findAll({ order: [['id', 'ASC']], limit: 12 });
  root = (fileStore() as LocalDiskStore).root;
});
afterAll(closeTestDb);

/** Books an exam on an empty day (testDay ≥ 30 belongs to these tests) and, unless told, checks the patient in. */
async function exam(opts: { arrive?: boolean } = {}): Promise<TestExam> {
  const n = slot++;
  const patient = patients[n % patients.length]!;
  const res = await book(bookingBody(c, { patientId: patient.id, start: at(testDay(30 + Math.floor(n / 6)), 9 + (n % 6)), payer: 'insured', type: 'thyroid' }));
  expect(res.status).toBe(201);
  if (opts.arrive !== false) {
    const moved = await call('POST', `/api/exams/${res.body.exam.id}/status`, { cookie: await sessionFor('frontdesk'), json: { version: 0, to: 'arrived' } });
    expect(moved.status).toBe(200);
  }
  const row = (await Exam.findByPk(res.body.exam.id))!;
  return { id: row.id, accessionNumber: row.accessionNumber, mrn: patient.mrn, studyInstanceUid: row.studyInstanceUid };
}

const upload = async (examId: number, parts: UploadPart[], role: 'sonographer' | 'admin' | 'radiologist' | 'frontdesk' = 'sonographer') =>
  postFiles(`/api/exams/${examId}/attachments`, parts, { cookie: await sessionFor(role) });

const dicomFor = (e: TestExam, over: Partial<Parameters<typeof makeUltrasoundDicom>[0]> = {}) =>
  makeUltrasoundDicom({ patientId: e.mrn, accessionNumber: e.accessionNumber, studyInstanceUid: e.studyInstanceUid, ...over });

const png = (width = 120, height = 90) =>
  sharp({ create: { width, height, channels: 3, background: '#2a6f97' } }).composite([{ input: Buffer.from(`<svg width="${width}" height="${height}"><circle cx="${width / 2}" cy="${height / 2}" r="20" fill="white"/></svg>`) }]).png().toBuffer();

/** Every file under the store's root, relative to it. */
async function storedFiles(): Promise<string[]> {
  const entries = await readdir(root, { recursive: true, withFileTypes: true }).catch(() => []);
  return entries.filter((e) => e.isFile()).map((e) => path.relative(root, path.join(e.parentPath, e.name))).sort();
}

/** What a refused upload must leave behind: nothing at all. */
async function snapshot(examId: number) {
  return {
    rows: await Attachment.count({ where: { examId } }),
    files: await storedFiles(),
    audits: await AuditEvent.count({ where: { action: 'attachment.upload', entityId: String(examId) } }),
  };
}

const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

describe('uploading a DICOM image', () => {
  it('stores the file byte for byte with its identifiers, a thumbnail and an audit event', async () => {
    const e = await exam();
    const sop = newUid();
    const file = dicomFor(e, { sopInstanceUid: sop, acquisitionDateTime: '20261203101530', rows: 120, columns: 160 });
    const res = await upload(e.id, [{ name: 'IM0001.dcm', bytes: file, type: 'application/dicom' }]);
    expect(res.status).toBe(201);
    expect(res.body.duplicate).toBe(false);
    const a = res.body.attachment;
    expect(a).toMatchObject({ examId: e.id, kind: 'dicom', source: 'upload', originalName: 'IM0001.dcm', contentType: 'application/dicom', sizeBytes: file.length, sha256: sha(file) });
    expect(a.dicom).toMatchObject({ modality: 'US', sopClassName: 'Ultrasound Image', rows: 120, columns: 160, frames: 1, pixelRoute: 'uncompressed' });

    const row = (await Attachment.findByPk(a.id))!;
    expect(row).toMatchObject({
      patientId: e.mrn,
      accessionNumber: e.accessionNumber,
      studyInstanceUid: e.studyInstanceUid,
      sopInstanceUid: sop,
      sopClassUid: '1.2.840.10008.5.1.4.1.1.6.1',
      transferSyntaxUid: '1.2.840.10008.1.2.1',
      matchStatus: 'matched',
      uploadedBy: expect.any(Number),
    });
    // 10:15:30 on 3 Dec in the clinic's zone (America/Chicago, UTC−6 in December).
    expect(row.acquiredAt!.toISOString()).toBe('2026-12-03T16:15:30.000Z');
    const stored = await fileStore().get(row.storageKey);
    expect(stored.equals(file)).toBe(true);
    expect(row.thumbnailKey).not.toBeNull();
    const thumb = await sharp(await fileStore().get(row.thumbnailKey!)).metadata();
    expect([thumb.format, thumb.width, thumb.height]).toEqual(['jpeg', 160, 120]);

    const events = await AuditEvent.findAll({ where: { action: 'attachment.upload', entityType: 'exam', entityId: String(e.id) } });
    expect(events).toHaveLength(1);
    expect(events[0]!.detail).toMatchObject({ attachmentId: a.id, kind: 'dicom', sizeBytes: file.length });
    expect(JSON.stringify(events[0]!.detail)).not.toContain(e.mrn);
  });

  it('serves the stored file and its thumbnail to the reading physician, and lists them', async () => {
    const e = await exam();
    const file = dicomFor(e);
    const { body } = await upload(e.id, [{ name: 'Zoë "loop".dcm', bytes: file }]);
    const reader = await sessionFor('radiologist');
    const { baseUrl } = testEnv();
    const res = await fetch(`${baseUrl}/api/attachments/${body.attachment.id}/file`, { headers: { Cookie: reader } });
    expect(res.status).toBe(200);
    expect(Buffer.from(await res.arrayBuffer()).equals(file)).toBe(true);
    expect(res.headers.get('content-type')).toBe('application/dicom');
    expect(res.headers.get('cache-control')).toBe('private, max-age=300');
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('content-disposition')).toBe(`inline; filename="Zo_ _loop_.dcm"; filename*=UTF-8''Zo%C3%AB%20%22loop%22.dcm`);
    const again = await fetch(`${baseUrl}/api/attachments/${body.attachment.id}/file`, { headers: { Cookie: reader, 'If-None-Match': res.headers.get('etag')! } });
    expect(again.status).toBe(304);

    const thumb = await fetch(`${baseUrl}/api/attachments/${body.attachment.id}/thumbnail`, { headers: { Cookie: reader } });
    expect(thumb.status).toBe(200);
    expect(thumb.headers.get('content-type')).toBe('image/jpeg');
    expect((await sharp(Buffer.from(await thumb.arrayBuffer())).metadata()).format).toBe('jpeg');

    const list = await call('GET', `/api/exams/${e.id}/attachments`, { cookie: reader });
    expect(list.status).toBe(200);
    expect(list.body.attachments.map((x: { id: number }) => x.id)).toEqual([body.attachment.id]);
    expect(list.body.attachments[0].thumbnailUrl).toBe(`/api/attachments/${body.attachment.id}/thumbnail`);
  });

  it('refuses a file for another patient (422 naming both values) and stores nothing', async () => {
    const e = await exam();
    const before = await snapshot(e.id);
    const res = await upload(e.id, [{ name: 'wrong.dcm', bytes: dicomFor(e, { patientId: 'P0000099' }) }]);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toBe(`This file is for patient ID P0000099 and accession ${e.accessionNumber}, but this exam is ${e.mrn} / ${e.accessionNumber}. Nothing was stored.`);
    expect(await snapshot(e.id)).toEqual(before);
  });

  it('refuses a file for another exam of the same patient (wrong accession) and stores nothing', async () => {
    const e = await exam();
    const before = await snapshot(e.id);
    const res = await upload(e.id, [{ name: 'other-exam.dcm', bytes: dicomFor(e, { accessionNumber: 'A2612019999' }) }]);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toContain(`patient ID ${e.mrn} and accession A2612019999, but this exam is ${e.mrn} / ${e.accessionNumber}`);
    expect(await snapshot(e.id)).toEqual(before);
  });

  it('accepts a file with no accession number only when its Study Instance UID is the exam’s', async () => {
    const e = await exam();
    const wrongStudy = await upload(e.id, [{ name: 'no-accession.dcm', bytes: dicomFor(e, { accessionNumber: '', studyInstanceUid: newUid() }) }]);
    expect(wrongStudy.status).toBe(422);
    expect(wrongStudy.body.error.message).toContain('with no accession number');
    const sameStudy = await upload(e.id, [{ name: 'no-accession.dcm', bytes: dicomFor(e, { accessionNumber: '' }) }]);
    expect(sameStudy.status).toBe(201);
  });

  it('refuses a text file named .dcm (415) and stores nothing', async () => {
    const e = await exam();
    const before = await snapshot(e.id);
    const bytes = Buffer.from('PatientID=P0000012\nThis is a note, not an image.\n'.repeat(10));
    const res = await upload(e.id, [{ name: 'notes.dcm', bytes, type: 'application/dicom' }]);
    expect(res.status).toBe(415);
    expect(res.body.error.message).toMatch(/“notes\.dcm” is not a DICOM file/);
    expect(res.body.error.fields.file).toBe(res.body.error.message);
    expect(await snapshot(e.id)).toEqual(before);
  });

  it('recognises the same file uploaded twice: 200 with duplicate, still one row and one file', async () => {
    const e = await exam();
    const file = dicomFor(e);
    const first = await upload(e.id, [{ name: 'IM0007.dcm', bytes: file }]);
    expect(first.status).toBe(201);
    const before = await snapshot(e.id);
    const second = await upload(e.id, [{ name: 'IM0007-copy.dcm', bytes: file }]);
    expect(second.status).toBe(200);
    expect(second.body.duplicate).toBe(true);
    expect(second.body.attachment.id).toBe(first.body.attachment.id);
    expect(await snapshot(e.id)).toEqual(before);
  });

  it('lets one of two simultaneous uploads of the same file win; the other is a duplicate and leaves no file', async () => {
    const e = await exam();
    const before = await snapshot(e.id);
    const file = dicomFor(e);
    const answers = await Promise.all([upload(e.id, [{ name: 'a.dcm', bytes: file }]), upload(e.id, [{ name: 'b.dcm', bytes: file }])]);
    expect(answers.map((a) => a.status).sort()).toEqual([200, 201]);
    expect(answers[0]!.body.attachment.id).toBe(answers[1]!.body.attachment.id);
    const after = await snapshot(e.id);
    expect(after.rows).toBe(before.rows + 1);
    // One file and one thumbnail more, not two of each.
    expect(after.files.length).toBe(before.files.length + 2);
  });

  it('refuses the same DICOM object (SOP Instance UID) for a second exam with 409', async () => {
    const [first, second] = [await exam(), await exam()];
    const sop = newUid();
    expect((await upload(first.id, [{ name: 'IM1.dcm', bytes: dicomFor(first, { sopInstanceUid: sop }) }])).status).toBe(201);
    const before = await snapshot(second.id);
    const res = await upload(second.id, [{ name: 'IM1.dcm', bytes: dicomFor(second, { sopInstanceUid: sop }) }]);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toContain(sop);
    expect(await snapshot(second.id)).toEqual(before);
  });

  it('draws a thumbnail of a JPEG Baseline DICOM image', async () => {
    const e = await exam();
    const jpeg = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#c0c0c0' } }).jpeg().toBuffer();
    const res = await upload(e.id, [{ name: 'jpeg.dcm', bytes: dicomFor(e, { jpegFrame: jpeg, photometric: 'RGB', rows: 48, columns: 64 }) }]);
    expect(res.status).toBe(201);
    expect(res.body.attachment.dicom.pixelRoute).toBe('jpeg-baseline');
    expect(res.body.attachment.thumbnailUrl).not.toBeNull();
  });
});

describe('uploading PNG and JPEG images', () => {
  it('stores a PNG with a thumbnail', async () => {
    const e = await exam();
    const bytes = await png(640, 480);
    const res = await upload(e.id, [{ name: 'screen.png', bytes, type: 'image/png' }]);
    expect(res.status).toBe(201);
    expect(res.body.attachment).toMatchObject({ kind: 'image', contentType: 'image/png', sha256: sha(bytes), dicom: null });
    const row = (await Attachment.findByPk(res.body.attachment.id))!;
    expect((await fileStore().get(row.storageKey)).equals(bytes)).toBe(true);
    expect((await sharp(await fileStore().get(row.thumbnailKey!)).metadata()).width).toBe(320);
  });

  it('refuses a PNG that claims to be a JPEG (415), by media type or by name', async () => {
    const e = await exam();
    const before = await snapshot(e.id);
    const bytes = await png();
    const byType = await upload(e.id, [{ name: 'screen.png', bytes, type: 'image/jpeg' }]);
    expect(byType.status).toBe(415);
    expect(byType.body.error.message).toMatch(/sent as image\/jpeg, but it is a PNG image/);
    const byName = await upload(e.id, [{ name: 'screen.jpg', bytes }]);
    expect(byName.status).toBe(415);
    expect(await snapshot(e.id)).toEqual(before);
  });

  it('refuses a damaged PNG (415)', async () => {
    const e = await exam();
    const bytes = (await png()).subarray(0, 60);
    const res = await upload(e.id, [{ name: 'cut.png', bytes, type: 'image/png' }]);
    expect(res.status).toBe(415);
    expect(res.body.error.message).toMatch(/damaged/);
  });
});

describe('limits and refusals', () => {
  it('refuses a PNG one byte over its limit (413), counted on the real bytes', async () => {
    const e = await exam();
    const before = await snapshot(e.id);
    const bytes = Buffer.alloc(SIZE_LIMITS.png + 1);
    (await png()).copy(bytes);
    const res = await upload(e.id, [{ name: 'huge.png', bytes, type: 'image/png' }]);
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/limit for PNG and JPEG images is 20 MB/);
    expect(await snapshot(e.id)).toEqual(before);
  });

  it('refuses a body whose Content-Length is over the limit before reading it', async () => {
    const e = await exam();
    const { baseUrl } = testEnv();
    const cookie = await sessionFor('sonographer');
    const answer = await new Promise<{ status: number; body: string }>((resolve, reject) => {
      const req = http.request(`${baseUrl}/api/exams/${e.id}/attachments`, {
        method: 'POST',
        headers: { Cookie: cookie, Origin: baseUrl, 'Content-Type': 'multipart/form-data; boundary=x', 'Content-Length': String(200 * 1024 * 1024) },
      });
      req.on('response', (res) => {
        let body = '';
        res.on('data', (d) => (body += d));
        res.on('end', () => {
          resolve({ status: res.statusCode!, body });
          req.destroy();
        });
      });
      req.on('error', reject);
      // Only the first bytes are ever sent: the answer must come without the rest.
      req.write('--x\r\nContent-Disposition: form-data; name="file"; filename="big.dcm"\r\n\r\n');
    });
    expect(answer.status).toBe(413);
    expect(JSON.parse(answer.body).error.code).toBe('PAYLOAD_TOO_LARGE');
  });

  it('answers 400 naming the field when no file is sent, and 415 for a JSON body', async () => {
    const e = await exam();
    const none = await postFiles(`/api/exams/${e.id}/attachments`, [{ name: 'x.png', bytes: await png() }], { cookie: await sessionFor('sonographer'), field: 'image' });
    expect(none.status).toBe(400);
    expect(none.body.error.fields.file).toBe('Choose a file to add.');
    const asJson = await call('POST', `/api/exams/${e.id}/attachments`, { cookie: await sessionFor('sonographer'), json: { file: 'x' } });
    expect(asJson.status).toBe(415);
  });

  it('refuses images for an exam whose patient has not arrived (422)', async () => {
    const e = await exam({ arrive: false });
    const before = await snapshot(e.id);
    const res = await upload(e.id, [{ name: 'early.dcm', bytes: dicomFor(e) }]);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/once the patient has arrived/);
    expect(await snapshot(e.id)).toEqual(before);
  });

  it('answers 404 for an exam that does not exist', async () => {
    const res = await upload(987654, [{ name: 'x.png', bytes: await png() }]);
    expect(res.status).toBe(404);
  });
});

describe('a database failure while saving', () => {
  it('removes the stored file and thumbnail again: no orphan, no row, no audit', async () => {
    const e = await exam();
    const before = await snapshot(e.id);
    const sequelize = testDb();
    await sequelize.query(`CREATE TRIGGER attachments_fail_for_test BEFORE INSERT ON attachments FOR EACH ROW
      BEGIN IF NEW.original_name = 'fail-on-insert.png' THEN SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'test failure'; END IF; END`);
    try {
      const res = await upload(e.id, [{ name: 'fail-on-insert.png', bytes: await png() }]);
      expect(res.status).toBe(500);
      expect(res.body.error.message).toMatch(/Nothing was saved/);
      expect(res.body.error.message).not.toMatch(/test failure/);
    } finally {
      await sequelize.query('DROP TRIGGER IF EXISTS attachments_fail_for_test');
    }
    expect(await snapshot(e.id)).toEqual(before);
  });
});

describe('who may see images', () => {
  it('keeps the front desk away from a real exam’s images and files', async () => {
    const e = await exam();
    const { body } = await upload(e.id, [{ name: 'desk.png', bytes: await png() }], 'admin');
    const desk = await sessionFor('frontdesk');
    expect((await call('GET', `/api/exams/${e.id}/attachments`, { cookie: desk })).status).toBe(403);
    expect((await call('GET', `/api/attachments/${body.attachment.id}/file`, { cookie: desk })).status).toBe(403);
    expect((await upload(e.id, [{ name: 'r.png', bytes: await png(50, 50) }], 'radiologist')).status).toBe(403);
  });
});

import { createHash, randomUUID } from 'node:crypto';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { Attachment, AuditEvent, Exam, Patient, ProcedureStep, Report, Scanner, ScannerValue } from '../../src/db/models';
import { addDays, zonedDate } from '../../src/lib/time';
import { fileStore } from '../../src/server/storage';
import { at, book, bookingBody, catalog, testDay, TZ, type Catalog } from '../helpers/booking';
import { closeTestDb, testDb } from '../helpers/db';
import { makeUltrasoundDicom, newUid } from '../helpers/dicom';
import { call, sessionFor } from '../helpers/http';
import { dcmtk, DICOM, stepEnded, stepInProgress, storeFiles, worklistQuery } from '../helpers/scanner';
import { makeEchoSr } from '../helpers/sr';

/**
 * The scanner's side of Crestline over DICOM, with dcmtk's tools and dcmjs-dimse's client as
 * the scanner and the real listener that `npm test` started. Days testDay(120…) belong here.
 */

interface TestExam {
  id: number;
  accessionNumber: string;
  mrn: string;
  studyInstanceUid: string;
  patientId: number;
}

let c: Catalog;
let scannerAe: string[];
let desk: string;
// Names take letters only: the run's tag in letters (a–p from the hex digits).
const RUN = randomUUID().replace(/-/g, '').slice(0, 6).replace(/[0-9a-f]/g, (h) => String.fromCharCode(97 + parseInt(h, 16)));

beforeAll(async () => {
  testDb();
  c = await catalog();
  const scanners = await Scanner.findAll({ order: [['id', 'ASC']] });
  scannerAe = c.rooms.map((r) => scanners.find((s) => s.id === r.scannerId)!.aeTitle);
  desk = await sessionFor('frontdesk');
});
afterAll(closeTestDb);

async function newPatient(familyName: string, givenName: string, sex = 'female'): Promise<{ id: number; mrn: string }> {
  const res = await call('POST', '/api/patients', { cookie: desk, json: { familyName, givenName, birthDate: '1968-04-09', sex, email: '', phone: '+1 555 0142 100', addressLine: '4 Kestrel Row', city: 'Marrow Bay', postalCode: '40311' } });
  expect(res.status).toBe(201);
  return { id: res.body.patient.id, mrn: res.body.patient.mrn };
}

async function bookOn(patient: { id: number; mrn: string }, day: string, hour: number, opts: { roomIndex?: number; type?: string; arrive?: boolean } = {}): Promise<TestExam> {
  const res = await book(bookingBody(c, { patientId: patient.id, start: at(day, hour), roomIndex: opts.roomIndex ?? 0, type: opts.type ?? 'thyroid', payer: 'insured' }));
  expect(res.status).toBe(201);
  if (opts.arrive) expect((await call('POST', `/api/exams/${res.body.exam.id}/status`, { cookie: desk, json: { version: 0, to: 'arrived' } })).status).toBe(200);
  const row = (await Exam.findByPk(res.body.exam.id))!;
  return { id: row.id, accessionNumber: row.accessionNumber, mrn: patient.mrn, studyInstanceUid: row.studyInstanceUid, patientId: patient.id };
}

const da = (isoDay: string) => isoDay.replace(/-/g, '');

describe('associations', () => {
  it('answers C-ECHO for a scanner in the catalog and rejects an unknown AE title with the standard reason', async () => {
    const ok = await dcmtk('echoscu', ['-aet', scannerAe[0]!, '-aec', DICOM.aeTitle]);
    expect(ok.code, ok.stderr).toBe(0);
    const stranger = await dcmtk('echoscu', ['-aet', 'NOT-A-SCANNER', '-aec', DICOM.aeTitle]);
    expect(stranger.code).not.toBe(0);
    expect(stranger.stderr).toContain('Calling AE Title Not Recognized');
    const wrongCalled = await dcmtk('echoscu', ['-aet', scannerAe[0]!, '-aec', 'SOMEONE-ELSE']);
    expect(wrongCalled.code).not.toBe(0);
    expect(wrongCalled.stderr).toContain('Called AE Title Not Recognized');
  });
});

describe('modality worklist (C-FIND)', () => {
  const day = testDay(120);
  let zoe: TestExam;
  let other: TestExam;
  let nextDay: TestExam;

  beforeAll(async () => {
    // A UTF-8 name must reach the scanner intact.
    const patient = await newPatient(`Ångström-Nuñez${RUN}`, 'Zoë');
    zoe = await bookOn(patient, day, 9);
    other = await bookOn(await newPatient(`Brookfield${RUN}`, 'Ansel', 'male'), day, 9, { roomIndex: 1 });
    nextDay = await bookOn(patient, addDays(day, 1), 10);
  });

  it("returns exactly the scanner's booked exams for a day, with the right attributes and the UTF-8 name intact", async () => {
    const { run, answers } = await worklistQuery(scannerAe[0]!, [
      `(0040,0100)[0].ScheduledStationAETitle=${scannerAe[0]}`,
      `(0040,0100)[0].ScheduledProcedureStepStartDate=${da(day)}`,
      '(0040,0100)[0].ScheduledProcedureStepStartTime',
      '(0040,0100)[0].Modality',
      '(0040,0100)[0].ScheduledProcedureStepDescription',
      '(0040,0100)[0].ScheduledProcedureStepID',
      'PatientName',
      'PatientID',
      'PatientBirthDate',
      'PatientSex',
      'AccessionNumber',
      'StudyInstanceUID',
      'RequestedProcedureID',
      'RequestedProcedureDescription',
      'ReferringPhysicianName',
    ]);
    expect(run.code, run.stderr).toBe(0);
    expect(answers.map((a) => a.text('x00080050'))).toEqual([zoe.accessionNumber]);
    const a = answers[0]!;
    expect(a.text('x00080005')).toBe('ISO_IR 192');
    expect(a.text('x00100010')).toBe(`Ångström-Nuñez${RUN}^Zoë`);
    expect(a.text('x00100020')).toBe(zoe.mrn);
    expect(a.text('x00100030')).toBe('19680409');
    expect(a.text('x00100040')).toBe('F');
    expect(a.text('x0020000d')).toBe(zoe.studyInstanceUid);
    expect(a.text('x00401001')).toBe(zoe.accessionNumber);
    expect(a.text('x00321060')).toBe(c.types.thyroid!.name);
    expect(a.stepText('x00400001')).toBe(scannerAe[0]);
    expect(a.stepText('x00400002')).toBe(da(day));
    expect(a.stepText('x00400003')).toBe('090000');
    expect(a.stepText('x00080060')).toBe('US');
    expect(a.stepText('x00400009')).toBe(zoe.accessionNumber);
    // Keys that were not asked for do not come back.
    expect(a.text('x00101030')).toBe('');
  });

  it("lists today's booked and arrived exams of a scanner, as the database holds them", async () => {
    const today = zonedDate(new Date(), TZ);
    const expected = await testDb().query<{ accession_number: string }>(
      `SELECT e.accession_number FROM exams e JOIN scanners s ON s.id = e.scanner_id
        WHERE s.ae_title = ? AND e.status IN ('booked', 'arrived') AND e.scheduled_start >= ? AND e.scheduled_start < ? ORDER BY e.scheduled_start, e.id`,
      { replacements: [scannerAe[1], at(today, 0), at(addDays(today, 1), 0)], type: QueryTypes.SELECT },
    );
    const { run, answers } = await worklistQuery(scannerAe[1]!, [`(0040,0100)[0].ScheduledStationAETitle=${scannerAe[1]}`, `(0040,0100)[0].ScheduledProcedureStepStartDate=${da(today)}`, 'AccessionNumber']);
    expect(run.code, run.stderr).toBe(0);
    expect(expected.length).toBeGreaterThan(0); // the demo clinic books every room every weekday… and today may be a weekend:
    expect(answers.map((x) => x.text('x00080050'))).toEqual(expected.map((r) => r.accession_number));
  });

  it('matches names and IDs with * and ? wildcards, names without regard to case, after trimming padding', async () => {
    // A scanner that sends names in UTF-8 says so with Specific Character Set ISO_IR 192.
    const names = async (keys: string[]) => (await worklistQuery(scannerAe[0]!, ['(0008,0005)=ISO_IR 192', 'AccessionNumber', ...keys])).answers.map((x) => x.text('x00080050')).sort();
    expect(await names([`PatientName=Ångström-Nuñez${RUN}*`])).toEqual([zoe.accessionNumber, nextDay.accessionNumber].sort());
    expect(await names([`PatientName=ångström-nuñez${RUN}^zo?`])).toEqual([zoe.accessionNumber, nextDay.accessionNumber].sort());
    expect(await names([`PatientName=Brookfield${RUN}*`, `(0040,0100)[0].ScheduledStationAETitle=${scannerAe[1]}`])).toEqual([other.accessionNumber]);
    expect(await names([`PatientName=Nobody${RUN}*`])).toEqual([]);
    expect(await names([`PatientID=${zoe.mrn}`, `(0040,0100)[0].ScheduledProcedureStepStartDate=${da(day)}`])).toEqual([zoe.accessionNumber]);
    expect(await names([`AccessionNumber=${zoe.accessionNumber.slice(0, -1)}?`, `PatientID=${zoe.mrn}`, `(0040,0100)[0].ScheduledProcedureStepStartDate=${da(day)}`])).toEqual([zoe.accessionNumber]);
    // A % or _ in a query is a literal character, not a LIKE wildcard.
    expect(await names([`PatientName=%${RUN}%`])).toEqual([]);
  });

  it('matches date ranges in the clinic time zone, and refuses a malformed date', async () => {
    const accessions = async (range: string) =>
      (await worklistQuery(scannerAe[0]!, ['AccessionNumber', `PatientID=${zoe.mrn}`, `(0040,0100)[0].ScheduledProcedureStepStartDate=${range}`])).answers.map((x) => x.text('x00080050')).sort();
    expect(await accessions(`${da(day)}-${da(addDays(day, 1))}`)).toEqual([zoe.accessionNumber, nextDay.accessionNumber].sort());
    expect(await accessions(`${da(addDays(day, 1))}-`)).toEqual([nextDay.accessionNumber]);
    expect(await accessions(`-${da(addDays(day, -1))}`)).toEqual([]);
    const bad = await dcmtk('findscu', ['-v', '-W', '-aet', scannerAe[0]!, '-aec', DICOM.aeTitle, '-k', 'AccessionNumber', '-k', '(0040,0100)[0].ScheduledProcedureStepStartDate=2026-13-45']);
    // C-FIND status A900, "identifier does not match SOP class" (PS3.4 C.4.1.1.4), and no answers.
    expect(bad.stdout + bad.stderr).toContain('Final Find Response (Error: DataSetDoesNotMatchSOPClass)');
    expect(bad.stdout + bad.stderr).not.toContain('Find Response: 1');
  });

  it('leaves out cancelled exams and other modalities', async () => {
    const cancelled = await bookOn(await newPatient(`Quillon${RUN}`, 'Bea'), day, 11);
    expect((await call('POST', `/api/exams/${cancelled.id}/cancel`, { cookie: desk, json: { version: 0, reason: 'Patient asked to cancel', refund: false } })).status).toBe(200);
    const run = async (keys: string[]) => (await worklistQuery(scannerAe[0]!, ['AccessionNumber', `PatientName=Quillon${RUN}*`, ...keys])).answers;
    expect(await run([])).toHaveLength(0);
    const ct = await worklistQuery(scannerAe[0]!, ['AccessionNumber', `PatientID=${zoe.mrn}`, '(0040,0100)[0].Modality=CT']);
    expect(ct.answers).toHaveLength(0);
  });
});

describe('procedure steps (MPPS)', () => {
  const day = zonedDate(new Date(), TZ);

  async function worklistStatus(examId: number, examDay: string): Promise<string | undefined> {
    const res = await call('GET', `/api/worklist?day=${examDay}&pageSize=200`, { cookie: desk });
    return res.body.rows?.find((r: { id: number }) => r.id === examId)?.status;
  }

  it('in progress starts the scan (draft report opened) and completed is recorded; the desk worklist shows it within seconds', async () => {
    const exam = await bookOn(await newPatient(`Stepwell${RUN}`, 'Ida'), testDay(121), 9, { arrive: true });
    const uid = newUid();
    const started = await stepInProgress(scannerAe[0]!, { uid, patientId: exam.mrn, accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid, start: ['20261203', '091500'] });
    expect(started.status).toBe(0);
    const row = (await Exam.findByPk(exam.id))!;
    expect(row.status).toBe('in-progress');
    expect(await Report.findOne({ where: { examId: exam.id } })).not.toBeNull();
    const until = Date.now() + 8_000;
    let seen: string | undefined;
    while (Date.now() < until && (seen = await worklistStatus(exam.id, testDay(121))) !== 'in-progress') await new Promise((r) => setTimeout(r, 250));
    expect(seen).toBe('in-progress');

    expect((await stepEnded(scannerAe[0]!, uid, 'COMPLETED')).status).toBe(0);
    const step = (await ProcedureStep.findOne({ where: { sopInstanceUid: uid } }))!;
    expect(step.status).toBe('completed');
    expect(step.examId).toBe(exam.id);
    // The exam stays open until the sonographer submits the preliminary report.
    expect((await Exam.findByPk(exam.id))!.status).toBe('in-progress');
    const audits = await AuditEvent.findAll({ where: { entityType: 'exam', entityId: String(exam.id) }, order: [['id', 'ASC']] });
    expect(audits.map((a) => a.action)).toEqual(expect.arrayContaining(['exam.start', 'exam.step-complete']));
    // A finished step cannot be changed again.
    expect((await stepEnded(scannerAe[0]!, uid, 'DISCONTINUED')).status).not.toBe(0);
  });

  it('a booked patient is checked in by the scanner; discontinued returns the exam to arrived with the reason audited', async () => {
    const exam = await bookOn(await newPatient(`Haltmoor${RUN}`, 'Cy'), testDay(121), 10);
    const uid = newUid();
    expect((await stepInProgress(scannerAe[0]!, { uid, patientId: exam.mrn, accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid })).status).toBe(0);
    expect((await Exam.findByPk(exam.id))!.status).toBe('in-progress');
    // Reason code from memory: DICOM CID 9300 "Procedure Discontinuation Reasons", DCM 110505.
    const ended = await stepEnded(scannerAe[0]!, uid, 'DISCONTINUED', { code: '110505', meaning: 'Patient refused to continue procedure' });
    expect(ended.status).toBe(0);
    expect((await Exam.findByPk(exam.id))!.status).toBe('arrived');
    const event = await AuditEvent.findOne({ where: { action: 'exam.discontinue', entityId: String(exam.id) } });
    expect(event?.detail).toMatchObject({ reason: 'Patient refused to continue procedure', from: 'in-progress', to: 'arrived', scannerAe: scannerAe[0] });
    const actions = (await AuditEvent.findAll({ where: { entityType: 'exam', entityId: String(exam.id) } })).map((a) => a.action);
    expect(actions).toEqual(expect.arrayContaining(['exam.check-in', 'exam.start', 'exam.discontinue']));
  });

  it('refuses a step for an unknown accession, another patient, a finished exam, or one it does not know', async () => {
    const exam = await bookOn(await newPatient(`Refusal${RUN}`, 'Oz'), testDay(121), 11, { arrive: true });
    const base = { patientId: exam.mrn, accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid };
    expect((await stepInProgress(scannerAe[0]!, { ...base, uid: newUid(), accessionNumber: 'A0000000000' })).status).not.toBe(0);
    expect((await stepInProgress(scannerAe[0]!, { ...base, uid: newUid(), patientId: 'P9999999' })).status).not.toBe(0);
    expect((await Exam.findByPk(exam.id))!.status).toBe('arrived');
    expect((await stepEnded(scannerAe[0]!, newUid(), 'COMPLETED')).status).not.toBe(0);
    expect(await ProcedureStep.count({ where: { examId: exam.id } })).toBe(0);
    void day;
  });
});

describe('images and structured reports (C-STORE)', () => {
  const day = testDay(122);

  /** The data set of a Part 10 file: everything after the file meta group. */
  function dataSetOf(bytes: Buffer): Buffer {
    const groupLength = bytes.readUInt32LE(132 + 8);
    return bytes.subarray(132 + 12 + groupLength);
  }

  it('files an ultrasound image on its exam, kept byte for byte with its sha256', async () => {
    const exam = await bookOn(await newPatient(`Storewell${RUN}`, 'Una'), day, 9, { arrive: true });
    const sop = newUid();
    const sent = makeUltrasoundDicom({ patientId: exam.mrn, accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid, sopInstanceUid: sop });
    const run = await storeFiles(scannerAe[0]!, [sent]);
    expect(run.code, run.stderr).toBe(0);
    const row = (await Attachment.findOne({ where: { sopInstanceUid: sop } }))!;
    expect(row).toMatchObject({ examId: exam.id, matchStatus: 'matched', source: 'network', receivedFrom: scannerAe[0], kind: 'dicom' });
    const stored = await fileStore().get(row.storageKey);
    expect(createHash('sha256').update(stored).digest('hex')).toBe(row.sha256);
    expect(dataSetOf(stored).equals(dataSetOf(sent))).toBe(true);
    // The exam page lists it like an upload.
    const list = await call('GET', `/api/exams/${exam.id}/attachments`, { cookie: await sessionFor('sonographer') });
    expect(list.body.attachments.map((a: { id: number }) => a.id)).toContain(row.id);
    // Sent again: recognised, not stored twice.
    expect((await storeFiles(scannerAe[0]!, [sent])).code).toBe(0);
    expect(await Attachment.count({ where: { sopInstanceUid: sop } })).toBe(1);
  });

  it('keeps a multi-frame image in the transfer syntax the scanner offered', async () => {
    const exam = await bookOn(await newPatient(`Cineform${RUN}`, 'Rae'), day, 10, { arrive: true });
    const sop = newUid();
    const frames = 4;
    const sent = makeUltrasoundDicom({
      patientId: exam.mrn,
      accessionNumber: exam.accessionNumber,
      studyInstanceUid: exam.studyInstanceUid,
      sopInstanceUid: sop,
      sopClassUid: '1.2.840.10008.5.1.4.1.1.3.1',
      frames,
    });
    const run = await storeFiles(scannerAe[0]!, [sent]);
    expect(run.code, run.stderr).toBe(0);
    const row = (await Attachment.findOne({ where: { sopInstanceUid: sop } }))!;
    expect(row).toMatchObject({ examId: exam.id, frameCount: frames, transferSyntaxUid: '1.2.840.10008.1.2.1' });
    expect(dataSetOf(await fileStore().get(row.storageKey)).equals(dataSetOf(sent))).toBe(true);
  });

  it('keeps a JPEG-compressed image compressed, as the scanner offered it (storescu -xy proposes JPEG Baseline)', async () => {
    const exam = await bookOn(await newPatient(`Jpegford${RUN}`, 'Ivo'), day, 12, { arrive: true });
    const sop = newUid();
    const jpeg = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#5a8f7b' } }).jpeg().toBuffer();
    const sent = makeUltrasoundDicom({ patientId: exam.mrn, accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid, sopInstanceUid: sop, jpegFrame: jpeg, photometric: 'RGB', rows: 48, columns: 64 });
    const run = await storeFiles(scannerAe[0]!, [sent], ['-xy']);
    expect(run.code, run.stderr).toBe(0);
    const row = (await Attachment.findOne({ where: { sopInstanceUid: sop } }))!;
    // JPEG Baseline (Process 1) is 1.2.840.10008.1.2.4.50 (DICOM PS3.5 A.4.1).
    expect(row).toMatchObject({ examId: exam.id, transferSyntaxUid: '1.2.840.10008.1.2.4.50' });
    expect(dataSetOf(await fileStore().get(row.storageKey)).equals(dataSetOf(sent))).toBe(true);
    expect(row.thumbnailKey).not.toBeNull();
  });

  it('holds an object with an unknown accession number or another patient, never filing it on a patient', async () => {
    const exam = await bookOn(await newPatient(`Holdfast${RUN}`, 'Ned'), day, 11, { arrive: true });
    const unknownSop = newUid();
    const wrongSop = newUid();
    const run = await storeFiles(scannerAe[0]!, [
      makeUltrasoundDicom({ patientId: exam.mrn, accessionNumber: 'A9912310099', sopInstanceUid: unknownSop }),
      makeUltrasoundDicom({ patientId: 'P7777777', accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid, sopInstanceUid: wrongSop }),
    ]);
    expect(run.code, run.stderr).toBe(0);
    const unknown = (await Attachment.findOne({ where: { sopInstanceUid: unknownSop } }))!;
    expect(unknown).toMatchObject({ examId: null, matchStatus: 'unmatched', receivedFrom: scannerAe[0] });
    expect(unknown.heldReason).toContain('A9912310099');
    const wrong = (await Attachment.findOne({ where: { sopInstanceUid: wrongSop } }))!;
    expect(wrong).toMatchObject({ examId: null, matchStatus: 'unmatched' });
    expect(wrong.heldReason).toContain('P7777777');
    expect(wrong.heldReason).toContain(exam.mrn);
    const held = await call('GET', '/api/holding', { cookie: desk });
    expect(held.status).toBe(200);
    expect(JSON.stringify(held.body)).toContain(unknownSop.slice(-8) ? 'A9912310099' : '');
    expect(await Attachment.count({ where: { examId: exam.id } })).toBe(0);
  });

  it('imports an echo structured report: LV dimensions in mm are offered to the form in cm, nothing written into the report', async () => {
    const exam = await bookOn(await newPatient(`Sonarheart${RUN}`, 'Lio', 'male'), day, 13, { type: 'echo-tte', roomIndex: 2, arrive: true });
    const sono = await sessionFor('sonographer');
    const start = await call('POST', `/api/exams/${exam.id}/start`, { cookie: sono, json: { version: 1 } });
    expect(start.status).toBe(200);
    // LOINC codes of the echo dimensions (see src/lib/dicom/measurement-map.ts for their sources); values invented.
    const sr = makeEchoSr({
      patientId: exam.mrn,
      accessionNumber: exam.accessionNumber,
      studyInstanceUid: exam.studyInstanceUid,
      measurements: [
        { code: '29436-3', scheme: 'LN', meaning: 'Left Ventricle Internal End Diastolic Dimension', value: 48, unit: 'mm' },
        { code: '29438-9', scheme: 'LN', meaning: 'Left Ventricle Internal Systolic Dimension', value: 31, unit: 'mm' },
        { code: '18154-5', scheme: 'LN', meaning: 'Interventricular Septum Diastolic Thickness', value: 9, unit: 'mm' },
        { code: '18152-9', scheme: 'LN', meaning: 'Left Ventricle Posterior Wall Diastolic Thickness', value: 10, unit: 'mm' },
      ],
    });
    const run = await storeFiles(scannerAe[2]!, [sr]);
    expect(run.code, run.stderr).toBe(0);
    const offered = await ScannerValue.findAll({ where: { examId: exam.id }, order: [['fieldCode', 'ASC']] });
    // 48 mm = 4.8 cm, 31 mm = 3.1 cm, 9 mm = 0.9 cm, 10 mm = 1.0 cm (unit arithmetic).
    expect(offered.map((v) => [v.fieldCode, v.value, v.state])).toEqual([
      ['ivsdCm', 0.9, 'offered'],
      ['lviddCm', 4.8, 'offered'],
      ['lvidsCm', 3.1, 'offered'],
      ['pwdCm', 1, 'offered'],
    ]);
    expect(offered.find((v) => v.fieldCode === 'lviddCm')).toMatchObject({ sourceValue: '48', sourceUnit: 'mm', concept: 'LN:29436-3' });
    const report = (await Report.findOne({ where: { examId: exam.id } }))!;
    expect(report.measurements).toEqual({});
  });
});

import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { encodeCommand, encodeDataset, IMPLICIT_LITTLE_ENDIAN } from '../../src/server/dicom/encode';
import { fileMetaGroup, toPart10 } from '../../src/server/dicom/part10';
import { readDicomFacts } from '../../src/server/dicom/identifiers';
import {
  likeMatches,
  parseDateRange,
  personName,
  personNameFromDisplay,
  queryText,
  readQuery,
  requestedOnly,
  wildcardToLike,
  worklistItem,
  type WorklistRow,
} from '../../src/server/dicom/worklist-find';

describe('worklist query keys', () => {
  it('reads text from the shapes dcmjs gives, trimmed of DICOM padding', () => {
    expect(queryText('A2612030001 ')).toBe('A2612030001');
    expect(queryText(['FHUS01\0'])).toBe('FHUS01');
    expect(queryText([{ Alphabetic: 'Ångström^Zoë ' }])).toBe('Ångström^Zoë');
    expect(queryText(undefined)).toBe('');
    expect(queryText([])).toBe('');
  });

  it('turns DICOM wildcards into LIKE patterns and keeps % _ \\ literal', () => {
    expect(wildcardToLike("O'BR*^AN?")).toBe("O'BR%^AN_");
    expect(wildcardToLike('100%_a\\b')).toBe('100\\%\\_a\\\\b');
    expect(likeMatches('US', 'U*')).toBe(true);
    expect(likeMatches('US', 'CT')).toBe(false);
    expect(likeMatches('US', 'u?')).toBe(true);
  });

  it('reads a date or range as clinic days (PS3.4 C.2.2.2.5 range matching), and refuses anything else', () => {
    expect(parseDateRange('20261203')).toEqual({ from: '2026-12-03', to: '2026-12-03' });
    expect(parseDateRange('20261201-20261207')).toEqual({ from: '2026-12-01', to: '2026-12-07' });
    expect(parseDateRange('-20261207')).toEqual({ from: null, to: '2026-12-07' });
    expect(parseDateRange('20261201-')).toEqual({ from: '2026-12-01', to: null });
    expect(parseDateRange('2026.12.03')).toEqual({ from: '2026-12-03', to: '2026-12-03' }); // the old ACR-NEMA form
    for (const bad of ['2026-13-45', '20261345', '-', 'today', '20261201-20261207-20261209']) expect(parseDateRange(bad)).toBeNull();
  });

  it('reads the matching keys of a findscu-style query and names a malformed date', () => {
    const q = readQuery({
      PatientName: [{ Alphabetic: 'Doe*' }],
      ScheduledProcedureStepSequence: [{ ScheduledStationAETitle: 'FHUS01 ', ScheduledProcedureStepStartDate: '20261203', Modality: 'US' }],
    });
    expect(q).toEqual({ stationAeTitle: 'FHUS01', dateFrom: '2026-12-03', dateTo: '2026-12-03', modality: 'US', patientName: 'Doe*', patientId: null, accessionNumber: null });
    expect(readQuery({ ScheduledProcedureStepSequence: [{ ScheduledProcedureStepStartDate: 'soon' }] })).toHaveProperty('invalid');
  });
});

describe('worklist answers', () => {
  const row: WorklistRow = {
    accession_number: 'A2612030001',
    study_instance_uid: '2.25.1',
    // 15:00 UTC is 09:00 in Chicago in December (UTC−6; common practice).
    scheduled_start: new Date('2026-12-03T15:00:00Z'),
    mrn: 'P0000012',
    family_name: 'Ångström-Nuñez',
    given_name: 'Zoë',
    birth_date: '1968-04-09',
    sex: 'female',
    type_name: 'Thyroid ultrasound',
    type_code: 'thyroid',
    referrer_name: 'Dr Mira Castellan',
    ae_title: 'FHUS01',
    room_name: 'Room 1',
    sonographer_name: 'Ilse Marchetti',
    height_cm: 172,
    weight_kg: 68.4,
  };

  it('gives names in DICOM person-name form (PS3.5 6.2: family^given^middle^prefix)', () => {
    expect(personName('Doe', 'Jane')).toBe('Doe^Jane');
    expect(personName('Odd^Name', 'With=Parts\\')).toBe('Odd Name^With Parts');
    expect(personNameFromDisplay('Dr Mira Castellan')).toBe('Castellan^Mira^^Dr');
    expect(personNameFromDisplay('Ilse Marchetti')).toBe('Marchetti^Ilse');
  });

  it('fills every key Crestline holds, in clinic time, height in metres (PS3.3 C.7.2.2)', () => {
    const item = worklistItem(row, 'America/Chicago', 'CRESTLINE');
    expect(item).toMatchObject({
      SpecificCharacterSet: 'ISO_IR 192',
      PatientName: 'Ångström-Nuñez^Zoë',
      PatientID: 'P0000012',
      PatientBirthDate: '19680409',
      PatientSex: 'F',
      PatientSize: '1.72',
      PatientWeight: '68.4',
      ReferringPhysicianName: 'Castellan^Mira^^Dr',
      RequestedProcedureID: 'A2612030001',
    });
    expect((item.ScheduledProcedureStepSequence as Record<string, unknown>[])[0]).toMatchObject({
      Modality: 'US',
      ScheduledStationAETitle: 'FHUS01',
      ScheduledProcedureStepStartDate: '20261203',
      ScheduledProcedureStepStartTime: '090000',
      ScheduledPerformingPhysicianName: 'Marchetti^Ilse',
    });
    expect(worklistItem({ ...row, height_cm: null, weight_kg: null, sex: 'unknown' }, 'America/Chicago', 'CRESTLINE')).toMatchObject({ PatientSex: '' });
    expect(worklistItem({ ...row, height_cm: null }, 'America/Chicago', 'CRESTLINE')).not.toHaveProperty('PatientSize');
  });

  it('answers only the keys asked for; a sequence asked with an item gives that item’s keys; unknown keys come back empty', () => {
    const item = worklistItem(row, 'America/Chicago', 'CRESTLINE');
    const answer = requestedOnly(item, {
      PatientName: '',
      AccessionNumber: '',
      OtherPatientIDsSequence: [],
      InstitutionName: '',
      ScheduledProcedureStepSequence: [{ ScheduledStationAETitle: 'FHUS01', ScheduledProcedureStepStartDate: '' }],
    });
    expect(answer).toEqual({
      SpecificCharacterSet: 'ISO_IR 192',
      PatientName: 'Ångström-Nuñez^Zoë',
      AccessionNumber: 'A2612030001',
      OtherPatientIDsSequence: [],
      InstitutionName: '',
      ScheduledProcedureStepSequence: [{ ScheduledStationAETitle: 'FHUS01', ScheduledProcedureStepStartDate: '20261203' }],
    });
    const whole = requestedOnly(item, { ScheduledProcedureStepSequence: [] });
    expect(whole.ScheduledProcedureStepSequence).toEqual(item.ScheduledProcedureStepSequence);
  });
});

describe('received objects as Part 10 files', () => {
  it('writes a file meta group that dicom-parser reads back, with the data set bytes untouched after it', () => {
    const meta = { sopClassUid: '1.2.840.10008.5.1.4.1.1.6.1', sopInstanceUid: '2.25.12345', transferSyntaxUid: '1.2.840.10008.1.2.1', sourceAeTitle: 'FHUS01' };
    // A tiny explicit-VR little-endian data set: (0008,0050) SH "A26" + pad, (0010,0020) LO "P1".
    const dataSet = Buffer.from([0x08, 0x00, 0x50, 0x00, 0x53, 0x48, 0x04, 0x00, 0x41, 0x32, 0x36, 0x20, 0x10, 0x00, 0x20, 0x00, 0x4c, 0x4f, 0x02, 0x00, 0x50, 0x31]);
    const file = toPart10(meta, [dataSet.subarray(0, 10), dataSet.subarray(10)]);
    expect(file.subarray(128, 132).toString('latin1')).toBe('DICM');
    expect(file.subarray(file.length - dataSet.length).equals(dataSet)).toBe(true);
    const groupLength = file.readUInt32LE(132 + 8);
    expect(132 + 12 + groupLength).toBe(file.length - dataSet.length);
    expect(fileMetaGroup(meta).length % 2).toBe(0);
    const facts = readDicomFacts(file);
    expect(facts).toMatchObject({ accessionNumber: 'A26', patientId: 'P1', sopInstanceUid: '2.25.12345', sopClassUid: '1.2.840.10008.5.1.4.1.1.6.1', transferSyntaxUid: '1.2.840.10008.1.2.1' });
  });
});

describe('our own encoder for answers and command sets', () => {
  const dcmjs = createRequire(import.meta.url)('dcmjs') as {
    data: { DicomMessage: { readFile(b: ArrayBuffer): { dict: unknown } }; DicomMetaDictionary: { naturalizeDataset(d: unknown): Record<string, unknown> } };
    log: { setLevel(l: string): void };
  };
  dcmjs.log.setLevel('error');
  const answer = {
    SpecificCharacterSet: 'ISO_IR 192',
    PatientName: 'Ångström-Nuñez^Zoë',
    PatientID: 'P0000012',
    AccessionNumber: 'A2612030001',
    StudyInstanceUID: '2.25.123',
    InstitutionName: '',
    OtherPatientIDsSequence: [],
    ScheduledProcedureStepSequence: [{ ScheduledStationAETitle: 'FHUS01', ScheduledProcedureStepStartDate: '20261203', ScheduledProcedureStepStartTime: '090000' }],
  };

  for (const [name, syntax] of [['explicit', '1.2.840.10008.1.2.1'], ['implicit', IMPLICIT_LITTLE_ENDIAN]] as const) {
    it(`writes a worklist answer that dcmjs reads back the same (${name} VR little endian)`, () => {
      const bytes = encodeDataset(answer, syntax);
      expect(bytes.length % 2).toBe(0);
      const file = toPart10({ sopClassUid: '1.2.840.10008.5.1.4.31', sopInstanceUid: '2.25.1', transferSyntaxUid: syntax }, bytes);
      const read = dcmjs.data.DicomMetaDictionary.naturalizeDataset(dcmjs.data.DicomMessage.readFile(file.buffer.slice(file.byteOffset, file.byteOffset + file.byteLength) as ArrayBuffer).dict);
      expect(queryText(read.PatientName)).toBe('Ångström-Nuñez^Zoë');
      expect(read.AccessionNumber).toBe('A2612030001');
      expect(read.StudyInstanceUID).toBe('2.25.123');
      const step = (read.ScheduledProcedureStepSequence as Record<string, unknown>[])[0]!;
      expect(step).toMatchObject({ ScheduledStationAETitle: 'FHUS01', ScheduledProcedureStepStartDate: '20261203', ScheduledProcedureStepStartTime: '090000' });
      // Tags ascend: (0008,0005) comes first, the sequence (0040,0100) last.
      expect(bytes.readUInt16LE(0)).toBe(0x0008);
      expect(bytes.readUInt16LE(2)).toBe(0x0005);
    });
  }

  it('writes a command set led by its group length, numbers as US (PS3.7 E.1)', () => {
    const bytes = encodeCommand({ AffectedSOPClassUID: '1.2.840.10008.5.1.4.31', CommandField: 0x8020, MessageIDBeingRespondedTo: 7, CommandDataSetType: 0x0102, Status: 0xff00, ErrorComment: undefined });
    // (0000,0000) UL, implicit: tag 4 bytes, length 4 bytes (= 4), value = the rest.
    expect(bytes.readUInt32LE(0)).toBe(0);
    expect(bytes.readUInt32LE(4)).toBe(4);
    expect(bytes.readUInt32LE(8)).toBe(bytes.length - 12);
    const status = bytes.indexOf(Buffer.from([0x00, 0x00, 0x00, 0x09, 0x02, 0x00, 0x00, 0x00]));
    expect(bytes.readUInt16LE(status + 8)).toBe(0xff00);
  });
});

import { describe, expect, it } from 'vitest';
import sharp from 'sharp';
import {
  claimFromName,
  formatBytes,
  sizeRefusal,
  sniffType,
  typeRefusal,
  SIZE_LIMITS,
} from '../../src/lib/attachments/file-types';
import { pixelRoute } from '../../src/lib/dicom/dictionary';
import { parsePart10 } from '../../src/lib/dicom/frames';
import { decoderFor, parseDicomDateTime, readDicomFacts, toInstant, trimDicom } from '../../src/server/dicom/identifiers';
import { matchToExam, mismatchMessage } from '../../src/server/dicom/matching';
import { dicomThumbnail, imageThumbnail, THUMBNAIL_PX } from '../../src/server/dicom/thumbnails';
import { makeUltrasoundDicom, newUid } from '../helpers/dicom';

const text = (s: string) => new TextEncoder().encode(s);
const pngBytes = () => sharp({ create: { width: 40, height: 30, channels: 3, background: '#336699' } }).png().toBuffer();
const jpegBytes = () => sharp({ create: { width: 40, height: 30, channels: 3, background: '#993366' } }).jpeg().toBuffer();

describe('sniffType', () => {
  it('reads DICOM from "DICM" after the 128-byte preamble', () => {
    const dicom = makeUltrasoundDicom({ patientId: 'P1', accessionNumber: 'A1' });
    expect(sniffType(dicom)).toBe('dicom');
    // The same magic anywhere else is not DICOM.
    expect(sniffType(text('DICM' + ' '.repeat(200)))).toBeNull();
  });

  it('refuses a DICOM data set without the Part 10 preamble (documented choice)', () => {
    const dicom = makeUltrasoundDicom({ patientId: 'P1', accessionNumber: 'A1' });
    expect(sniffType(dicom.subarray(132))).toBeNull();
  });

  it('reads PNG and JPEG from their signatures', async () => {
    expect(sniffType(await pngBytes())).toBe('png');
    expect(sniffType(await jpegBytes())).toBe('jpeg');
    // One byte off the PNG signature is not a PNG.
    const png = Buffer.from(await pngBytes());
    png[7] = 0x00;
    expect(sniffType(png)).toBeNull();
  });

  it('calls text, empty and short files nothing', () => {
    expect(sniffType(text('PatientID,P0000012\nthis is not an image\n'.repeat(10)))).toBeNull();
    expect(sniffType(new Uint8Array(0))).toBeNull();
    expect(sniffType(new Uint8Array([0xff, 0xd8]))).toBeNull();
  });
});

describe('typeRefusal', () => {
  it('refuses a text file named .dcm, saying it has no DICOM header', () => {
    const bytes = text('hello, I am a text file\n'.repeat(20));
    const message = typeRefusal(sniffType(bytes), 'IM0001.dcm', 'application/dicom', bytes);
    expect(message).toMatch(/“IM0001\.dcm” is not a DICOM file: it has no DICOM header/);
    expect(message).toMatch(/Nothing was stored/);
  });

  it('refuses a PNG that claims to be a JPEG, by name or by media type', async () => {
    const png = await pngBytes();
    expect(typeRefusal('png', 'scan.jpg', '')).toMatch(/named “scan\.jpg”, but it is a PNG image/);
    expect(typeRefusal('png', 'scan.png', 'image/jpeg')).toMatch(/sent as image\/jpeg, but it is a PNG image/);
    expect(typeRefusal(sniffType(png), 'scan.png', 'image/png')).toBeNull();
  });

  it('accepts a DICOM file without an extension or named after its UID', () => {
    expect(claimFromName('IM000001')).toBeNull();
    expect(claimFromName('1.2.840.113619.2.55.3.12')).toBeNull();
    expect(typeRefusal('dicom', '1.2.840.113619.2.55.3.12', 'application/octet-stream')).toBeNull();
    expect(typeRefusal('dicom', 'IM000001.DCM', '')).toBeNull();
  });

  it('refuses other file types even when the bytes are an image', () => {
    expect(typeRefusal('png', 'scan.gif', 'image/gif')).toMatch(/named “scan\.gif” and sent as image\/gif, but it is a PNG image/);
    expect(typeRefusal(null, 'notes.txt', 'text/plain')).toMatch(/is not a DICOM file, PNG image or JPEG image/);
  });
});

describe('sizeRefusal', () => {
  it('holds each type to its own limit, to the byte', () => {
    expect(sizeRefusal('png', SIZE_LIMITS.png)).toBeNull();
    expect(sizeRefusal('png', SIZE_LIMITS.png + 1)).toMatch(/limit for PNG and JPEG images is 20 MB/);
    expect(sizeRefusal('dicom', SIZE_LIMITS.png + 1)).toBeNull();
    expect(sizeRefusal('dicom', SIZE_LIMITS.dicom + 1)).toMatch(/limit for DICOM files is 64 MB/);
    expect(formatBytes(1536)).toBe('1.5 KB');
  });
});

describe('readDicomFacts', () => {
  it('reads the identifiers, trims DICOM padding and decodes UTF-8 names', () => {
    const study = newUid();
    const sop = newUid();
    // Odd lengths make dcmjs pad: PatientID and AccessionNumber with a space, UIDs with NUL.
    const file = makeUltrasoundDicom({
      patientId: ' P0000012 ',
      accessionNumber: 'A2612010007',
      studyInstanceUid: study,
      sopInstanceUid: sop,
      patientName: 'Ødegård^Zoë',
      specificCharacterSet: 'ISO_IR 192',
      rows: 30,
      columns: 40,
    });
    const ds = parsePart10(file);
    // The trap this guards against: dicom-parser decodes as Latin-1 and keeps the padding.
    expect(ds.string('x00100010')).not.toBe('Ødegård^Zoë');
    const raw = ds.byteArray.subarray(ds.elements.x00080050!.dataOffset, ds.elements.x00080050!.dataOffset + ds.elements.x00080050!.length);
    expect(raw.at(-1)).toBe(0x20);

    const facts = readDicomFacts(file);
    expect(facts).toMatchObject({
      patientId: 'P0000012',
      patientName: 'Ødegård^Zoë',
      accessionNumber: 'A2612010007',
      studyInstanceUid: study,
      sopInstanceUid: sop,
      sopClassUid: '1.2.840.10008.5.1.4.1.1.6.1',
      modality: 'US',
      transferSyntaxUid: '1.2.840.10008.1.2.1',
      rows: 30,
      columns: 40,
      frames: 1,
      hasPixelData: true,
    });
    expect(facts.acquired).toMatchObject({ date: '2026-12-03', hour: 10, minute: 15, second: 30 });
  });

  it('decodes a Latin-1 (ISO_IR 100) name with its own character set', () => {
    const file = makeUltrasoundDicom({ patientId: 'P1', accessionNumber: 'A1', patientName: 'Zoë', specificCharacterSet: 'ISO_IR 100' });
    // dcmjs always writes UTF-8: rewrite the name's bytes as Latin-1, space-padded to even length.
    const at = file.indexOf(Buffer.from('Zo\u00c3\u00ab', 'latin1'));
    file.set([0x5a, 0x6f, 0xeb, 0x20], at);
    expect(readDicomFacts(file).patientName).toBe('Zoë');
  });

  it('refuses bytes that start like DICOM but are cut short', () => {
    const file = makeUltrasoundDicom({ patientId: 'P1', accessionNumber: 'A1' });
    expect(() => readDicomFacts(file.subarray(0, 200))).toThrow(/damaged/);
  });

  it('maps character sets and trims spaces and NULs', () => {
    expect(decoderFor('ISO_IR 192').encoding).toBe('utf-8');
    expect(decoderFor('ISO 2022 IR 100').encoding).toBe('windows-1252');
    expect(decoderFor(undefined).encoding).toBe('windows-1252');
    expect(trimDicom(' 1.2.3\u0000')).toBe('1.2.3');
  });
});

describe('DICOM dates and times', () => {
  it('reads DT values with optional parts and offsets', () => {
    expect(parseDicomDateTime('20261203101530.25')).toEqual({ date: '2026-12-03', hour: 10, minute: 15, second: 30, millisecond: 250, offsetMinutes: null });
    expect(parseDicomDateTime('202612031015-0600')).toMatchObject({ hour: 10, minute: 15, second: 0, offsetMinutes: -360 });
    expect(parseDicomDateTime('20260230')).toBeNull();
    expect(parseDicomDateTime('00010101')).toBeNull();
    expect(parseDicomDateTime('not a date')).toBeNull();
  });

  it('takes clinic time when the file has no offset, and the offset when it has one', () => {
    // America/Chicago is UTC−6 in December.
    expect(toInstant(parseDicomDateTime('20261203101530')!, 'America/Chicago').toISOString()).toBe('2026-12-03T16:15:30.000Z');
    expect(toInstant(parseDicomDateTime('20261203101530+0100')!, 'America/Chicago').toISOString()).toBe('2026-12-03T09:15:30.000Z');
  });
});

describe('matchToExam', () => {
  const exam = { mrn: 'P0000012', accessionNumber: 'A2612010007', studyInstanceUid: '2.25.100' };

  it('accepts a file whose Patient ID and Accession Number are the exam’s', () => {
    expect(matchToExam({ patientId: 'P0000012', accessionNumber: 'A2612010007', studyInstanceUid: '2.25.999' }, exam)).toEqual({ ok: true, by: 'accession' });
  });

  it('refuses when either one differs, naming both values', () => {
    const wrongPatient = matchToExam({ patientId: 'P0000099', accessionNumber: 'A2612010007', studyInstanceUid: '2.25.100' }, exam);
    expect(wrongPatient.ok).toBe(false);
    const wrongAccession = matchToExam({ patientId: 'P0000012', accessionNumber: 'A2612010004', studyInstanceUid: '2.25.100' }, exam);
    expect(wrongAccession.ok).toBe(false);
    expect(mismatchMessage({ patientId: 'P0000099', accessionNumber: 'A2612010004', studyInstanceUid: '' }, exam)).toBe(
      'This file is for patient ID P0000099 and accession A2612010004, but this exam is P0000012 / A2612010007. Nothing was stored.',
    );
  });

  it('with no accession number in the file, accepts the exam’s Study Instance UID instead, and nothing else', () => {
    expect(matchToExam({ patientId: 'P0000012', accessionNumber: '', studyInstanceUid: '2.25.100' }, exam)).toEqual({ ok: true, by: 'study-uid' });
    const other = matchToExam({ patientId: 'P0000012', accessionNumber: '', studyInstanceUid: '2.25.7' }, exam);
    expect(other.ok || other.message).toMatch(/no accession number and Study Instance UID 2\.25\.7, but this exam is P0000012 \/ A2612010007 \(Study Instance UID 2\.25\.100\)/);
    // A matching study UID does not excuse a wrong patient.
    expect(matchToExam({ patientId: 'P0000099', accessionNumber: '', studyInstanceUid: '2.25.100' }, exam).ok).toBe(false);
    expect(matchToExam({ patientId: '', accessionNumber: '', studyInstanceUid: '2.25.100' }, exam).ok).toBe(false);
  });
});

describe('thumbnails', () => {
  it('draws the first frame of an uncompressed DICOM image', async () => {
    const file = makeUltrasoundDicom({ patientId: 'P1', accessionNumber: 'A1', rows: 200, columns: 400 });
    const thumb = await dicomThumbnail(file, readDicomFacts(file));
    const meta = await sharp(thumb!).metadata();
    expect(meta.format).toBe('jpeg');
    expect([meta.width, meta.height]).toEqual([THUMBNAIL_PX, 160]);
    // The bright disc in the middle survives; the top-left corner is dark.
    const { data, info } = await sharp(thumb!).greyscale().raw().toBuffer({ resolveWithObject: true });
    expect(data[Math.floor(info.height / 2) * info.width + Math.floor(info.width / 2)]).toBeGreaterThan(200);
    expect(data[0]).toBeLessThan(40);
  });

  it('draws a JPEG Baseline DICOM image and an RGB one', async () => {
    const jpeg = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#e0e0e0' } }).jpeg().toBuffer();
    const file = makeUltrasoundDicom({ patientId: 'P1', accessionNumber: 'A1', jpegFrame: jpeg, rows: 48, columns: 64, photometric: 'RGB' });
    const facts = readDicomFacts(file);
    expect(pixelRoute(facts.transferSyntaxUid)).toBe('jpeg-baseline');
    expect((await sharp((await dicomThumbnail(file, facts))!).metadata()).width).toBe(64);
    const rgb = makeUltrasoundDicom({ patientId: 'P1', accessionNumber: 'A1', photometric: 'RGB' });
    expect(await dicomThumbnail(rgb, readDicomFacts(rgb))).not.toBeNull();
  });

  it('gives no thumbnail for compressed pixel data it cannot draw, and refuses a broken PNG', async () => {
    const file = makeUltrasoundDicom({ patientId: 'P1', accessionNumber: 'A1' });
    const facts = { ...readDicomFacts(file), transferSyntaxUid: '1.2.840.10008.1.2.4.90' };
    expect(await dicomThumbnail(file, facts)).toBeNull();
    const png = await pngBytes();
    await expect(imageThumbnail(png.subarray(0, 40))).rejects.toThrow();
  });
});

import { randomUUID } from 'node:crypto';
import { createRequire } from 'node:module';
import { testEnv } from './env';

/** The part of dcmjs the tests use to write DICOM files (dcmjs ships no types). */
interface Dcmjs {
  data: {
    DicomDict: new (meta: unknown) => { dict: unknown; write(): ArrayBuffer };
    DicomMetaDictionary: { denaturalizeDataset(dataset: Record<string, unknown>): unknown };
  };
  log: { setLevel(level: string): void };
}
export const dcmjs = createRequire(import.meta.url)('dcmjs') as Dcmjs;
dcmjs.log.setLevel('error');

export const US_IMAGE_STORAGE = '1.2.840.10008.5.1.4.1.1.6.1';
export const EXPLICIT_VR_LITTLE_ENDIAN = '1.2.840.10008.1.2.1';
export const JPEG_BASELINE = '1.2.840.10008.1.2.4.50';

/** A fresh UID under the UUID root (2.25), like the ones Crestline makes. */
export const newUid = () => `2.25.${BigInt(`0x${randomUUID().replace(/-/g, '')}`).toString()}`;

export interface DicomSpec {
  patientId: string;
  accessionNumber: string;
  studyInstanceUid?: string;
  patientName?: string;
  /** e.g. 'ISO_IR 192' for UTF-8 names; omitted: the default repertoire. */
  specificCharacterSet?: string;
  sopInstanceUid?: string;
  acquisitionDateTime?: string;
  rows?: number;
  columns?: number;
  /** 'MONOCHROME2' (8-bit grey, the default) or 'RGB' (8-bit colour, as many scanners send). */
  photometric?: 'MONOCHROME2' | 'RGB';
  /** A JPEG stream to encapsulate instead of uncompressed pixels (JPEG Baseline). */
  jpegFrame?: Uint8Array;
  /** Default Ultrasound Image Storage; e.g. '1.2.840.10008.5.1.4.1.1.3.1' for a multi-frame (cine) object. */
  sopClassUid?: string;
  /** Frames of uncompressed pixels (the gradient, repeated); more than 1 writes Number of Frames. */
  frames?: number;
  /** Extra attributes by dcmjs keyword, e.g. { WindowCenter: 128 }. */
  extra?: Record<string, unknown>;
}

/**
 * A small, valid ultrasound image (Ultrasound Image Storage) as a DICOM Part 10 file, made by
 * dcmjs. Pixels are a diagonal gradient with a bright disc, so a drawn frame is never blank.
 */
export function makeUltrasoundDicom(spec: DicomSpec): Buffer {
  const rows = spec.rows ?? 48;
  const columns = spec.columns ?? 64;
  const rgb = spec.photometric === 'RGB';
  const sop = spec.sopInstanceUid ?? newUid();
  const transferSyntax = spec.jpegFrame ? JPEG_BASELINE : EXPLICIT_VR_LITTLE_ENDIAN;
  const sopClass = spec.sopClassUid ?? US_IMAGE_STORAGE;
  const frames = spec.frames ?? 1;
  const meta = {
    FileMetaInformationVersion: new Uint8Array([0, 1]).buffer,
    MediaStorageSOPClassUID: sopClass,
    MediaStorageSOPInstanceUID: sop,
    TransferSyntaxUID: transferSyntax,
    ImplementationClassUID: '2.25.305828488182831875890203105390285383139',
  };
  const pixels = spec.jpegFrame ? toArrayBuffer(spec.jpegFrame) : repeated(gradient(rows, columns, rgb ? 3 : 1), frames).buffer;
  const dataset: Record<string, unknown> = {
    ...(spec.specificCharacterSet ? { SpecificCharacterSet: spec.specificCharacterSet } : {}),
    SOPClassUID: sopClass,
    ...(frames > 1 ? { NumberOfFrames: frames } : {}),
    SOPInstanceUID: sop,
    StudyInstanceUID: spec.studyInstanceUid ?? newUid(),
    SeriesInstanceUID: newUid(),
    Modality: 'US',
    PatientID: spec.patientId,
    PatientName: spec.patientName ?? 'Test^Patient',
    AccessionNumber: spec.accessionNumber,
    AcquisitionDateTime: spec.acquisitionDateTime ?? '20261203101530',
    Rows: rows,
    Columns: columns,
    SamplesPerPixel: rgb ? 3 : 1,
    PhotometricInterpretation: rgb ? 'RGB' : 'MONOCHROME2',
    ...(rgb ? { PlanarConfiguration: 0 } : {}),
    BitsAllocated: 8,
    BitsStored: 8,
    HighBit: 7,
    PixelRepresentation: 0,
    ...spec.extra,
    PixelData: [pixels],
    _vrMap: { PixelData: spec.jpegFrame ? 'OB' : 'OW' },
  };
  const dict = new dcmjs.data.DicomDict(dcmjs.data.DicomMetaDictionary.denaturalizeDataset(meta));
  dict.dict = dcmjs.data.DicomMetaDictionary.denaturalizeDataset(dataset);
  return Buffer.from(dict.write());
}

/** The frame's bytes `times` times over (a cine loop of one still picture). */
function repeated(frame: Uint8Array, times: number): Uint8Array {
  if (times <= 1) return frame;
  const out = new Uint8Array(frame.length * times);
  for (let i = 0; i < times; i++) out.set(frame, i * frame.length);
  return out;
}

function toArrayBuffer(bytes: Uint8Array): ArrayBuffer {
  return bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
}

/** Grey (or colour) gradient with a bright disc in the middle. */
export function gradient(rows: number, columns: number, channels: 1 | 3): Uint8Array {
  const out = new Uint8Array(rows * columns * channels);
  for (let y = 0; y < rows; y++) {
    for (let x = 0; x < columns; x++) {
      const inDisc = (x - columns / 2) ** 2 + (y - rows / 2) ** 2 < (Math.min(rows, columns) / 4) ** 2;
      const v = inDisc ? 250 : Math.round(((x + y) / (rows + columns)) * 180);
      for (let c = 0; c < channels; c++) out[(y * columns + x) * channels + c] = c === 1 ? Math.max(0, v - 40) : v;
    }
  }
  return out;
}

/** One file to send in a multipart upload. */
export interface UploadPart {
  name: string;
  bytes: Uint8Array;
  /** The Content-Type of the part; '' sends none (as a browser does for an unknown extension). */
  type?: string;
}

/** POSTs files as multipart/form-data (each in a field named `field`, default "file"). */
export async function postFiles(path: string, parts: UploadPart[], opts: { cookie?: string; field?: string; headers?: Record<string, string> } = {}) {
  const { baseUrl } = testEnv();
  const form = new FormData();
  for (const p of parts) form.append(opts.field ?? 'file', new Blob([new Uint8Array(p.bytes)], p.type ? { type: p.type } : {}), p.name);
  const headers: Record<string, string> = { Origin: baseUrl, ...opts.headers };
  if (opts.cookie) headers.Cookie = opts.cookie;
  const res = await fetch(`${baseUrl}${path}`, { method: 'POST', headers, body: form, redirect: 'manual' });
  const text = await res.text();
  let body: any = text;
  try {
    body = JSON.parse(text);
  } catch {
    // not JSON
  }
  return { status: res.status, body, headers: res.headers };
}

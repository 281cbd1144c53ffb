import type { DataSet } from '../../lib/dicom/parser';
import { parsePart10 } from '../../lib/dicom/frames';
import { zonedTimeToUtc } from '../../lib/time';

/** What Crestline reads from a DICOM file, strings decoded and with DICOM's padding trimmed. */
export interface DicomFacts {
  patientId: string;
  /** Decoded with the file's character set; read for matching and the holding list, never logged. */
  patientName: string;
  accessionNumber: string;
  studyInstanceUid: string;
  seriesInstanceUid: string;
  sopInstanceUid: string;
  sopClassUid: string;
  modality: string;
  transferSyntaxUid: string;
  /** Acquisition (else content) date and time as written in the file, still in local time. */
  acquired: DicomDateTime | null;
  rows: number | null;
  columns: number | null;
  frames: number | null;
  hasPixelData: boolean;
}

/** A DICOM date and time: the wall-clock fields, and the UTC offset when the file gives one. */
export interface DicomDateTime {
  date: string;
  hour: number;
  minute: number;
  second: number;
  millisecond: number;
  offsetMinutes: number | null;
}

/** A file that starts like DICOM but cannot be read as one. */
export class DicomReadError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'DicomReadError';
  }
}

/**
 * Specific Character Set (0008,0005) defined terms → WHATWG encoding labels. For ISO 2022 code
 * extensions only the first (default) repertoire is used; escape sequences are not switched.
 */
const CHARSETS: Record<string, string> = {
  'ISO_IR 6': 'windows-1252',
  'ISO_IR 100': 'windows-1252',
  'ISO_IR 101': 'iso-8859-2',
  'ISO_IR 109': 'iso-8859-3',
  'ISO_IR 110': 'iso-8859-4',
  'ISO_IR 144': 'iso-8859-5',
  'ISO_IR 127': 'iso-8859-6',
  'ISO_IR 126': 'iso-8859-7',
  'ISO_IR 138': 'iso-8859-8',
  'ISO_IR 148': 'iso-8859-9',
  'ISO_IR 203': 'iso-8859-15',
  'ISO_IR 13': 'shift_jis',
  'ISO_IR 166': 'windows-874',
  'ISO_IR 192': 'utf-8',
  GB18030: 'gb18030',
  GBK: 'gbk',
};

/** The text decoder for a Specific Character Set value, e.g. 'ISO_IR 192' → UTF-8. */
export function decoderFor(specificCharacterSet: string | undefined): TextDecoder {
  const first = (specificCharacterSet ?? '').split('\\')[0]!.trim().replace(/^ISO 2022 IR /, 'ISO_IR ');
  return new TextDecoder(CHARSETS[first] ?? 'windows-1252');
}

/** DICOM pads text with spaces and UIDs with NUL; leading spaces are not significant either. */
export const trimDicom = (value: string) => value.replace(/^[\s\0]+|[\s\0]+$/g, '');

/**
 * Reads the identifiers of a DICOM Part 10 file with dicom-parser. Strings are decoded from
 * their bytes with the file's character set (dicom-parser's own `string()` assumes Latin-1).
 * Throws DicomReadError for a file that cannot be parsed.
 */
export function readDicomFacts(bytes: Uint8Array): DicomFacts {
  let ds: DataSet;
  try {
    ds = parsePart10(bytes);
  } catch {
    // dicom-parser throws strings and objects holding the partial data set; neither is shown.
    throw new DicomReadError('damaged');
  }
  const decoder = decoderFor(rawString(ds, 'x00080005'));
  const text = (tag: string) => {
    const el = ds.elements[tag];
    if (!el || el.length === 0 || el.dataOffset + el.length > ds.byteArray.length) return '';
    return trimDicom(decoder.decode(ds.byteArray.subarray(el.dataOffset, el.dataOffset + el.length)));
  };
  const frames = ds.intString('x00280008');
  const hasPixelData = Boolean(ds.elements.x7fe00010);
  return {
    patientId: text('x00100020'),
    patientName: text('x00100010'),
    accessionNumber: text('x00080050'),
    studyInstanceUid: text('x0020000d'),
    seriesInstanceUid: text('x0020000e'),
    sopInstanceUid: text('x00080018') || text('x00020003'),
    sopClassUid: text('x00080016') || text('x00020002'),
    modality: text('x00080060'),
    transferSyntaxUid: text('x00020010'),
    acquired: acquisitionOf(text),
    rows: ds.uint16('x00280010') ?? null,
    columns: ds.uint16('x00280011') ?? null,
    frames: hasPixelData ? (frames && frames > 0 ? frames : 1) : null,
    hasPixelData,
  };
}

function rawString(ds: DataSet, tag: string): string | undefined {
  try {
    return ds.string(tag);
  } catch {
    return undefined;
  }
}

/** Acquisition DateTime, else Acquisition Date + Time, else Content Date + Time. */
function acquisitionOf(text: (tag: string) => string): DicomDateTime | null {
  const offset = parseOffset(text('x00080201'));
  const dt = parseDicomDateTime(text('x0008002a'));
  if (dt) return dt.offsetMinutes === null ? { ...dt, offsetMinutes: offset } : dt;
  for (const [date, time] of [['x00080022', 'x00080032'], ['x00080023', 'x00080033']] as const) {
    const d = parseDicomDateTime(text(date) + text(time).replace(/:/g, ''));
    if (d) return { ...d, offsetMinutes: offset };
  }
  return null;
}

/** "+0100" → 60, "-0530" → -330; anything else → null. */
function parseOffset(value: string): number | null {
  const m = /^([+-])(\d{2})(\d{2})$/.exec(value);
  if (!m) return null;
  return (m[1] === '-' ? -1 : 1) * (Number(m[2]) * 60 + Number(m[3]));
}

/**
 * A DICOM DT value (YYYYMMDDHHMMSS.FFFFFF&ZZXX, trailing parts optional) or a DA value followed
 * by a TM value, e.g. "20261203101530.25" → 2026-12-03 10:15:30.250. Null when not a date.
 */
export function parseDicomDateTime(value: string): DicomDateTime | null {
  const m = /^(\d{4})(\d{2})(\d{2})(?:(\d{2})(?:(\d{2})(?:(\d{2})(?:\.(\d{1,6}))?)?)?)?([+-]\d{4})?$/.exec(value.trim());
  if (!m) return null;
  const [year, month, day, hour, minute, second] = [m[1], m[2], m[3], m[4] ?? '0', m[5] ?? '0', m[6] ?? '0'].map(Number) as number[];
  const probe = new Date(Date.UTC(year!, month! - 1, day!));
  // Years outside 1900–2199 are placeholders or damage, not acquisition times.
  if (year! < 1900 || year! > 2199) return null;
  if (probe.getUTCMonth() !== month! - 1 || probe.getUTCDate() !== day || hour! > 23 || minute! > 59 || second! > 60) return null;
  return {
    date: `${m[1]}-${m[2]}-${m[3]}`,
    hour: hour!,
    minute: minute!,
    second: Math.min(second!, 59),
    millisecond: m[7] ? Math.floor(Number(`0.${m[7]}`) * 1000) : 0,
    offsetMinutes: m[8] ? parseOffset(m[8]) : null,
  };
}

/** The UTC instant of a DICOM date-time; without an offset in the file it is clinic time. */
export function toInstant(dt: DicomDateTime, clinicTimeZone: string): Date {
  const extra = dt.second * 1000 + dt.millisecond;
  if (dt.offsetMinutes !== null) {
    const [y, mo, d] = dt.date.split('-').map(Number) as [number, number, number];
    return new Date(Date.UTC(y, mo - 1, d, dt.hour, dt.minute) - dt.offsetMinutes * 60_000 + extra);
  }
  return new Date(zonedTimeToUtc(dt.date, dt.hour, dt.minute, clinicTimeZone).getTime() + extra);
}

// @ts-expect-error dcmjs 0.50 ships no type declarations; the little used here is typed below.
import dcmjsModule from 'dcmjs';
import { SOP_CLASS_NAMES } from './dictionary';

/**
 * Numeric measurements of a DICOM Structured Report (the NUM content items of TID 300,
 * as an echo cart sends them in TID 5200 or TID 5300). Isomorphic: bytes in, plain objects out.
 */

/** A coded concept as DICOM sends it: (CodeValue, CodingSchemeDesignator, CodeMeaning). */
export interface SrConcept {
  scheme: string;
  code: string;
  meaning: string;
}

export interface SrMeasurement {
  concept: SrConcept;
  value: number;
  /** The UCUM code of the unit, e.g. 'mm', 'cm/s', 'mm[Hg]'; a non-UCUM unit reads 'SCHEME:code'. */
  unit: string;
  /** Meanings of the enclosing CONTAINERs, root first, e.g. ['Adult Echocardiography Procedure Report', 'Findings']. */
  path: string[];
  /** The Measurement Method modifier, when the SR states one (e.g. DCM 125207 "Method of Disks, Biplane"). */
  method?: SrConcept;
}

/** SR storage classes whose content tree may hold NUM items (PS3.4 B.5), by UID. */
export const SR_SOP_CLASSES: ReadonlyMap<string, string> = new Map([
  ['1.2.840.10008.5.1.4.1.1.88.22', 'Enhanced SR'],
  ['1.2.840.10008.5.1.4.1.1.88.33', 'Comprehensive SR'],
  ['1.2.840.10008.5.1.4.1.1.88.34', 'Comprehensive 3D SR'],
  ['1.2.840.10008.5.1.4.1.1.88.35', 'Extensible SR'],
  // TID 5300 echo reports, whose CID 12300 codes the measurement map knows.
  ['1.2.840.10008.5.1.4.1.1.88.72', 'Simplified Adult Echo SR'],
]);
const SR_FAMILY = '1.2.840.10008.5.1.4.1.1.88.';

// The concept name of TID 300's "Measurement Method" modifier: SCT today, SRT in older SRs.
const MEASUREMENT_METHOD = [
  { scheme: 'SCT', code: '370129005' },
  { scheme: 'SRT', code: 'G-C036' },
];

type Item = Record<string, unknown>;

/**
 * dcmjs naturalizes a sequence to an array, but code (and older dcmjs) may hand over its
 * single item as a bare object; both read as a list here.
 */
function items(value: unknown): Item[] {
  if (Array.isArray(value)) return value.filter((v): v is Item => typeof v === 'object' && v !== null);
  return typeof value === 'object' && value !== null ? [value as Item] : [];
}

function text(value: unknown): string {
  const first = Array.isArray(value) ? value[0] : value;
  return typeof first === 'string' ? first.trim() : typeof first === 'number' ? String(first) : '';
}

// CodeMeaning nested in a sequence is decoded by dcmjs as Latin-1 whatever the Specific
// Character Set says (STACK.md), so a UTF-8 meaning may arrive garbled. Codes and numbers are
// ASCII and safe; meanings are for display only and never matched on.
function concept(sequence: unknown): SrConcept | null {
  const c = items(sequence)[0];
  if (!c) return null;
  return { scheme: text(c.CodingSchemeDesignator), code: text(c.CodeValue), meaning: text(c.CodeMeaning) };
}

/** DS arrives as a number or as its string; anything else (or NaN) is no value. */
function numeric(value: unknown): number | null {
  const first = Array.isArray(value) ? value[0] : value;
  const n = typeof first === 'number' ? first : typeof first === 'string' && first.trim() !== '' ? Number(first) : NaN;
  return Number.isFinite(n) ? n : null;
}

function unitOf(sequence: unknown): string {
  const u = concept(sequence);
  if (!u) return '';
  return u.scheme === 'UCUM' || u.scheme === '' ? u.code : `${u.scheme}:${u.code}`;
}

function methodOf(item: Item): SrConcept | undefined {
  for (const child of items(item.ContentSequence)) {
    const name = concept(child.ConceptNameCodeSequence);
    if (text(child.ValueType) !== 'CODE' || !name) continue;
    if (MEASUREMENT_METHOD.some((m) => m.scheme === name.scheme && m.code === name.code)) {
      return concept(child.ConceptCodeSequence) ?? undefined;
    }
  }
  return undefined;
}

/**
 * Every NUM item with a numeric value, in document order, from a dcmjs naturalized SR data set,
 * e.g. `srMeasurements(ds)[0]` → `{ concept: { scheme: 'LN', code: '29436-3', … }, value: 48, unit: 'mm', path: […] }`.
 * A NUM's own children (its modifiers, or the values it was inferred from) are not listed on
 * their own: the parent is the measurement the cart reported.
 */
export function srMeasurements(dataset: Record<string, unknown>): SrMeasurement[] {
  const out: SrMeasurement[] = [];
  const walk = (item: Item, path: string[]) => {
    const valueType = text(item.ValueType);
    if (valueType === 'NUM') {
      const name = concept(item.ConceptNameCodeSequence);
      const measured = items(item.MeasuredValueSequence)[0];
      const value = measured ? numeric(measured.NumericValue) : null;
      if (name && value !== null) {
        const method = methodOf(item);
        out.push({ concept: name, value, unit: unitOf(measured?.MeasurementUnitsCodeSequence), path, ...(method ? { method } : {}) });
      }
      return;
    }
    const inner = valueType === 'CONTAINER' ? [...path, concept(item.ConceptNameCodeSequence)?.meaning ?? ''] : path;
    for (const child of items(item.ContentSequence)) walk(child, inner);
  };
  walk(dataset, []);
  return out;
}

/** The part of dcmjs this module uses. */
interface Dcmjs {
  data: {
    DicomMessage: { readFile(buffer: ArrayBuffer): { meta: unknown; dict: unknown } };
    DicomMetaDictionary: { naturalizeDataset(dict: unknown): Record<string, unknown> };
  };
}
const dcmjs = dcmjsModule as Dcmjs;

/**
 * Parses a DICOM Part 10 file and lists its measurements (see srMeasurements); throws a
 * readable Error when the bytes are not DICOM or the object is not a structured report.
 */
export function readSrMeasurements(bytes: Uint8Array): SrMeasurement[] {
  // Copy exactly the file's bytes: a Uint8Array may be a view into a larger (pooled) buffer.
  const buffer = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
  let parsed: { meta: unknown; dict: unknown };
  try {
    parsed = dcmjs.data.DicomMessage.readFile(buffer);
  } catch (error) {
    throw new Error(`Not a readable DICOM file: ${error instanceof Error ? error.message : String(error)}`);
  }
  const dataset = dcmjs.data.DicomMetaDictionary.naturalizeDataset(parsed.dict);
  const meta = dcmjs.data.DicomMetaDictionary.naturalizeDataset(parsed.meta);
  const sopClass = text(dataset.SOPClassUID) || text(meta.MediaStorageSOPClassUID);
  if (!SR_SOP_CLASSES.has(sopClass)) {
    const kinds = [...SR_SOP_CLASSES.values()].join(', ');
    // Other SR kinds hold no NUM items (Basic Text SR, Key Object Selection) or none an
    // ultrasound report takes (radiation dose, CAD): a different refusal, as they are SRs.
    if (sopClass.startsWith(SR_FAMILY)) throw new Error(`Not a structured report that carries measurements: SOP Class ${sopClass}; measurements are read from ${kinds}.`);
    const name = SOP_CLASS_NAMES[sopClass] ?? 'of an unknown SOP class';
    throw new Error(`Not a structured report: the object is ${name} (${sopClass || 'no SOP Class UID'}); measurements are read from ${kinds}.`);
  }
  return srMeasurements(dataset);
}

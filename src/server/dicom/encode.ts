import { createRequire } from 'node:module';

/**
 * A small writer for the data sets Crestline sends (worklist answers): text attributes and
 * sequences of them, in Implicit or Explicit VR Little Endian, UTF-8 text (the answers say
 * ISO_IR 192). dcmjs can write these too, but allocates a 256 KB buffer for every data set and
 * sequence item it writes, which made a day's 300 answers take a second; this takes
 * milliseconds. Tags and VRs come from dcmjs's dictionary (by keyword), elements are written in
 * tag order with defined lengths (PS3.5 7.1 and 7.5).
 */

interface DictEntry {
  tag: string;
  vr: string;
}
const dictionary = (createRequire(import.meta.url)('dcmjs') as { data: { DicomMetaDictionary: { nameMap: Record<string, DictEntry | undefined> } } }).data.DicomMetaDictionary.nameMap;

export const IMPLICIT_LITTLE_ENDIAN = '1.2.840.10008.1.2';

/** VRs with the long form in explicit VR: two reserved bytes and a 4-byte length (PS3.5 7.1.2). */
const LONG_FORM = new Set(['OB', 'OD', 'OF', 'OL', 'OV', 'OW', 'SQ', 'SV', 'UC', 'UN', 'UR', 'UT', 'UV']);

export type EncodableValue = string | number | ReadonlyArray<string> | ReadonlyArray<EncodableDataset>;
export interface EncodableDataset {
  [keyword: string]: EncodableValue | undefined;
}

/** Group and element of a dictionary tag "(gggg,eeee)". */
function tagNumbers(tag: string): [number, number] {
  return [parseInt(tag.slice(1, 5), 16), parseInt(tag.slice(6, 10), 16)];
}

function header(group: number, element: number, vr: string, length: number, explicit: boolean): Buffer {
  if (!explicit) {
    const b = Buffer.alloc(8);
    b.writeUInt16LE(group, 0);
    b.writeUInt16LE(element, 2);
    b.writeUInt32LE(length, 4);
    return b;
  }
  if (LONG_FORM.has(vr)) {
    const b = Buffer.alloc(12);
    b.writeUInt16LE(group, 0);
    b.writeUInt16LE(element, 2);
    b.write(vr, 4, 'latin1');
    b.writeUInt32LE(length, 8);
    return b;
  }
  const b = Buffer.alloc(8);
  b.writeUInt16LE(group, 0);
  b.writeUInt16LE(element, 2);
  b.write(vr, 4, 'latin1');
  b.writeUInt16LE(length, 6);
  return b;
}

/** Text bytes padded to even length: UIDs with NUL, everything else with a space. */
function textBytes(value: string, vr: string): Buffer {
  const bytes = Buffer.from(value, 'utf8');
  return bytes.length % 2 === 0 ? bytes : Buffer.concat([bytes, Buffer.from(vr === 'UI' ? [0] : [0x20])]);
}

/** Binary number VRs, little endian (PS3.5 6.2). */
const BINARY: Record<string, (n: number) => Buffer> = {
  US: (n) => {
    const b = Buffer.alloc(2);
    b.writeUInt16LE(n);
    return b;
  },
  UL: (n) => {
    const b = Buffer.alloc(4);
    b.writeUInt32LE(n);
    return b;
  },
};

/**
 * A DIMSE command set (PS3.7 E.1): always Implicit VR Little Endian, led by its group length.
 * Used in place of dcmjs for the hundreds of responses of one worklist query.
 */
export function encodeCommand(elements: EncodableDataset): Buffer {
  const body = encodeDataset({ ...elements, CommandGroupLength: undefined }, IMPLICIT_LITTLE_ENDIAN);
  return Buffer.concat([encodeDataset({ CommandGroupLength: body.length }, IMPLICIT_LITTLE_ENDIAN), body]);
}

/** Writes a data set; keywords not in the dictionary are refused (a programming error, not input). */
export function encodeDataset(dataset: EncodableDataset, transferSyntaxUid: string): Buffer {
  const explicit = transferSyntaxUid !== IMPLICIT_LITTLE_ENDIAN;
  const elements = Object.entries(dataset)
    .filter((e): e is [string, EncodableValue] => e[1] !== undefined && !e[0].startsWith('_'))
    .map(([keyword, value]) => {
      const entry = dictionary[keyword];
      if (!entry) throw new Error(`no DICOM keyword ${keyword}`);
      return { numbers: tagNumbers(entry.tag), vr: entry.vr.split(/\s|or/)[0]!, value };
    })
    .sort((a, b) => a.numbers[0] - b.numbers[0] || a.numbers[1] - b.numbers[1]);
  const parts: Buffer[] = [];
  for (const { numbers: [group, element], vr, value } of elements) {
    let body: Buffer;
    if (vr === 'SQ') {
      const items = (Array.isArray(value) ? value : []) as ReadonlyArray<EncodableDataset>;
      body = Buffer.concat(
        items.map((item) => {
          const inner = encodeDataset(item, transferSyntaxUid);
          const head = Buffer.alloc(8);
          head.writeUInt16LE(0xfffe, 0);
          head.writeUInt16LE(0xe000, 2);
          head.writeUInt32LE(inner.length, 4);
          return Buffer.concat([head, inner]);
        }),
      );
    } else if (BINARY[vr] && typeof value === 'number') {
      body = BINARY[vr](value);
    } else {
      const text = Array.isArray(value) ? value.join('\\') : String(value);
      body = text === '' ? Buffer.alloc(0) : textBytes(text, vr);
    }
    parts.push(header(group, element, vr, body.length, explicit), body);
  }
  return Buffer.concat(parts);
}

/**
 * Wraps a data set received over the network into a DICOM Part 10 file (PS3.10): a 128-byte
 * preamble, "DICM", the File Meta Information group in Explicit VR Little Endian, then the data
 * set exactly as the scanner sent it, in the transfer syntax it was sent in. Nothing of the data
 * set is decoded or re-encoded, so the stored object is the scanner's, byte for byte.
 */

/** Crestline's implementation identity in every file it writes (a UUID-derived "2.25" UID, PS3.5 B.2). */
export const IMPLEMENTATION_CLASS_UID = '2.25.169360129475871043917352081637391270817';
export const IMPLEMENTATION_VERSION_NAME = 'CRESTLINE_1';

export interface FileMeta {
  sopClassUid: string;
  sopInstanceUid: string;
  transferSyntaxUid: string;
  /** The AE title that sent the object. */
  sourceAeTitle?: string;
}

/** One explicit-VR little-endian element with a 2-byte length (UI, SH, AE, UL). */
function element(group: number, elementNo: number, vr: string, value: Buffer): Buffer {
  const head = Buffer.alloc(8);
  head.writeUInt16LE(group, 0);
  head.writeUInt16LE(elementNo, 2);
  head.write(vr, 4, 'latin1');
  head.writeUInt16LE(value.length, 6);
  return Buffer.concat([head, value]);
}

/** Pads to even length: UIDs with NUL, text with a space (PS3.5 6.2). */
function padded(text: string, pad: '\0' | ' '): Buffer {
  return Buffer.from(text.length % 2 ? text + pad : text, 'latin1');
}

/** The File Meta Information group, (0002,0000) group length first. */
export function fileMetaGroup(meta: FileMeta): Buffer {
  // (0002,0001) is OB, which takes the 4-byte length form.
  const version = Buffer.from([0x02, 0x00, 0x01, 0x00, 0x4f, 0x42, 0x00, 0x00, 0x02, 0x00, 0x00, 0x00, 0x00, 0x01]);
  const body = Buffer.concat([
    version,
    element(0x0002, 0x0002, 'UI', padded(meta.sopClassUid, '\0')),
    element(0x0002, 0x0003, 'UI', padded(meta.sopInstanceUid, '\0')),
    element(0x0002, 0x0010, 'UI', padded(meta.transferSyntaxUid, '\0')),
    element(0x0002, 0x0012, 'UI', padded(IMPLEMENTATION_CLASS_UID, '\0')),
    element(0x0002, 0x0013, 'SH', padded(IMPLEMENTATION_VERSION_NAME, ' ')),
    ...(meta.sourceAeTitle ? [element(0x0002, 0x0016, 'AE', padded(meta.sourceAeTitle, ' '))] : []),
  ]);
  const length = Buffer.alloc(4);
  length.writeUInt32LE(body.length, 0);
  return Buffer.concat([element(0x0002, 0x0000, 'UL', length), body]);
}

/** The whole file: preamble, prefix, meta group and the received data set (chunks joined once). */
export function toPart10(meta: FileMeta, dataSet: Buffer | Buffer[]): Buffer {
  const chunks = Array.isArray(dataSet) ? dataSet : [dataSet];
  return Buffer.concat([Buffer.alloc(128), Buffer.from('DICM', 'latin1'), fileMetaGroup(meta), ...chunks]);
}

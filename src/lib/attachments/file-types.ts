/**
 * What may be attached to an exam, how its real type is read from its bytes, and the limits.
 * Isomorphic: the server decides; the upload control uses the same limits to warn before sending.
 */

export const ATTACHMENT_KINDS = ['dicom', 'image'] as const;
export type AttachmentKind = (typeof ATTACHMENT_KINDS)[number];
/** 'network': sent by a scanner (DICOM C-STORE), a later issue. */
export const ATTACHMENT_SOURCES = ['upload', 'network'] as const;
export type AttachmentSource = (typeof ATTACHMENT_SOURCES)[number];
/** 'unmatched': received from the network for no known exam; waits in the holding list. */
export const MATCH_STATUSES = ['matched', 'unmatched'] as const;
export type MatchStatus = (typeof MATCH_STATUSES)[number];

/** The file types we accept, as read from their first bytes. */
export type FileType = 'dicom' | 'png' | 'jpeg';

export const CONTENT_TYPES: Record<FileType, string> = { dicom: 'application/dicom', png: 'image/png', jpeg: 'image/jpeg' };
export const TYPE_LABELS: Record<FileType, string> = { dicom: 'DICOM file', png: 'PNG image', jpeg: 'JPEG image' };
export const kindOf = (type: FileType): AttachmentKind => (type === 'dicom' ? 'dicom' : 'image');

const MB = 1024 * 1024;
/** Largest file of each type. A DICOM cine loop is big; a still PNG or JPEG is not. */
export const SIZE_LIMITS: Record<FileType, number> = { dicom: 64 * MB, png: 20 * MB, jpeg: 20 * MB };
/** Largest file of any type; with MULTIPART_SLACK_BYTES, the largest request body read. */
export const MAX_FILE_BYTES = Math.max(...Object.values(SIZE_LIMITS));
/** Room for the multipart boundaries and part headers around the one file. */
export const MULTIPART_SLACK_BYTES = 64 * 1024;

/** Exam statuses in which images may be added: the patient is here or has been scanned. */
export const IMAGE_EXAM_STATUSES = ['arrived', 'in-progress', 'completed'] as const;

/** For the file input's `accept`. */
export const UPLOAD_ACCEPT = '.dcm,.dicom,application/dicom,.png,image/png,.jpg,.jpeg,image/jpeg';

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

const startsWith = (bytes: Uint8Array, sig: number[], at = 0) =>
  bytes.length >= at + sig.length && sig.every((b, i) => bytes[at + i] === b);

/**
 * The real type of a file from its bytes, or null. DICOM must be a Part 10 file: a 128-byte
 * preamble, then "DICM". A bare data set (no preamble, no meta header) is not accepted: it does
 * not say its transfer syntax, and every scanner and archive exports Part 10 files.
 *
 * @example sniffType(pngBytes) → 'png'
 */
export function sniffType(bytes: Uint8Array): FileType | null {
  if (startsWith(bytes, [0x44, 0x49, 0x43, 0x4d], 128)) return 'dicom';
  if (startsWith(bytes, PNG_SIGNATURE)) return 'png';
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return 'jpeg';
  return null;
}

/**
 * True when the bytes start like a DICOM data set without the Part 10 header: an even group
 * number 0x0002 or 0x0008 as the first tag (little endian), as some tools write "raw" files.
 */
export function looksLikeBareDataset(bytes: Uint8Array): boolean {
  return bytes.length >= 8 && (bytes[1] === 0x00) && (bytes[0] === 0x02 || bytes[0] === 0x08) && bytes[3] === 0x00;
}

/** What a claim points at: one of our types, nothing (no claim), or something else. */
type Claim = FileType | 'other' | null;

const EXTENSIONS: Record<string, FileType> = { dcm: 'dicom', dicom: 'dicom', png: 'png', jpg: 'jpeg', jpeg: 'jpeg', jpe: 'jpeg' };
const MEDIA_TYPES: Record<string, FileType> = {
  'application/dicom': 'dicom',
  'application/x-dicom': 'dicom',
  'image/png': 'png',
  'image/jpeg': 'jpeg',
  'image/jpg': 'jpeg',
  'image/pjpeg': 'jpeg',
};

/**
 * The type a file name claims. No extension is no claim, and neither is an all-digit one:
 * archives name DICOM files after their UID ("1.2.840.….12").
 */
export function claimFromName(name: string): Claim {
  const m = /\.([^./\\]+)$/.exec(name.trim());
  if (!m) return null;
  const ext = m[1]!.toLowerCase();
  if (/^\d+$/.test(ext)) return null;
  return EXTENSIONS[ext] ?? 'other';
}

/** The type a Content-Type claims; empty and application/octet-stream claim nothing. */
export function claimFromMediaType(mediaType: string): Claim {
  const t = mediaType.split(';')[0]!.trim().toLowerCase();
  if (t === '' || t === 'application/octet-stream') return null;
  return MEDIA_TYPES[t] ?? 'other';
}

/**
 * Why a file is refused for its type, or null when it is what it says. `sniffed` is the type
 * read from the bytes; the name and the media type the browser sent are the claims.
 *
 * @example typeRefusal('png', 'scan.jpg', 'image/jpeg') → 'This file is named “scan.jpg” … but it is a PNG image. …'
 */
export function typeRefusal(sniffed: FileType | null, name: string, mediaType: string, bytes?: Uint8Array): string | null {
  const byName = claimFromName(name);
  const byType = claimFromMediaType(mediaType);
  if (!sniffed) {
    if (byName === 'dicom' || byType === 'dicom') {
      const bare = bytes && looksLikeBareDataset(bytes);
      return bare
        ? `“${name}” is a DICOM data set without the DICOM file header. Export it from the scanner as a DICOM file (Part 10) and add that instead. Nothing was stored.`
        : `“${name}” is not a DICOM file: it has no DICOM header (“DICM” at byte 128). Nothing was stored.`;
    }
    return `“${name}” is not a DICOM file, PNG image or JPEG image. Only those can be added to an exam. Nothing was stored.`;
  }
  const said: string[] = [];
  if (byName && byName !== sniffed) said.push(`named “${name}”`);
  if (byType && byType !== sniffed) said.push(`sent as ${mediaType.split(';')[0]!.trim()}`);
  if (said.length === 0) return null;
  return `This file is ${said.join(' and ')}, but it is a ${TYPE_LABELS[sniffed]}. Rename it to match what it is, or export it again. Nothing was stored.`;
}

/** Why a file is too large for its type, or null. */
export function sizeRefusal(type: FileType, sizeBytes: number): string | null {
  if (sizeBytes <= SIZE_LIMITS[type]) return null;
  const what = type === 'dicom' ? 'DICOM files' : 'PNG and JPEG images';
  return `This ${TYPE_LABELS[type]} is ${formatBytes(sizeBytes)}; the limit for ${what} is ${formatBytes(SIZE_LIMITS[type])}. Nothing was stored.`;
}

/** The answer to a request body larger than any accepted file. */
export const BODY_TOO_LARGE = `The upload is too large: the limit is ${formatBytes(SIZE_LIMITS.dicom)} for a DICOM file and ${formatBytes(SIZE_LIMITS.png)} for a PNG or JPEG image. Nothing was stored.`;

/** Human size, e.g. formatBytes(21 * 1024 * 1024) → "21 MB", formatBytes(1536) → "1.5 KB". */
export function formatBytes(n: number): string {
  if (n < 1024) return `${n} bytes`;
  const [value, unit] = n < MB ? [n / 1024, 'KB'] : [n / MB, 'MB'];
  return `${Number.isInteger(value) ? value : value.toFixed(1)} ${unit}`;
}

/** The type a file name suggests, for warnings before an upload is sent (the server sniffs). */
export function typeFromName(name: string): FileType | null {
  const claim = claimFromName(name);
  return claim === 'other' ? null : claim;
}

import { createRequire } from 'node:module';
import sharp from 'sharp';
import { pixelRoute } from '../../lib/dicom/dictionary';
import { firstEncapsulatedFrame, parsePart10 } from '../../lib/dicom/frames';
import type { DicomFacts } from './identifiers';

/** Longest side of a thumbnail, in pixels (the grid shows them at about half that). */
export const THUMBNAIL_PX = 320;
export const THUMBNAIL_CONTENT_TYPE = 'image/jpeg';

type Imaging = typeof import('dcmjs-imaging');
let imaging: Imaging | undefined;

/**
 * dcmjs-imaging and the dcmjs it requires, loaded on first use (they are large). Both are
 * required as CommonJS so the log level is set on the very dcmjs instance the renderer uses;
 * their warnings would otherwise go to the app log.
 */
function loadImaging(): Imaging {
  if (!imaging) {
    const require = createRequire(import.meta.url);
    (require('dcmjs') as { log: { setLevel(level: string): void } }).log.setLevel('error');
    imaging = require('dcmjs-imaging') as Imaging;
    imaging.log.setLevel('error');
  }
  return imaging;
}

const toThumbnail = (image: sharp.Sharp) =>
  image
    .resize(THUMBNAIL_PX, THUMBNAIL_PX, { fit: 'inside', withoutEnlargement: true })
    .flatten({ background: '#ffffff' })
    .jpeg({ quality: 80 })
    .toBuffer();

/**
 * A thumbnail of a PNG or JPEG. Decoding the whole image also proves the file is not damaged:
 * it throws for one that cannot be read.
 */
export async function imageThumbnail(bytes: Uint8Array): Promise<Buffer> {
  return toThumbnail(sharp(bytes, { failOn: 'error' }).rotate());
}

/**
 * A thumbnail of a DICOM object's first frame, or null when it cannot be drawn on the server
 * (no pixel data, or a compression other than JPEG Baseline); the page then shows a placeholder.
 */
export async function dicomThumbnail(bytes: Uint8Array, facts: DicomFacts): Promise<Buffer | null> {
  if (!facts.hasPixelData) return null;
  try {
    const route = pixelRoute(facts.transferSyntaxUid);
    if (route === 'jpeg-baseline') {
      const frame = firstEncapsulatedFrame(parsePart10(bytes));
      return frame ? await toThumbnail(sharp(frame, { failOn: 'error' })) : null;
    }
    if (route === 'uncompressed') {
      const { DicomImage } = loadImaging();
      const copy = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
      const rendered = new DicomImage(copy).render({ frame: 0, renderOverlays: false });
      const rgba = Buffer.from(rendered.pixels);
      return await toThumbnail(sharp(rgba, { raw: { width: rendered.width, height: rendered.height, channels: 4 } }));
    }
    return null;
  } catch {
    // A frame we cannot decode is not a reason to refuse the file: the bytes are kept as sent
    // and the viewer or a DICOM workstation may still show it.
    return null;
  }
}

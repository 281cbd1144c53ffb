/**
 * The few DICOM transfer syntaxes and SOP classes Crestline names or treats differently.
 * Isomorphic: the server picks how to make a thumbnail, the viewer how to draw a frame.
 */

/** How the first frame's pixels can be drawn: decoded by dcmjs-imaging, or a JPEG the browser or sharp decodes. */
export type PixelRoute = 'uncompressed' | 'jpeg-baseline' | 'unsupported';

const UNCOMPRESSED = new Set([
  '1.2.840.10008.1.2', // Implicit VR Little Endian
  '1.2.840.10008.1.2.1', // Explicit VR Little Endian
  '1.2.840.10008.1.2.2', // Explicit VR Big Endian (retired)
  '1.2.840.10008.1.2.1.99', // Deflated Explicit VR Little Endian
]);
/** JPEG Baseline (Process 1), 8 bits: any browser and libjpeg decode it as it is. */
const JPEG_BASELINE = '1.2.840.10008.1.2.4.50';

export const TRANSFER_SYNTAX_NAMES: Record<string, string> = {
  '1.2.840.10008.1.2': 'Implicit VR Little Endian',
  '1.2.840.10008.1.2.1': 'Explicit VR Little Endian',
  '1.2.840.10008.1.2.2': 'Explicit VR Big Endian',
  '1.2.840.10008.1.2.1.99': 'Deflated Explicit VR Little Endian',
  '1.2.840.10008.1.2.4.50': 'JPEG Baseline (Process 1)',
  '1.2.840.10008.1.2.4.51': 'JPEG Extended (Process 2 & 4)',
  '1.2.840.10008.1.2.4.57': 'JPEG Lossless (Process 14)',
  '1.2.840.10008.1.2.4.70': 'JPEG Lossless (Process 14, SV1)',
  '1.2.840.10008.1.2.4.80': 'JPEG-LS Lossless',
  '1.2.840.10008.1.2.4.81': 'JPEG-LS Near-Lossless',
  '1.2.840.10008.1.2.4.90': 'JPEG 2000 Lossless',
  '1.2.840.10008.1.2.4.91': 'JPEG 2000',
  '1.2.840.10008.1.2.5': 'RLE Lossless',
};

export const SOP_CLASS_NAMES: Record<string, string> = {
  '1.2.840.10008.5.1.4.1.1.6.1': 'Ultrasound Image',
  '1.2.840.10008.5.1.4.1.1.3.1': 'Ultrasound Multi-frame Image',
  '1.2.840.10008.5.1.4.1.1.6.2': 'Enhanced US Volume',
  '1.2.840.10008.5.1.4.1.1.7': 'Secondary Capture Image',
  '1.2.840.10008.5.1.4.1.1.7.2': 'Multi-frame Grayscale Byte Secondary Capture Image',
  '1.2.840.10008.5.1.4.1.1.7.4': 'Multi-frame True Color Secondary Capture Image',
  '1.2.840.10008.5.1.4.1.1.88.22': 'Enhanced SR',
  '1.2.840.10008.5.1.4.1.1.88.33': 'Comprehensive SR',
  '1.2.840.10008.5.1.4.1.1.104.1': 'Encapsulated PDF',
};

/** How to draw the pixels of a transfer syntax, e.g. pixelRoute('1.2.840.10008.1.2.1') → 'uncompressed'. */
export function pixelRoute(transferSyntaxUid: string | null | undefined): PixelRoute {
  if (!transferSyntaxUid) return 'unsupported';
  if (UNCOMPRESSED.has(transferSyntaxUid)) return 'uncompressed';
  if (transferSyntaxUid === JPEG_BASELINE) return 'jpeg-baseline';
  return 'unsupported';
}

import { dicomParser, type DataSet } from './parser';

/**
 * The compressed bytes of the first frame of encapsulated pixel data (e.g. one JPEG stream),
 * or null when the data set has none. Works with or without a Basic Offset Table.
 */
export function firstEncapsulatedFrame(dataSet: DataSet): Uint8Array | null {
  const pixels = dataSet.elements.x7fe00010;
  if (!pixels?.encapsulatedPixelData || !pixels.fragments?.length) return null;
  if (pixels.basicOffsetTable?.length) return dicomParser.readEncapsulatedImageFrame(dataSet, pixels, 0);
  const frames = dataSet.intString('x00280008') ?? 1;
  // Without an offset table, a single frame is all the fragments; several frames are found
  // by their JPEG start-of-image markers.
  if (frames <= 1) return dicomParser.readEncapsulatedPixelDataFromFragments(dataSet, pixels, 0, pixels.fragments.length);
  return dicomParser.readEncapsulatedImageFrame(dataSet, pixels, 0, dicomParser.createJPEGBasicOffsetTable(dataSet, pixels));
}

/** Parses a DICOM Part 10 file (everything but the pixel values themselves is read). */
export function parsePart10(bytes: Uint8Array): DataSet {
  return dicomParser.parseDicom(bytes);
}

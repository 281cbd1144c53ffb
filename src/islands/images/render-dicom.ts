import * as imagingModule from 'dcmjs-imaging';
import { readUltrasoundRegions, type UltrasoundRegion } from '../../lib/dicom/calibration';
import type { PixelRoute } from '../../lib/dicom/dictionary';
import { firstEncapsulatedFrame, parsePart10 } from '../../lib/dicom/frames';
import type { DataSet } from '../../lib/dicom/parser';

// Loaded only through import() when a DICOM object is opened: dcmjs is large.
const imaging: typeof imagingModule = (imagingModule as unknown as { default?: typeof imagingModule }).default ?? imagingModule;
imaging.log.setLevel('error');

export interface Drawn {
  width: number;
  height: number;
  /** e.g. "Window 400 / Level 40 (from the file)"; null for colour images. */
  windowLevel: string | null;
  /** The image's Sequence of Ultrasound Regions, for the calipers; [] when it has none. */
  regions: UltrasoundRegion[];
}

/**
 * Draws the first frame of a DICOM Part 10 file into the canvas. Uncompressed pixel data goes
 * through dcmjs-imaging (modality and VOI LUTs, the file's window or one from the pixel values);
 * JPEG Baseline frames are handed to the browser's own JPEG decoder.
 */
export async function drawDicom(buffer: ArrayBuffer, route: PixelRoute, canvas: HTMLCanvasElement): Promise<Drawn> {
  const context = canvas.getContext('2d');
  if (!context) throw new Error('This browser cannot draw on a canvas.');
  // One dicom-parser pass serves the JPEG frame and the calibration. For uncompressed files
  // dcmjs-imaging reads the pixels itself; if dicom-parser cannot read the file (a deflated one
  // needs an inflater it lacks in the browser), the image is still drawn, without calipers.
  const dataSet = route === 'jpeg-baseline' ? parsePart10(new Uint8Array(buffer)) : parseOrNull(buffer);
  const regions = dataSet ? readUltrasoundRegions(dataSet) : [];
  if (route === 'jpeg-baseline') {
    const frame = dataSet && firstEncapsulatedFrame(dataSet);
    if (!frame) throw new Error('The file has no image frame.');
    const bitmap = await createImageBitmap(new Blob([new Uint8Array(frame)], { type: 'image/jpeg' }));
    canvas.width = bitmap.width;
    canvas.height = bitmap.height;
    context.drawImage(bitmap, 0, 0);
    bitmap.close();
    return { width: canvas.width, height: canvas.height, windowLevel: null, regions };
  }
  const rendered = new imaging.DicomImage(buffer).render({ frame: 0 });
  canvas.width = rendered.width;
  canvas.height = rendered.height;
  context.putImageData(new ImageData(new Uint8ClampedArray(rendered.pixels), rendered.width, rendered.height), 0, 0);
  const wl = rendered.windowLevel;
  // dcmjs-imaging names the window it works out itself; any other came with the file.
  const from = /min-?max/i.test(wl?.getDescription() ?? '') ? 'from the pixel values' : 'from the file';
  return {
    width: rendered.width,
    height: rendered.height,
    windowLevel: wl ? `Window ${round(wl.getWindow())} / Level ${round(wl.getLevel())} (${from})` : null,
    regions,
  };
}

function parseOrNull(buffer: ArrayBuffer): DataSet | null {
  try {
    return parsePart10(new Uint8Array(buffer));
  } catch {
    return null;
  }
}

const round = (n: number) => (Math.abs(n) >= 10 ? Math.round(n) : Math.round(n * 10) / 10);

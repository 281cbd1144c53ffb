// Lengths measured on an ultrasound image, calibrated by the image's own Sequence of Ultrasound
// Regions (0018,6011; US Region Calibration Module, PS3.3 C.8.5.5). Pure and isomorphic: only
// a type comes from dicom-parser, so the viewer and the tests run the very same arithmetic.
import { cmToMm } from '../clinical/units';
import type { DataSet } from './parser';

/** Physical Units X/Y Direction (0018,6024/6026) code for centimetres. */
export const PHYSICAL_UNITS_CM = 3;

// Physical Units codes (PS3.3 C.8.5.5), as they read in a sentence.
const UNIT_NAMES: Readonly<Record<number, string>> = {
  1: 'percent', 2: 'dB', 3: 'cm', 4: 'seconds', 5: 'hertz', 6: 'dB per second',
  7: 'cm/s', 8: 'cm²', 9: 'cm²/s', 10: 'cm³', 11: 'cm³/s', 12: 'degrees',
};

// Region Spatial Format (0018,6012) codes (PS3.3 C.8.5.5), as a plain noun.
const FORMAT_NAMES: Readonly<Record<number, string>> = {
  1: 'a 2D image', 2: 'an M-mode strip', 3: 'a Doppler strip', 4: 'a trace such as an ECG', 5: 'a graphic',
};

/** What every region states about itself, whether or not lengths can be measured in it. */
interface RegionBase {
  /** Position in the sequence, from 0. */
  index: number;
  /** Region Spatial Format (0018,6012): 1 = 2D, 2 = M-mode, 3 = spectral Doppler, 4 = waveform, 5 = graphics. */
  spatialFormat: number;
  /** Region Data Type (0018,6014): 1 = tissue, 2 = colour flow, 3 = PW and 4 = CW spectral Doppler, … */
  dataType: number;
  /** Region Location Min X0, Min Y0, Max X1, Max Y1 (0018,6018–601E): first and last pixel column and row, inclusive. */
  minX0: number;
  minY0: number;
  maxX1: number;
  maxY1: number;
  /** Physical Units X/Y Direction (0018,6024/6026) codes; 3 = cm. */
  physicalUnitsX: number;
  physicalUnitsY: number;
}

/** A region calibrated in cm on both axes: lengths can be measured in it. */
export interface LengthRegion extends RegionBase {
  kind: 'length';
  /** Physical Delta X/Y (0018,602C/602E): the size of one pixel, in cm. */
  physicalDeltaXCm: number;
  physicalDeltaYCm: number;
}

/** Any other region (Doppler, M-mode, traces, graphics, or cm without a pixel size). */
export interface OtherRegion extends RegionBase {
  kind: 'other';
  /** Physical Delta X/Y in physicalUnitsX/Y, null when absent. */
  physicalDeltaX: number | null;
  physicalDeltaY: number | null;
}

export type UltrasoundRegion = LengthRegion | OtherRegion;

/** A point in image pixel coordinates: x to the right, y down, pixel (0, 0) covering [0, 1) × [0, 1). */
export interface ImagePoint {
  x: number;
  y: number;
}

export type CaliperResult = { ok: true; mm: number; region: LengthRegion } | { ok: false; reason: string };

const usableDelta = (delta: number | null): delta is number => delta !== null && Number.isFinite(delta) && delta !== 0;

/**
 * The regions of the Sequence of Ultrasound Regions in a parsed DICOM data set, e.g. a 2D tissue
 * region over a Doppler strip → `[{ kind: 'length', … }, { kind: 'other', spatialFormat: 3, … }]`.
 * A region without a complete location cannot be placed and is left out; no sequence gives [].
 */
export function readUltrasoundRegions(dataSet: DataSet): UltrasoundRegion[] {
  const items = dataSet.elements.x00186011?.items ?? [];
  return items.flatMap((item, index) => {
    const region = item.dataSet ? readRegion(item.dataSet, index) : null;
    return region ? [region] : [];
  });
}

function readRegion(ds: DataSet, index: number): UltrasoundRegion | null {
  const [minX0, minY0, maxX1, maxY1] = ['x00186018', 'x0018601a', 'x0018601c', 'x0018601e'].map((tag) => ds.uint32(tag));
  if (minX0 === undefined || minY0 === undefined || maxX1 === undefined || maxY1 === undefined) return null;
  if (maxX1 < minX0 || maxY1 < minY0) return null;
  const base: RegionBase = {
    index,
    spatialFormat: ds.uint16('x00186012') ?? 0,
    dataType: ds.uint16('x00186014') ?? 0,
    minX0, minY0, maxX1, maxY1,
    physicalUnitsX: ds.uint16('x00186024') ?? 0,
    physicalUnitsY: ds.uint16('x00186026') ?? 0,
  };
  const deltaX = ds.double('x0018602c') ?? null;
  const deltaY = ds.double('x0018602e') ?? null;
  const cm = base.physicalUnitsX === PHYSICAL_UNITS_CM && base.physicalUnitsY === PHYSICAL_UNITS_CM;
  if (cm && usableDelta(deltaX) && usableDelta(deltaY)) return { ...base, kind: 'length', physicalDeltaXCm: deltaX, physicalDeltaYCm: deltaY };
  return { ...base, kind: 'other', physicalDeltaX: deltaX, physicalDeltaY: deltaY };
}

/**
 * Whether a point lies in a region. Region Location names pixels (inclusive), and pixel c
 * covers [c, c + 1), so the region spans [minX0, maxX1 + 1) × [minY0, maxY1 + 1).
 */
export function regionContains(region: UltrasoundRegion, p: ImagePoint): boolean {
  return p.x >= region.minX0 && p.x < region.maxX1 + 1 && p.y >= region.minY0 && p.y < region.maxY1 + 1;
}

/**
 * The length of a caliper line from a to b, in mm, or why there is none. Points are image
 * pixel coordinates used as given (not snapped to pixel centres): the length is
 * √((dx·ΔX)² + (dy·ΔY)²) cm, e.g. 30 px across and 40 px down at 0.01 cm per pixel → 5 mm.
 * Both ends must lie in one region calibrated in cm on both axes.
 */
export function caliperLength(regions: readonly UltrasoundRegion[], a: ImagePoint, b: ImagePoint): CaliperResult {
  if (regions.length === 0) return { ok: false, reason: 'This image carries no length calibration, so no length can be given.' };
  const around = (p: ImagePoint) => regions.filter((r) => regionContains(r, p));
  const atA = around(a);
  const atB = around(b);
  if (atA.length === 0 || atB.length === 0) {
    const which = atA.length === 0 && atB.length === 0 ? 'The line lies' : 'One end of the line lies';
    return { ok: false, reason: `${which} outside the measurable parts of the image (for example on the margin or the text); measure within the scan.` };
  }
  const shared = atA.filter((r) => atB.includes(r));
  if (shared.length === 0) return { ok: false, reason: 'The two ends are in different regions of the image; measure within one.' };
  const calibrated = shared.filter((r): r is LengthRegion => r.kind === 'length');
  // Explain the smallest region: a Doppler strip says more than a whole-screen graphic around it.
  if (calibrated.length === 0) return { ok: false, reason: uncalibratedReason(shared.reduce((s, r) => (area(r) < area(s) ? r : s)) as OtherRegion) };
  const [region, ...others] = calibrated as [LengthRegion, ...LengthRegion[]];
  // Overlapping regions (a colour box inside the 2D image) normally share one pixel size; if
  // they do not, no number is safer than a number from the wrong one.
  if (others.some((r) => !samePixelSize(r, region))) {
    return { ok: false, reason: 'Overlapping regions of the image give different pixel sizes here, so the length is uncertain; measure elsewhere in the image.' };
  }
  const dxCm = (b.x - a.x) * region.physicalDeltaXCm;
  const dyCm = (b.y - a.y) * region.physicalDeltaYCm;
  return { ok: true, mm: cmToMm(Math.hypot(dxCm, dyCm)), region };
}

const area = (r: UltrasoundRegion) => (r.maxX1 - r.minX0 + 1) * (r.maxY1 - r.minY0 + 1);
const close = (u: number, v: number) => Math.abs(Math.abs(u) - Math.abs(v)) <= 1e-6 * Math.max(Math.abs(u), Math.abs(v));
const samePixelSize = (r: LengthRegion, s: LengthRegion) => close(r.physicalDeltaXCm, s.physicalDeltaXCm) && close(r.physicalDeltaYCm, s.physicalDeltaYCm);

/** Why a region gives no length, e.g. "… (it is a Doppler strip measured in seconds across and cm/s up and down)." */
function uncalibratedReason(region: OtherRegion): string {
  const what = FORMAT_NAMES[region.spatialFormat] ?? 'a part without a stated kind';
  if (region.physicalUnitsX === PHYSICAL_UNITS_CM && region.physicalUnitsY === PHYSICAL_UNITS_CM) {
    return `This part of the image has no usable length calibration (it is ${what} in cm, but the file does not give the size of its pixels).`;
  }
  const x = UNIT_NAMES[region.physicalUnitsX];
  const y = UNIT_NAMES[region.physicalUnitsY];
  const units = x && y ? (x === y ? ` measured in ${x}` : ` measured in ${x} across and ${y} up and down`) : x ? ` measured in ${x} across` : y ? ` measured in ${y} up and down` : ' without physical units';
  return `This part of the image has no length calibration (it is ${what}${units}).`;
}

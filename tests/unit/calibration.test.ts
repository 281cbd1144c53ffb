import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { caliperLength, readUltrasoundRegions, type LengthRegion, type OtherRegion, type UltrasoundRegion } from '../../src/lib/dicom/calibration';
import { parsePart10 } from '../../src/lib/dicom/frames';
import { pointInContainedImage } from '../../src/lib/dicom/view-geometry';
import { makeUltrasoundDicom } from '../helpers/dicom';

// Codes from PS3.3 C.8.5.5 (US Region Calibration Module): Physical Units 3 = cm, 4 = seconds,
// 7 = cm/s; Region Spatial Format 1 = 2D, 3 = spectral (Doppler); Region Data Type 1 = tissue,
// 2 = colour flow, 3 = PW spectral Doppler.
const tissue = (over: Partial<LengthRegion> = {}): LengthRegion => ({
  kind: 'length', index: 0, spatialFormat: 1, dataType: 1,
  minX0: 0, minY0: 0, maxX1: 199, maxY1: 149,
  physicalUnitsX: 3, physicalUnitsY: 3, physicalDeltaXCm: 0.01, physicalDeltaYCm: 0.01,
  ...over,
});
const dopplerStrip = (over: Partial<OtherRegion> = {}): OtherRegion => ({
  kind: 'other', index: 1, spatialFormat: 3, dataType: 3,
  minX0: 0, minY0: 150, maxX1: 199, maxY1: 249,
  physicalUnitsX: 4, physicalUnitsY: 7, physicalDeltaX: 0.005, physicalDeltaY: -0.5,
  ...over,
});

describe('caliperLength', () => {
  it('gives the length of a 3-4-5 line in a region of 0.01 cm pixels', () => {
    // Arithmetic, common practice (Pythagoras): √(30² + 40²) = 50 px; 50 px × 0.01 cm = 0.5 cm = 5.0 mm.
    const r = caliperLength([tissue()], { x: 10, y: 20 }, { x: 40, y: 60 });
    expect(r).toMatchObject({ ok: true, region: { index: 0 } });
    expect(r.ok && r.mm).toBeCloseTo(5.0, 9);
  });

  it('is the same whichever end is drawn first', () => {
    // Arithmetic: the squares of −30 and −40 equal those of 30 and 40.
    const r = caliperLength([tissue()], { x: 40, y: 60 }, { x: 10, y: 20 });
    expect(r.ok && r.mm).toBeCloseTo(5.0, 9);
  });

  it('uses each axis its own pixel size', () => {
    // Arithmetic: 30 px × 0.02 cm = 0.6 cm across, 40 px × 0.01 cm = 0.4 cm down;
    // √(0.36 + 0.16) = √0.52 = 0.72111 cm = 7.2111 mm.
    const r = caliperLength([tissue({ physicalDeltaXCm: 0.02, physicalDeltaYCm: 0.01 })], { x: 10, y: 20 }, { x: 40, y: 60 });
    expect(r.ok && r.mm).toBeCloseTo(Math.sqrt(0.52) * 10, 9);
    expect(r.ok && r.mm).toBeCloseTo(7.2111, 4);
    // Arithmetic: a purely vertical line sees only ΔY: 40 px × 0.01 cm = 0.4 cm = 4 mm.
    const vertical = caliperLength([tissue({ physicalDeltaXCm: 0.02, physicalDeltaYCm: 0.01 })], { x: 10, y: 20 }, { x: 10, y: 60 });
    expect(vertical.ok && vertical.mm).toBeCloseTo(4, 9);
  });

  it('takes points as given, between pixel centres too', () => {
    // Arithmetic: 12.5 px × 0.04 cm = 0.5 cm = 5 mm.
    const r = caliperLength([tissue({ physicalDeltaXCm: 0.04, physicalDeltaYCm: 0.04 })], { x: 10.25, y: 5 }, { x: 22.75, y: 5 });
    expect(r.ok && r.mm).toBeCloseTo(5, 9);
  });

  it('counts the last row and column named by the region as inside it', () => {
    // PS3.3 C.8.5.5: Max X1/Y1 name the region's last pixel; pixel 199 spans [199, 200).
    expect(caliperLength([tissue()], { x: 0, y: 0 }, { x: 199.9, y: 149.9 }).ok).toBe(true);
    expect(caliperLength([tissue()], { x: 0, y: 0 }, { x: 200, y: 10 }).ok).toBe(false);
  });

  it('gives no number when an end is outside every region', () => {
    const r = caliperLength([tissue({ minX0: 20, minY0: 20 })], { x: 5, y: 5 }, { x: 50, y: 50 });
    expect(r).toEqual({ ok: false, reason: expect.stringContaining('One end of the line lies outside the measurable parts of the image') });
    const both = caliperLength([tissue({ minX0: 20, minY0: 20 })], { x: 5, y: 5 }, { x: 10, y: 10 });
    expect(both).toEqual({ ok: false, reason: expect.stringContaining('The line lies outside') });
  });

  it('gives no number in a region measured in seconds and cm/s, and says so', () => {
    // PS3.3 C.8.5.5: a spectral Doppler strip has X in seconds (4) and Y in cm/s (7).
    const r = caliperLength([tissue(), dopplerStrip()], { x: 20, y: 160 }, { x: 60, y: 200 });
    expect(r).toEqual({
      ok: false,
      reason: 'This part of the image has no length calibration (it is a Doppler strip measured in seconds across and cm/s up and down).',
    });
  });

  it('gives no number in a cm region that does not give its pixel size', () => {
    const r = caliperLength([{ ...dopplerStrip(), spatialFormat: 1, dataType: 1, physicalUnitsX: 3, physicalUnitsY: 3, physicalDeltaX: null, physicalDeltaY: null }], { x: 20, y: 160 }, { x: 60, y: 200 });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.reason).toContain('does not give the size of its pixels');
  });

  it('gives no number when the two ends are in two regions', () => {
    const r = caliperLength([tissue(), dopplerStrip()], { x: 20, y: 100 }, { x: 20, y: 200 });
    expect(r).toEqual({ ok: false, reason: 'The two ends are in different regions of the image; measure within one.' });
    // Two 2D regions side by side (dual view), both in cm: still two regions.
    const dual = [tissue({ maxX1: 99 }), tissue({ index: 1, minX0: 100, maxX1: 199 })];
    expect(caliperLength(dual, { x: 50, y: 50 }, { x: 150, y: 50 }).ok).toBe(false);
  });

  it('measures across a colour box inside the 2D region it overlaps', () => {
    // Common practice: the colour-flow box (Data Type 2) lies inside the tissue region with the same pixel size.
    const box = tissue({ index: 1, dataType: 2, minX0: 50, minY0: 50, maxX1: 99, maxY1: 99 });
    // Arithmetic: 30 px across, 40 px down → 50 px × 0.01 cm = 5 mm.
    const r = caliperLength([tissue(), box], { x: 60, y: 60 }, { x: 90, y: 100 });
    expect(r.ok && r.mm).toBeCloseTo(5, 9);
    expect(r.ok && r.region.index).toBe(0);
  });

  it('gives no number where overlapping regions disagree on the pixel size', () => {
    const box = tissue({ index: 1, dataType: 2, minX0: 50, minY0: 50, maxX1: 99, maxY1: 99, physicalDeltaXCm: 0.02 });
    expect(caliperLength([tissue(), box], { x: 60, y: 60 }, { x: 90, y: 90 }).ok).toBe(false);
  });

  it('gives no number on an image without regions', () => {
    expect(caliperLength([], { x: 0, y: 0 }, { x: 10, y: 10 })).toEqual({ ok: false, reason: expect.stringContaining('no length calibration') });
  });
});

// Items by dcmjs keyword: a 2D tissue region above a PW Doppler strip. Values are the test's
// own; dcmjs's dictionary supplies the tags (0018,6012–602E) and VRs (US, UL, FD).
const REGION_ITEMS = [
  {
    RegionSpatialFormat: 1, RegionDataType: 1, RegionFlags: 0,
    RegionLocationMinX0: 0, RegionLocationMinY0: 0, RegionLocationMaxX1: 199, RegionLocationMaxY1: 149,
    PhysicalUnitsXDirection: 3, PhysicalUnitsYDirection: 3, PhysicalDeltaX: 0.0123, PhysicalDeltaY: 0.0125,
  },
  {
    RegionSpatialFormat: 3, RegionDataType: 3, RegionFlags: 0,
    RegionLocationMinX0: 0, RegionLocationMinY0: 150, RegionLocationMaxX1: 199, RegionLocationMaxY1: 249,
    PhysicalUnitsXDirection: 4, PhysicalUnitsYDirection: 7, PhysicalDeltaX: 0.004, PhysicalDeltaY: -0.75,
  },
];

/** The part of dcmjs used here (it ships no types), loaded as tests/helpers/dicom.ts does. */
interface Dcmjs {
  data: {
    DicomDict: new (meta: unknown) => { dict: unknown; write(): ArrayBuffer };
    DicomMetaDictionary: { denaturalizeDataset(dataset: Record<string, unknown>): unknown };
  };
}
const dcmjs = createRequire(import.meta.url)('dcmjs') as Dcmjs;

/** A Part 10 file in Implicit VR Little Endian (1.2.840.10008.1.2), header only. */
function writeImplicitVr(dataset: Record<string, unknown>): Uint8Array {
  const sop = '2.25.1001';
  const meta = {
    FileMetaInformationVersion: new Uint8Array([0, 1]).buffer,
    MediaStorageSOPClassUID: '1.2.840.10008.5.1.4.1.1.6.1',
    MediaStorageSOPInstanceUID: sop,
    TransferSyntaxUID: '1.2.840.10008.1.2',
    ImplementationClassUID: '2.25.1002',
  };
  const dict = new dcmjs.data.DicomDict(dcmjs.data.DicomMetaDictionary.denaturalizeDataset(meta));
  dict.dict = dcmjs.data.DicomMetaDictionary.denaturalizeDataset({ SOPClassUID: '1.2.840.10008.5.1.4.1.1.6.1', SOPInstanceUID: sop, Modality: 'US', ...dataset });
  return new Uint8Array(dict.write());
}

describe('readUltrasoundRegions', () => {
  // A DICOM Part 10 image written by dcmjs (Explicit VR Little Endian, the tests' helper) and
  // read back by dicom-parser, as the viewer does.
  const file = makeUltrasoundDicom({
    patientId: 'P1',
    accessionNumber: 'A1',
    rows: 250,
    columns: 200,
    extra: { SequenceOfUltrasoundRegions: REGION_ITEMS },
  });

  it('reads each region of the Sequence of Ultrasound Regions (0018,6011)', () => {
    const regions = readUltrasoundRegions(parsePart10(new Uint8Array(file)));
    expect(regions).toEqual<UltrasoundRegion[]>([
      {
        kind: 'length', index: 0, spatialFormat: 1, dataType: 1, minX0: 0, minY0: 0, maxX1: 199, maxY1: 149,
        physicalUnitsX: 3, physicalUnitsY: 3, physicalDeltaXCm: 0.0123, physicalDeltaYCm: 0.0125,
      },
      {
        kind: 'other', index: 1, spatialFormat: 3, dataType: 3, minX0: 0, minY0: 150, maxX1: 199, maxY1: 249,
        physicalUnitsX: 4, physicalUnitsY: 7, physicalDeltaX: 0.004, physicalDeltaY: -0.75,
      },
    ]);
  });

  it('measures with what it read', () => {
    const regions = readUltrasoundRegions(parsePart10(new Uint8Array(file)));
    // Arithmetic: 100 px × 0.0123 cm = 1.23 cm = 12.3 mm across.
    const r = caliperLength(regions, { x: 50, y: 10 }, { x: 150, y: 10 });
    expect(r.ok && r.mm).toBeCloseTo(12.3, 9);
  });

  it('reads the sequence from an Implicit VR Little Endian file too, as many scanners send', () => {
    const regions = readUltrasoundRegions(parsePart10(writeImplicitVr({ SequenceOfUltrasoundRegions: [REGION_ITEMS[0]] })));
    expect(regions).toEqual([expect.objectContaining({ kind: 'length', maxX1: 199, maxY1: 149, physicalDeltaXCm: 0.0123, physicalDeltaYCm: 0.0125 })]);
  });

  it('gives no regions for a file without the sequence', () => {
    expect(readUltrasoundRegions(parsePart10(new Uint8Array(makeUltrasoundDicom({ patientId: 'P1', accessionNumber: 'A1' }))))).toEqual([]);
  });
});

describe('pointInContainedImage', () => {
  it('scales a pointer position to image pixels', () => {
    // Arithmetic: a 640×480 image fills a 320×240 box at half scale; box (160, 120) → image (320, 240).
    expect(pointInContainedImage({ left: 10, top: 20, width: 320, height: 240 }, { width: 640, height: 480 }, { x: 170, y: 140 })).toEqual({ x: 320, y: 240 });
  });

  it('allows for the bands of a letterboxed image', () => {
    // Arithmetic: 640×480 in a 400×240 box → scale min(0.625, 0.5) = 0.5, picture 320 wide,
    // bands of (400 − 320) / 2 = 40 px; box x 40 is image x 0, box x 200 is image x 320.
    const box = { left: 0, top: 0, width: 400, height: 240 };
    expect(pointInContainedImage(box, { width: 640, height: 480 }, { x: 40, y: 0 })).toEqual({ x: 0, y: 0 });
    expect(pointInContainedImage(box, { width: 640, height: 480 }, { x: 200, y: 120 })).toEqual({ x: 320, y: 240 });
    // A pointer in a band moves to the picture's edge.
    expect(pointInContainedImage(box, { width: 640, height: 480 }, { x: 5, y: 300 })).toEqual({ x: 0, y: 480 });
  });
});

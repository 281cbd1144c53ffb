import { describe, expect, it } from 'vitest';
import {
  DEFAULT_PROBE,
  depthCmFromRoundTripUs,
  nearFieldLengthMm,
  PROBE_KINDS,
  roundTripUsPerCm,
  SPEED_OF_SOUND_SOFT_TISSUE_M_S,
  TEMPLATES,
  ULTRASOUND_MIN_FREQUENCY_HZ,
  wavelengthMm,
} from '@/lib/clinical';

describe('speed of sound', () => {
  it('is 1540 m/s in soft tissue', () => {
    // CLINICAL.md §7, common practice
    expect(SPEED_OF_SOUND_SOFT_TISSUE_M_S).toBe(1540);
    expect(ULTRASOUND_MIN_FREQUENCY_HZ).toBe(20_000);
  });
});

describe('depthCmFromRoundTripUs', () => {
  it('applies the range equation', () => {
    // CLINICAL.md §7 and V18, common practice: 130 µs → 10.0 cm; 65 µs → 5.0 cm
    expect(depthCmFromRoundTripUs(130)).toBeCloseTo(10.01, 2);
    expect(depthCmFromRoundTripUs(65)).toBeCloseTo(5.005, 3);
  });

  it('needs about 13 µs per cm of depth', () => {
    // CLINICAL.md §7, common practice: 12.99 µs/cm
    expect(roundTripUsPerCm()).toBeCloseTo(12.99, 2);
    expect(depthCmFromRoundTripUs(roundTripUsPerCm())).toBeCloseTo(1, 12);
  });
});

describe('wavelengthMm', () => {
  it('is c/f', () => {
    // CLINICAL.md §7 and V19, common practice
    expect(wavelengthMm(5)).toBeCloseTo(0.308, 6);
    expect(wavelengthMm(2.5)).toBeCloseTo(0.616, 6);
    expect(wavelengthMm(3.5)).toBeCloseTo(0.44, 6);
    expect(wavelengthMm(7.5)).toBeCloseTo(0.2053, 4);
    expect(wavelengthMm(10)).toBeCloseTo(0.154, 6);
  });
});

describe('nearFieldLengthMm', () => {
  it('uses D²/(4λ)', () => {
    // CLINICAL.md §7 and V20, common practice: D 10 mm at 5 MHz → 81.2 mm
    expect(nearFieldLengthMm(10, 5)).toBeCloseTo(81.17, 2);
    // soft-tissue shortcut D² × f / 6.16 gives the same
    expect(nearFieldLengthMm(10, 5)).toBeCloseTo((100 * 5) / 6.16, 6);
  });
});

describe('probe kinds', () => {
  it('defaults to linear for thyroid, curvilinear for abdomen, phased array for echo', () => {
    // CLINICAL.md §7, common practice
    expect(DEFAULT_PROBE).toEqual({ thyroid: 'linear', abdomen: 'curvilinear', echo: 'phased-array' });
    expect(TEMPLATES.thyroid.defaultProbe).toBe('linear');
    expect(TEMPLATES.abdomen.defaultProbe).toBe('curvilinear');
    expect(TEMPLATES.echo.defaultProbe).toBe('phased-array');
  });

  it('gives superficial probes higher frequencies than deep ones', () => {
    // CLINICAL.md §7, common practice: linear ~5–15 MHz, curved ~2–5, phased ~1–5
    expect(PROBE_KINDS.linear.typicalMHz[0]).toBeGreaterThan(PROBE_KINDS.curvilinear.typicalMHz[0]);
    expect(PROBE_KINDS['phased-array'].typicalMHz[1]).toBeLessThan(PROBE_KINDS.linear.typicalMHz[1]);
  });
});

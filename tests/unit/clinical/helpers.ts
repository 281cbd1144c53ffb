// Test helpers for the clinical engine: a seeded generator for property-style loops (no
// dependency) and shared fixtures.
import type { EvaluateInput, EvaluationResult, EvaluationSuccess } from '@/lib/clinical';

/** mulberry32: small, fast, deterministic; the same seed gives the same sequence on every run. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Uniform number in [min, max) from a generator. */
export const between = (rnd: () => number, min: number, max: number): number => min + (max - min) * rnd();

/** Narrow an evaluation to success, failing the test with the field errors otherwise. */
export function expectOk(result: EvaluationResult): EvaluationSuccess {
  if (!result.ok) throw new Error(`expected ok, got ${JSON.stringify(result.fieldErrors)}`);
  return result;
}

/**
 * A full echo set built from the CLINICAL.md worked examples: M1 linear dimensions (§1.3),
 * FS/Teichholz 5.0/3.2 (§1.4–1.5), LA row 1 (§1.6), RVSP row 1 (§1.7), E/e′ example (§1.8)
 * and the D1 diastolic case (§1.9), for a 55-year-old, 170 cm / 70 kg.
 */
export function fullEchoInput(sex: 'male' | 'female' | 'unknown'): EvaluateInput {
  return {
    templateId: 'echo',
    measurements: {
      rhythm: 'sinus',
      myocardialDisease: 'no',
      significantMitralDisease: 'no',
      ivsdCm: 1.0,
      lviddCm: 5.0,
      pwdCm: 1.0,
      lvidsCm: 3.2,
      aorticRootCm: 3.2,
      lvefPercent: 60,
      laAreaA4cCm2: 18,
      laAreaA2cCm2: 17,
      laLengthA4cCm: 5.0,
      laLengthA2cCm: 5.2,
      eVelocityCmS: 80,
      aVelocityCmS: 60,
      septalEPrimeCmS: 6,
      lateralEPrimeCmS: 8,
      rvBasalMm: 36,
      rvMidMm: 29,
      tapseMm: 22,
      rvSPrimeCmS: 12,
      rvFacPercent: 45,
      raAreaCm2: 15,
      trVelocityMS: 3.0,
      ivcDiameterCm: 1.8,
      ivcCollapsePercent: 60,
      rvWallMm: 4,
    },
    patient: { sex, birthDate: '1970-03-01', examDate: '2025-03-01', heightCm: 170, weightKg: 70 },
  };
}

/** A thyroid set with the §1.1 lobes and four nodules built from the §3.4 worked nodules. */
export function thyroidInputWithFourNodules(): EvaluateInput {
  return {
    templateId: 'thyroid',
    measurements: {
      rightLobeLengthCm: 4.8,
      rightLobeWidthCm: 1.6,
      rightLobeDepthCm: 1.5,
      leftLobeLengthCm: 4.5,
      leftLobeWidthCm: 1.5,
      leftLobeDepthCm: 1.4,
      isthmusThicknessMm: 3,
      cervicalNodes: 'no-suspicious',
    },
    nodules: [
      // T1: 4 points, TR4, 1.2 cm → follow-up
      { id: 'N1', lobe: 'right', zone: 'mid', lengthMm: 12, widthMm: 10, depthMm: 8, composition: 'solid', echogenicity: 'hypoechoic', shape: 'wider-than-tall', margin: 'smooth', foci: ['none-or-comet-tail'] },
      // T2: 2 points, TR2, 3.0 cm → nothing
      { id: 'N2', lobe: 'left', zone: 'upper', lengthMm: 30, widthMm: 22, depthMm: 18, composition: 'mixed', echogenicity: 'hyperechoic-or-isoechoic', shape: 'wider-than-tall', margin: 'smooth', foci: ['none-or-comet-tail'] },
      // T4: 3 points, TR3, 2.6 cm → FNA
      { id: 'N3', lobe: 'left', zone: 'lower', lengthMm: 26, widthMm: 18, depthMm: 15, composition: 'solid', echogenicity: 'hyperechoic-or-isoechoic', shape: 'wider-than-tall', margin: 'smooth', foci: [] },
      // T5: spongiform → 0 points, TR1
      { id: 'N4', lobe: 'isthmus', lengthMm: 15, widthMm: 12, depthMm: 10, composition: 'spongiform', echogenicity: 'hypoechoic', shape: 'taller-than-wide', margin: 'lobulated-or-irregular', foci: ['punctate'] },
    ],
    patient: { sex: 'female', birthDate: '1980-05-20', examDate: '2025-05-20' },
  };
}

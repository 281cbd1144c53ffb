import { PRECISION } from '../../rounding';
import { choice, num, YES_NO } from '../fields';
import type { DerivedDef, ReferenceCheck, SectionDef } from '../types';

// Sections follow the usual TTE scan order: context, parasternal long axis, apical views,
// subcostal. Linear LV dimensions are in cm as in the ASE tables; RV sizes and TAPSE in mm.
// Bounds refuse the other unit: 48 (mm) in LVIDd cm, 1.8 (cm) in TAPSE mm, 280 (cm/s) in TR m/s.
export const ECHO_SECTIONS: readonly SectionDef[] = [
  {
    id: 'context',
    title: 'Clinical context',
    fields: [
      choice('rhythm', 'Rhythm', [['sinus', 'Sinus rhythm'], ['atrial-fibrillation', 'Atrial fibrillation'], ['other', 'Other']]),
      choice('myocardialDisease', 'Known myocardial disease', YES_NO),
      choice('significantMitralDisease', 'Significant mitral valve disease', YES_NO),
    ],
  },
  {
    id: 'plax',
    title: 'Parasternal long axis (2D-guided linear, end-diastole unless stated)',
    fields: [
      num('ivsdCm', 'IVSd', 'cm', PRECISION.lvDimensionCm, [0.3, 3], 'B-mode', 1.0),
      num('lviddCm', 'LVIDd', 'cm', PRECISION.lvDimensionCm, [2, 9], 'B-mode', 4.8),
      num('pwdCm', 'PWd', 'cm', PRECISION.lvDimensionCm, [0.3, 3], 'B-mode', 0.9),
      num('lvidsCm', 'LVIDs (end-systole)', 'cm', PRECISION.lvDimensionCm, [1, 8], 'B-mode', 3.1),
      num('aorticRootCm', 'Aortic root at the sinuses of Valsalva', 'cm', PRECISION.lvDimensionCm, [1.5, 7], 'B-mode', 3.3),
    ],
  },
  {
    id: 'apical-lv',
    title: 'Apical views: LV function',
    fields: [num('lvefPercent', 'LVEF (biplane method of disks)', '%', PRECISION.percent, [5, 90], 'B-mode', 60)],
  },
  {
    id: 'left-atrium',
    title: 'Left atrium (end-systole)',
    fields: [
      num('laAreaA4cCm2', 'LA area, apical 4-chamber', 'cm2', 0, [5, 80], 'B-mode', 18),
      num('laAreaA2cCm2', 'LA area, apical 2-chamber', 'cm2', 0, [5, 80], 'B-mode', 17),
      num('laLengthA4cCm', 'LA length, apical 4-chamber', 'cm', PRECISION.lvDimensionCm, [2, 10], 'B-mode', 5.0),
      num('laLengthA2cCm', 'LA length, apical 2-chamber', 'cm', PRECISION.lvDimensionCm, [2, 10], 'B-mode', 5.1),
    ],
  },
  {
    id: 'mitral',
    title: 'Mitral inflow and tissue Doppler',
    fields: [
      num('eVelocityCmS', 'Mitral E velocity', 'cm/s', PRECISION.velocityCmS, [20, 250], 'Doppler', 80),
      num('aVelocityCmS', 'Mitral A velocity', 'cm/s', PRECISION.velocityCmS, [10, 200], 'Doppler', 60),
      num('septalEPrimeCmS', 'Septal e′', 'cm/s', PRECISION.tissueVelocityCmS, [1, 30], 'Doppler', 8),
      num('lateralEPrimeCmS', 'Lateral e′', 'cm/s', PRECISION.tissueVelocityCmS, [1, 30], 'Doppler', 11),
    ],
  },
  {
    id: 'right-heart',
    title: 'Right heart (RV-focused apical view)',
    fields: [
      num('rvBasalMm', 'RV basal diameter', 'mm', 0, [10, 80], 'B-mode', 35),
      num('rvMidMm', 'RV mid diameter', 'mm', 0, [10, 70], 'B-mode', 28),
      num('tapseMm', 'TAPSE', 'mm', 0, [3, 45], 'M-mode', 22),
      num('rvSPrimeCmS', 'RV S′', 'cm/s', PRECISION.tissueVelocityCmS, [2, 30], 'Doppler', 12),
      num('rvFacPercent', 'RV fractional area change', '%', PRECISION.percent, [5, 80], 'B-mode', 45),
      num('raAreaCm2', 'RA area (end-systole)', 'cm2', 0, [5, 60], 'B-mode', 15),
      num('trVelocityMS', 'TR peak velocity', 'm/s', PRECISION.trVelocityMS, [0.5, 7], 'Doppler', 2.4),
    ],
  },
  {
    id: 'subcostal',
    title: 'Subcostal',
    fields: [
      num('ivcDiameterCm', 'IVC diameter (end-expiration)', 'cm', PRECISION.ivcCm, [0.3, 4.5], 'B-mode', 1.8),
      num('ivcCollapsePercent', 'IVC collapse with sniff', '%', PRECISION.percent, [0, 100], 'B-mode', 60),
      num('rvWallMm', 'RV free wall thickness', 'mm', 0, [1, 15], 'B-mode', 4),
    ],
  },
];

export const ECHO_DERIVED: readonly DerivedDef[] = [
  { code: 'bsaM2', label: 'BSA', unit: 'm2', decimals: PRECISION.bsaM2 },
  { code: 'lvMassG', label: 'LV mass (ASE linear method)', unit: 'g', decimals: PRECISION.lvMassG },
  { code: 'lvmiGM2', label: 'LV mass index', unit: 'g/m2', decimals: PRECISION.lvmiGM2 },
  { code: 'rwt', label: 'Relative wall thickness', unit: 'ratio', decimals: PRECISION.rwt },
  { code: 'lviddIndexCmM2', label: 'LVIDd/BSA', unit: 'cm/m2', decimals: PRECISION.lvDimensionCm },
  { code: 'fsPercent', label: 'Fractional shortening', unit: '%', decimals: PRECISION.percent },
  { code: 'teichholzEdvMl', label: 'LV end-diastolic volume (Teichholz)', unit: 'mL', decimals: PRECISION.volumeMl },
  { code: 'teichholzEsvMl', label: 'LV end-systolic volume (Teichholz)', unit: 'mL', decimals: PRECISION.volumeMl },
  { code: 'teichholzEfPercent', label: 'EF (Teichholz, from linear dimensions)', unit: '%', decimals: PRECISION.percent },
  { code: 'laVolumeMl', label: 'LA volume (biplane area-length)', unit: 'mL', decimals: PRECISION.volumeMl },
  { code: 'laviMlM2', label: 'LA volume index', unit: 'mL/m2', decimals: PRECISION.laviMlM2 },
  { code: 'eOverA', label: 'E/A', unit: 'ratio', decimals: PRECISION.eOverA },
  { code: 'eOverEPrimeAverage', label: 'Average E/e′', unit: 'ratio', decimals: PRECISION.eOverEPrime },
  { code: 'eOverEPrimeSeptal', label: 'Septal E/e′', unit: 'ratio', decimals: PRECISION.eOverEPrime },
  { code: 'eOverEPrimeLateral', label: 'Lateral E/e′', unit: 'ratio', decimals: PRECISION.eOverEPrime },
  { code: 'trGradientMmHg', label: 'TR peak gradient', unit: 'mmHg', decimals: PRECISION.pressureMmHg },
  { code: 'rapMmHg', label: 'Estimated RA pressure', unit: 'mmHg', decimals: PRECISION.pressureMmHg },
  { code: 'rvspMmHg', label: 'RVSP', unit: 'mmHg', decimals: PRECISION.pressureMmHg },
  { code: 'aorticRootExpectedCm', label: 'Expected aortic root (sinuses)', unit: 'cm', decimals: PRECISION.zScore },
  { code: 'aorticRootZ', label: 'Aortic root z-score', unit: 'z', decimals: PRECISION.zScore },
];

// Teichholz EF is deliberately absent: it is labelled, never graded (CLINICAL.md §1.5).
export const ECHO_REFERENCE_CHECKS: readonly ReferenceCheck[] = [
  { valueCode: 'lvefPercent', referenceCode: 'lvef' },
  { valueCode: 'ivsdCm', referenceCode: 'ivsd' },
  { valueCode: 'lviddCm', referenceCode: 'lvidd' },
  { valueCode: 'pwdCm', referenceCode: 'pwd' },
  { valueCode: 'lvidsCm', referenceCode: 'lvids' },
  { valueCode: 'lvMassG', referenceCode: 'lv-mass' },
  { valueCode: 'lvmiGM2', referenceCode: 'lvmi' },
  { valueCode: 'rwt', referenceCode: 'rwt' },
  { valueCode: 'lviddIndexCmM2', referenceCode: 'lvidd-index' },
  { valueCode: 'fsPercent', referenceCode: 'fs' },
  { valueCode: 'laviMlM2', referenceCode: 'lavi' },
  { valueCode: 'eOverEPrimeAverage', referenceCode: 'e-over-e-prime-average' },
  { valueCode: 'eOverEPrimeSeptal', referenceCode: 'e-over-e-prime-septal' },
  { valueCode: 'eOverEPrimeLateral', referenceCode: 'e-over-e-prime-lateral' },
  { valueCode: 'septalEPrimeCmS', referenceCode: 'septal-e-prime' },
  { valueCode: 'lateralEPrimeCmS', referenceCode: 'lateral-e-prime' },
  { valueCode: 'trVelocityMS', referenceCode: 'tr-velocity' },
  { valueCode: 'rvBasalMm', referenceCode: 'rv-basal' },
  { valueCode: 'rvMidMm', referenceCode: 'rv-mid' },
  { valueCode: 'tapseMm', referenceCode: 'tapse' },
  { valueCode: 'rvSPrimeCmS', referenceCode: 'rv-s-prime' },
  { valueCode: 'rvFacPercent', referenceCode: 'rv-fac' },
  { valueCode: 'raAreaCm2', referenceCode: 'ra-area' },
  { valueCode: 'rvWallMm', referenceCode: 'rv-wall' },
];

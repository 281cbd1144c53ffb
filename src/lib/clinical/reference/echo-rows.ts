import { row, type RowSpec } from './build';
import type { ReferenceRange } from './types';

const LANG_2015 = 'Lang RM et al. J Am Soc Echocardiogr 2015;28:1–39 (ASE/EACVI)';
const LANG_2005 = 'Lang RM et al. J Am Soc Echocardiogr 2005;18:1440–1463 (ASE)';
const NAGUEH_2016 = 'Nagueh SF et al. J Am Soc Echocardiogr 2016;29:277–314 (ASE/EACVI)';

// Section 9 item 1: one edition throughout, ASE/EACVI 2015 (LAVI normal ≤ 34, not 2005's ≤ 28;
// LVIDd men 4.2–5.8, not 2005's 4.2–5.9). Section 9 item 2: wall-thickness bands use the
// internally consistent partition (women severe ≥ 1.6, men ≥ 1.7; the "≥ 1.5/≥ 1.6" copy
// contradicts its own moderate band); severity partitions are SRC~ for 2015, so those rows
// carry SRC~. RWT lower normal: men 0.24 as tabulated (one summary says 0.22), SRC~.
const SEVERITY_NOTE = 'Normal range SRC+ (Lang 2015); severity partition matched in 2005 tables, said to be kept in 2015 (SRC~).';

const ase = (s: Omit<RowSpec, 'source' | 'provenance'> & Partial<Pick<RowSpec, 'provenance'>>): ReferenceRange =>
  row('ase2015', { source: LANG_2015, provenance: 'SRC+', ...s });
const wall = (s: Omit<RowSpec, 'source' | 'provenance' | 'note'>): ReferenceRange =>
  row('ase2015', { ...s, source: LANG_2015, provenance: 'SRC~', note: SEVERITY_NOTE });
const nagueh = (s: Omit<RowSpec, 'source' | 'sex'>): ReferenceRange =>
  row('ase2016', { ...s, sex: 'any', source: NAGUEH_2016 });

export const ECHO_REFERENCE_RANGES: readonly ReferenceRange[] = [
  ase({ code: 'lvef', label: 'LVEF (2D biplane)', sex: 'male', unit: '%', decimals: 0, normal: [52, 72], severity: ['low', 41, 30] }),
  ase({ code: 'lvef', label: 'LVEF (2D biplane)', sex: 'female', unit: '%', decimals: 0, normal: [54, 74], severity: ['low', 41, 30] }),
  ase({ code: 'lvidd', label: 'LVIDd', sex: 'male', unit: 'cm', decimals: 1, normal: [4.2, 5.8], severity: ['high', 6.3, 6.8] }),
  ase({ code: 'lvidd', label: 'LVIDd', sex: 'female', unit: 'cm', decimals: 1, normal: [3.8, 5.2], severity: ['high', 5.6, 6.1] }),
  ase({ code: 'lvidd-index', label: 'LVIDd/BSA', sex: 'male', unit: 'cm/m2', decimals: 1, normal: [2.2, 3.0], severity: ['high', 3.3, 3.6] }),
  ase({ code: 'lvidd-index', label: 'LVIDd/BSA', sex: 'female', unit: 'cm/m2', decimals: 1, normal: [2.3, 3.1], severity: ['high', 3.4, 3.7] }),
  ase({ code: 'lvids', label: 'LVIDs', sex: 'male', unit: 'cm', decimals: 1, normal: [2.5, 4.0], severity: ['high', 4.3, 4.5] }),
  ase({ code: 'lvids', label: 'LVIDs', sex: 'female', unit: 'cm', decimals: 1, normal: [2.2, 3.5], severity: ['high', 3.8, 4.1] }),
  wall({ code: 'ivsd', label: 'IVSd', sex: 'male', unit: 'cm', decimals: 1, normal: [0.6, 1.0], severity: ['high', 1.3, 1.6] }),
  wall({ code: 'ivsd', label: 'IVSd', sex: 'female', unit: 'cm', decimals: 1, normal: [0.6, 0.9], severity: ['high', 1.2, 1.5] }),
  wall({ code: 'pwd', label: 'PWd', sex: 'male', unit: 'cm', decimals: 1, normal: [0.6, 1.0], severity: ['high', 1.3, 1.6] }),
  wall({ code: 'pwd', label: 'PWd', sex: 'female', unit: 'cm', decimals: 1, normal: [0.6, 0.9], severity: ['high', 1.2, 1.5] }),
  wall({ code: 'lv-mass', label: 'LV mass (linear method)', sex: 'male', unit: 'g', decimals: 0, normal: [88, 224], severity: ['high', 258, 292] }),
  wall({ code: 'lv-mass', label: 'LV mass (linear method)', sex: 'female', unit: 'g', decimals: 0, normal: [67, 162], severity: ['high', 186, 210] }),
  wall({ code: 'lvmi', label: 'LV mass index (linear method)', sex: 'male', unit: 'g/m2', decimals: 0, normal: [49, 115], severity: ['high', 131, 148] }),
  wall({ code: 'lvmi', label: 'LV mass index (linear method)', sex: 'female', unit: 'g/m2', decimals: 0, normal: [43, 95], severity: ['high', 108, 121] }),
  wall({ code: 'rwt', label: 'Relative wall thickness', sex: 'male', unit: 'ratio', decimals: 2, normal: [0.24, 0.42], severity: ['high', 0.46, 0.51] }),
  wall({ code: 'rwt', label: 'Relative wall thickness', sex: 'female', unit: 'ratio', decimals: 2, normal: [0.22, 0.42], severity: ['high', 0.47, 0.52] }),
  ase({ code: 'lavi', label: 'LA volume index', sex: 'any', unit: 'mL/m2', decimals: 0, normal: [16, 34], severity: ['high', 41, 48] }),
  ase({ code: 'tapse', label: 'TAPSE', sex: 'any', unit: 'mm', decimals: 0, normal: [17, null], note: 'Section 9 item 4: 2015 limit (< 17 mm), not 2010 (< 16 mm).' }),
  ase({ code: 'rv-basal', label: 'RV basal diameter', sex: 'any', unit: 'mm', decimals: 0, normal: [25, 41] }),
  ase({ code: 'rv-mid', label: 'RV mid diameter', sex: 'any', unit: 'mm', decimals: 0, normal: [null, 35] }),
  ase({ code: 'rv-fac', label: 'RV fractional area change', sex: 'any', unit: '%', decimals: 0, normal: [35, null] }),
  ase({ code: 'rv-s-prime', label: 'RV S′', sex: 'any', unit: 'cm/s', decimals: 1, normal: [9.5, null] }),
  ase({ code: 'ra-area', label: 'RA area', sex: 'any', unit: 'cm2', decimals: 0, normal: [null, 18] }),
  ase({ code: 'rv-wall', label: 'RV free wall thickness', sex: 'any', unit: 'mm', decimals: 0, normal: [null, 5] }),
  row('ase2005', { code: 'fs', label: 'Fractional shortening', sex: 'male', unit: '%', decimals: 0, normal: [25, 43], source: LANG_2005, provenance: 'MEM', note: 'From memory (CLINICAL.md §1.4); check before release.' }),
  row('ase2005', { code: 'fs', label: 'Fractional shortening', sex: 'female', unit: '%', decimals: 0, normal: [27, 45], source: LANG_2005, provenance: 'MEM', note: 'From memory (CLINICAL.md §1.4); check before release.' }),
  nagueh({ code: 'e-over-e-prime-average', label: 'Average E/e′', unit: 'ratio', decimals: 1, normal: [null, 14], provenance: 'SRC+' }),
  nagueh({ code: 'e-over-e-prime-septal', label: 'Septal E/e′', unit: 'ratio', decimals: 1, normal: [null, 15], provenance: 'SRC~' }),
  nagueh({ code: 'e-over-e-prime-lateral', label: 'Lateral E/e′', unit: 'ratio', decimals: 1, normal: [null, 13], provenance: 'SRC~' }),
  nagueh({ code: 'septal-e-prime', label: 'Septal e′', unit: 'cm/s', decimals: 1, normal: [7, null], provenance: 'SRC+' }),
  nagueh({ code: 'lateral-e-prime', label: 'Lateral e′', unit: 'cm/s', decimals: 1, normal: [10, null], provenance: 'SRC+' }),
  nagueh({ code: 'tr-velocity', label: 'TR peak velocity', unit: 'm/s', decimals: 1, normal: [null, 2.8], provenance: 'SRC+' }),
];

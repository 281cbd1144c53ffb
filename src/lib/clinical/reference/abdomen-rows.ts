import { row } from './build';
import type { ReferenceRange } from './types';

const ULTRASCHALL_2011 = 'Reference values in abdominal ultrasound – biliopancreatic system and spleen. Ultraschall Med 2011';

// Section 9 item 9 decisions:
// - Portal vein ≤ 13 mm (CP): the sensitive limit; 15 mm stays a teaching variant.
// - Spleen ≤ 12 cm: the sourced upper normal (SRC+); > 13 cm is common practice only.
// - Liver: enlarged at ≥ 15.5 cm (Gosink & Leymaster, SRC+), i.e. normal ≤ 15.4 at 0.1 cm;
//   16 cm is a looser working threshold, and Kratzer/Patzak means (14–15 cm) make 13 cm too tight.
// Pancreatic duct: "> 2 mm" dilated (one SRC+ abstract) rather than "≥ 2 mm" (the other), so a
// 2.0 mm body duct is not flagged.
export const ABDOMEN_REFERENCE_RANGES: readonly ReferenceRange[] = [
  row('abd', {
    code: 'liver-length', label: 'Liver craniocaudal length', sex: 'any', unit: 'cm', decimals: 1, normal: [null, 15.4],
    source: 'Gosink BB, Leymaster CE. J Clin Ultrasound 1981', provenance: 'SRC+',
    note: '≥ 15.5 cm enlarged; 13.0–15.4 cm borderline is not flagged. Journal/year MEM.',
  }),
  row('abd', {
    code: 'cbd', label: 'Common bile duct', sex: 'any', unit: 'mm', decimals: 1, normal: [null, 6],
    source: 'common practice (Lal N et al. J Clin Diagn Res 2014: 95 % < 6 mm)', provenance: 'CP',
    note: 'Base limit; the engine adds the age allowance and the post-cholecystectomy limit.',
  }),
  row('abd', {
    code: 'gb-wall', label: 'Gallbladder wall (fasting)', sex: 'any', unit: 'mm', decimals: 1, normal: [null, 3],
    source: `common practice; ${ULTRASCHALL_2011}`, provenance: 'CP',
  }),
  row('abd', { code: 'spleen-length', label: 'Spleen length', sex: 'any', unit: 'cm', decimals: 1, normal: [null, 12], source: ULTRASCHALL_2011, provenance: 'SRC+' }),
  row('abd', {
    code: 'kidney-length', label: 'Kidney length', sex: 'any', unit: 'cm', decimals: 1, normal: [9, 12],
    source: 'Dirkx TC, Woodell T. Current Medical Diagnosis and Treatment 2020', provenance: 'SRC+',
  }),
  row('abd', {
    code: 'kidney-length-difference', label: 'Left–right kidney length difference', sex: 'any', unit: 'cm', decimals: 1, normal: [null, 1.5],
    source: 'Dirkx TC, Woodell T. Current Medical Diagnosis and Treatment 2020', provenance: 'SRC+',
  }),
  row('abd', {
    code: 'kidney-parenchyma', label: 'Renal parenchymal thickness', sex: 'any', unit: 'cm', decimals: 1, normal: [1.6, null],
    source: 'secondary summaries (primary not identified)', provenance: 'SRC~', note: '≤ 1.5 cm raises suspicion of chronic disease.',
  }),
  row('abd', {
    code: 'aorta-diameter', label: 'Abdominal aorta maximum diameter', sex: 'any', unit: 'cm', decimals: 1, normal: [null, 2.9],
    source: 'NHS AAA Screening Programme; ACR Appropriateness Criteria, J Am Coll Radiol 2019', provenance: 'SRC+', note: 'AAA at ≥ 3.0 cm.',
  }),
  row('abd', {
    code: 'portal-vein', label: 'Main portal vein', sex: 'any', unit: 'mm', decimals: 1, normal: [null, 13],
    source: 'common practice', provenance: 'CP', note: 'Supports portal hypertension only with other signs.',
  }),
  row('abd', {
    code: 'pancreatic-duct', label: 'Main pancreatic duct (body)', sex: 'any', unit: 'mm', decimals: 1, normal: [null, 2],
    source: 'Ultrasonic evaluation of the pancreatic duct (253 patients), abstract', provenance: 'SRC+',
  }),
];

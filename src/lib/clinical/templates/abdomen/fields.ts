import { PRECISION } from '../../rounding';
import { choice, num, YES_NO } from '../fields';
import type { DerivedDef, SectionDef } from '../types';

// Complete abdomen in the usual scan order. Organ sizes in cm, ducts, walls and vessels in mm.
// Bounds refuse a value typed in the other unit (110 for an 11 cm spleen, 0.4 for a 4 mm CBD).
const dims = (prefix: string, what: string, example: readonly [number, number, number], bounds: readonly [number, number]): SectionDef['fields'] => [
  num(`${prefix}LengthCm`, `${what} length`, 'cm', PRECISION.organCm, bounds, 'B-mode', example[0]),
  num(`${prefix}WidthCm`, `${what} width`, 'cm', PRECISION.organCm, bounds, 'B-mode', example[1]),
  num(`${prefix}DepthCm`, `${what} depth`, 'cm', PRECISION.organCm, bounds, 'B-mode', example[2]),
];

const kidney = (side: 'right' | 'left', title: string): SectionDef => ({
  id: `${side}-kidney`,
  title,
  fields: [
    num(`${side}KidneyLengthCm`, `${title} length`, 'cm', PRECISION.organCm, [3, 20], 'B-mode', side === 'right' ? 10.9 : 11.2),
    num(`${side}KidneyParenchymaCm`, `${title} parenchymal thickness`, 'cm', PRECISION.organCm, [0.3, 4], 'B-mode', 1.7),
  ],
});

export const ABDOMEN_SECTIONS: readonly SectionDef[] = [
  { id: 'liver', title: 'Liver', fields: [num('liverLengthCm', 'Liver craniocaudal length (midclavicular line)', 'cm', PRECISION.organCm, [5, 30], 'B-mode', 14)] },
  {
    id: 'gallbladder',
    title: 'Gallbladder',
    fields: [
      choice('cholecystectomy', 'Status after cholecystectomy', YES_NO),
      num('gbWallMm', 'Gallbladder wall (fasting, anterior)', 'mm', PRECISION.ductMm, [0.5, 20], 'B-mode', 2),
    ],
  },
  { id: 'bile-ducts', title: 'Bile ducts', fields: [num('cbdMm', 'Common bile duct (inner diameter)', 'mm', PRECISION.ductMm, [1, 30], 'B-mode', 4)] },
  { id: 'portal-vein', title: 'Portal vein', fields: [num('portalVeinMm', 'Main portal vein', 'mm', PRECISION.ductMm, [4, 30], 'B-mode', 11)] },
  { id: 'pancreas', title: 'Pancreas', fields: [num('pancreaticDuctMm', 'Main pancreatic duct (body)', 'mm', PRECISION.ductMm, [0.5, 20], 'B-mode', 1.5)] },
  {
    id: 'spleen',
    title: 'Spleen',
    fields: [
      num('spleenLengthCm', 'Spleen length', 'cm', PRECISION.organCm, [3, 30], 'B-mode', 11),
      num('spleenWidthCm', 'Spleen width', 'cm', PRECISION.organCm, [1, 15], 'B-mode', 7),
      num('spleenDepthCm', 'Spleen depth', 'cm', PRECISION.organCm, [1, 15], 'B-mode', 4.5),
    ],
  },
  kidney('right', 'Right kidney'),
  kidney('left', 'Left kidney'),
  {
    id: 'aorta',
    title: 'Abdominal aorta',
    fields: [
      num('aortaDiameterCm', 'Aorta maximum diameter', 'cm', PRECISION.aortaCm, [0.8, 15], 'B-mode', 2.0),
      choice('aortaConvention', 'Measurement convention', [['inner-to-inner', 'Inner to inner wall'], ['outer-to-outer', 'Outer to outer wall'], ['leading-edge', 'Leading edge to leading edge']], 'B-mode'),
    ],
  },
  {
    id: 'bladder',
    title: 'Urinary bladder',
    // Post-void max 18 cm so that a 2 cm depth typed as 20 (mm) is refused.
    fields: [...dims('bladderPre', 'Pre-void bladder', [10, 8, 7], [1, 20]), ...dims('bladderPost', 'Post-void bladder', [4, 3, 2], [0.3, 18])],
  },
];

export const ABDOMEN_DERIVED: readonly DerivedDef[] = [
  { code: 'spleenVolumeMl', label: 'Spleen volume (ellipsoid, approximate)', unit: 'mL', decimals: PRECISION.volumeMl },
  { code: 'kidneyLengthDifferenceCm', label: 'Left–right kidney length difference', unit: 'cm', decimals: PRECISION.organCm },
  { code: 'bladderVolumeMl', label: 'Bladder volume (pre-void)', unit: 'mL', decimals: PRECISION.volumeMl },
  { code: 'postVoidResidualMl', label: 'Post-void residual', unit: 'mL', decimals: PRECISION.volumeMl },
];

import { PRECISION } from '../../rounding';
import { choice, num } from '../fields';
import type { DerivedDef, NoduleSpec, SectionDef } from '../types';

// Lobe bounds refuse a 40 cm lobe and a mm value typed into a cm field (48 for 4.8);
// lobe diameters are in cm as printed in reports, the isthmus in mm.
const lobe = (side: 'right' | 'left', title: string): SectionDef => ({
  id: `${side}-lobe`,
  title,
  fields: [
    choice(`${side}LobeState`, 'Lobe', [['present', 'Present'], ['absent', 'Absent (resected or agenesis)']]),
    num(`${side}LobeLengthCm`, 'Length (craniocaudal)', 'cm', 1, [1, 10], 'B-mode', side === 'right' ? 4.8 : 4.5),
    num(`${side}LobeWidthCm`, 'Width (transverse)', 'cm', 1, [0.3, 5], 'B-mode', side === 'right' ? 1.6 : 1.5),
    num(`${side}LobeDepthCm`, 'Depth (anteroposterior)', 'cm', 1, [0.3, 5], 'B-mode', side === 'right' ? 1.5 : 1.4),
  ],
});

export const THYROID_SECTIONS: readonly SectionDef[] = [
  lobe('right', 'Right lobe'),
  lobe('left', 'Left lobe'),
  { id: 'isthmus', title: 'Isthmus', fields: [num('isthmusThicknessMm', 'Isthmus thickness (AP)', 'mm', PRECISION.ductMm, [0.5, 30], 'B-mode', 3)] },
  {
    id: 'parenchyma',
    title: 'Parenchyma',
    fields: [choice('echotexture', 'Echotexture', [['homogeneous', 'Homogeneous'], ['heterogeneous', 'Heterogeneous']], 'B-mode')],
  },
  {
    id: 'lymph-nodes',
    title: 'Cervical lymph nodes',
    fields: [choice('cervicalNodes', 'Cervical lymph nodes', [['not-assessed', 'Not assessed'], ['no-suspicious', 'No suspicious nodes'], ['suspicious', 'Suspicious nodes']], 'B-mode')],
  },
];

export const THYROID_DERIVED: readonly DerivedDef[] = [
  { code: 'rightLobeVolumeMl', label: 'Right lobe volume', unit: 'mL', decimals: PRECISION.thyroidVolumeMl },
  { code: 'leftLobeVolumeMl', label: 'Left lobe volume', unit: 'mL', decimals: PRECISION.thyroidVolumeMl },
  { code: 'thyroidVolumeMl', label: 'Total thyroid volume', unit: 'mL', decimals: PRECISION.thyroidVolumeMl },
];

/** Up to ten nodules may be entered; ACR reports at most four and biopsies at most two. */
export const THYROID_NODULES: NoduleSpec = {
  maxEntered: 10,
  maxReported: 4,
  maxBiopsied: 2,
  dimensionMinMm: 2,
  dimensionMaxMm: 80,
  decimals: PRECISION.noduleMm,
};

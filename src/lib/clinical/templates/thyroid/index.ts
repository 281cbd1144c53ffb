import { DEFAULT_PROBE } from '../../probes';
import type { TemplateDef } from '../types';
import { deriveThyroid } from './derive';
import { THYROID_DERIVED, THYROID_NODULES, THYROID_SECTIONS } from './fields';
import { thyroidFindings, thyroidUrgent } from './findings';

export const THYROID_TEMPLATE: TemplateDef = {
  id: 'thyroid',
  version: '1.1.0',
  title: 'Thyroid ultrasound',
  defaultProbe: DEFAULT_PROBE.thyroid,
  readsPrior: true,
  sections: THYROID_SECTIONS,
  derived: THYROID_DERIVED,
  referenceChecks: [
    { valueCode: 'thyroidVolumeMl', referenceCode: 'thyroid-volume' },
    { valueCode: 'isthmusThicknessMm', referenceCode: 'isthmus-thickness' },
  ],
  nodules: THYROID_NODULES,
  // Both lobes in three planes (unless absent), the isthmus and the echotexture.
  required: [
    ...(['right', 'left'] as const).flatMap((side) =>
      ['LengthCm', 'WidthCm', 'DepthCm'].map((d) => ({ code: `${side}Lobe${d}`, unless: { code: `${side}LobeState`, value: 'absent' } })),
    ),
    { code: 'isthmusThicknessMm' },
    { code: 'echotexture' },
  ],
  derive: deriveThyroid,
  findings: thyroidFindings,
  urgent: thyroidUrgent,
};

import { DEFAULT_PROBE } from '../../probes';
import type { TemplateDef } from '../types';
import { adjustCbdLimit, deriveAbdomen } from './derive';
import { ABDOMEN_DERIVED, ABDOMEN_SECTIONS } from './fields';
import { abdomenFindings, abdomenUrgent } from './findings';

export const ABDOMEN_TEMPLATE: TemplateDef = {
  id: 'abdomen',
  version: '1.1.0',
  title: 'Abdominal ultrasound (complete)',
  defaultProbe: DEFAULT_PROBE.abdomen,
  readsPrior: true,
  sections: ABDOMEN_SECTIONS,
  derived: ABDOMEN_DERIVED,
  referenceChecks: [
    { valueCode: 'liverLengthCm', referenceCode: 'liver-length' },
    { valueCode: 'gbWallMm', referenceCode: 'gb-wall' },
    { valueCode: 'cbdMm', referenceCode: 'cbd', adjust: adjustCbdLimit },
    { valueCode: 'portalVeinMm', referenceCode: 'portal-vein' },
    { valueCode: 'pancreaticDuctMm', referenceCode: 'pancreatic-duct' },
    { valueCode: 'spleenLengthCm', referenceCode: 'spleen-length' },
    { valueCode: 'rightKidneyLengthCm', referenceCode: 'kidney-length' },
    { valueCode: 'rightKidneyParenchymaCm', referenceCode: 'kidney-parenchyma' },
    { valueCode: 'leftKidneyLengthCm', referenceCode: 'kidney-length' },
    { valueCode: 'leftKidneyParenchymaCm', referenceCode: 'kidney-parenchyma' },
    { valueCode: 'kidneyLengthDifferenceCm', referenceCode: 'kidney-length-difference' },
    { valueCode: 'aortaDiameterCm', referenceCode: 'aorta-diameter' },
  ],
  nodules: null,
  // The organs of a complete abdomen; the gallbladder wall not after cholecystectomy.
  required: [
    { code: 'liverLengthCm' },
    { code: 'gbWallMm', unless: { code: 'cholecystectomy', value: 'yes' } },
    { code: 'cbdMm' },
    { code: 'portalVeinMm' },
    { code: 'pancreaticDuctMm' },
    { code: 'spleenLengthCm' },
    { code: 'rightKidneyLengthCm' },
    { code: 'leftKidneyLengthCm' },
    { code: 'aortaDiameterCm' },
  ],
  derive: deriveAbdomen,
  findings: abdomenFindings,
  urgent: abdomenUrgent,
};

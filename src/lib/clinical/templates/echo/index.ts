import { DEFAULT_PROBE } from '../../probes';
import type { TemplateDef } from '../types';
import { deriveEcho } from './derive';
import { ECHO_DERIVED, ECHO_REFERENCE_CHECKS, ECHO_SECTIONS } from './fields';
import { echoFindings, echoUrgent } from './findings';

export const ECHO_TEMPLATE: TemplateDef = {
  id: 'echo',
  version: '1.1.0',
  title: 'Transthoracic echocardiogram (adult)',
  defaultProbe: DEFAULT_PROBE.echo,
  readsPrior: false,
  sections: ECHO_SECTIONS,
  derived: ECHO_DERIVED,
  referenceChecks: ECHO_REFERENCE_CHECKS,
  nodules: null,
  // Rhythm, LV size, wall thickness and function, mitral inflow and tissue Doppler, TAPSE and
  // TR velocity (often "not measurable" when there is no jet).
  required: [
    { code: 'rhythm' },
    { code: 'ivsdCm' },
    { code: 'lviddCm' },
    { code: 'pwdCm' },
    { code: 'lvidsCm' },
    { code: 'lvefPercent' },
    { code: 'eVelocityCmS' },
    { code: 'septalEPrimeCmS' },
    { code: 'lateralEPrimeCmS' },
    { code: 'tapseMm' },
    { code: 'trVelocityMS' },
  ],
  derive: deriveEcho,
  findings: echoFindings,
  urgent: echoUrgent,
};

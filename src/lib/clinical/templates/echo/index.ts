import { DEFAULT_PROBE } from '../../probes';
import type { TemplateDef } from '../types';
import { deriveEcho } from './derive';
import { ECHO_DERIVED, ECHO_REFERENCE_CHECKS, ECHO_SECTIONS } from './fields';
import { echoFindings, echoUrgent } from './findings';

export const ECHO_TEMPLATE: TemplateDef = {
  id: 'echo',
  version: '1.0.0',
  title: 'Transthoracic echocardiogram (adult)',
  defaultProbe: DEFAULT_PROBE.echo,
  sections: ECHO_SECTIONS,
  derived: ECHO_DERIVED,
  referenceChecks: ECHO_REFERENCE_CHECKS,
  nodules: null,
  derive: deriveEcho,
  findings: echoFindings,
  urgent: echoUrgent,
};

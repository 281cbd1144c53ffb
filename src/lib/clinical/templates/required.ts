import { NOT_MEASURABLE, type Measurements } from '../types';
import type { TemplateDef } from './types';

/**
 * The codes of required measurements that are still missing, in scan order: a field counts as
 * given when it holds a number, a choice, or "not measurable"; "not done" and blank do not.
 *
 * @example missingRequired(THYROID_TEMPLATE, { rightLobeState: 'absent' }) → ['leftLobeLengthCm', …]
 */
export function missingRequired(template: TemplateDef, measurements: Measurements): string[] {
  const given = (code: string) => {
    const v = measurements[code];
    return (typeof v === 'number' && Number.isFinite(v)) || v === NOT_MEASURABLE || (typeof v === 'string' && v !== '' && v !== 'not-done');
  };
  return template.required
    .filter((rule) => !(rule.unless && measurements[rule.unless.code] === rule.unless.value))
    .filter((rule) => !given(rule.code))
    .map((rule) => rule.code);
}

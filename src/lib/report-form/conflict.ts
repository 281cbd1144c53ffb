// What differs between the sonographer's entries and the newer version someone else saved,
// so "Keep mine" or "Load theirs" is an informed choice.
import type { TemplateDef } from '../clinical';
import { entryText } from './display';
import type { StoredEntries } from './form-state';

export interface Difference {
  label: string;
  mine: string;
  theirs: string;
}

type Comparable = Pick<StoredEntries, 'measurements' | 'heightCm' | 'weightKg' | 'probeId'> & { nodules: ReadonlyArray<object> };

const orBlank = (s: string) => (s === '' ? 'blank' : s);
const num = (v: number | null, unit: string) => (v === null ? 'blank' : `${v} ${unit}`);
// Ids and key order aside, two nodules are the same when every entered value is.
const noduleText = (n: object) => JSON.stringify(Object.entries(n).filter(([k]) => k !== 'id').sort(([a], [b]) => a.localeCompare(b)));

/**
 * Differences in scan order, e.g. `[{ label: 'Right lobe: Length (craniocaudal)', mine: '5.1 cm', theirs: '4.8 cm' }]`.
 */
export function differences(template: TemplateDef, mine: Comparable, theirs: Comparable, probeLabel: (id: number | null) => string = (id) => (id === null ? 'not recorded' : `probe ${id}`)): Difference[] {
  const out: Difference[] = [];
  for (const section of template.sections) {
    for (const field of section.fields) {
      const a = entryText(field, mine.measurements[field.code]);
      const b = entryText(field, theirs.measurements[field.code]);
      if (a !== b) out.push({ label: `${section.title}: ${field.label}`, mine: orBlank(a), theirs: orBlank(b) });
    }
  }
  if (mine.heightCm !== theirs.heightCm) out.push({ label: 'Height', mine: num(mine.heightCm, 'cm'), theirs: num(theirs.heightCm, 'cm') });
  if (mine.weightKg !== theirs.weightKg) out.push({ label: 'Weight', mine: num(mine.weightKg, 'kg'), theirs: num(theirs.weightKg, 'kg') });
  if (mine.probeId !== theirs.probeId) out.push({ label: 'Probe', mine: probeLabel(mine.probeId), theirs: probeLabel(theirs.probeId) });
  const ours = mine.nodules.map(noduleText);
  const other = theirs.nodules.map(noduleText);
  if (ours.join('\n') !== other.join('\n')) {
    const count = (n: number) => `${n} nodule${n === 1 ? '' : 's'}`;
    out.push({ label: 'Nodules', mine: count(ours.length), theirs: ours.length === other.length ? `${count(other.length)}, with different values` : count(other.length) });
  }
  return out;
}

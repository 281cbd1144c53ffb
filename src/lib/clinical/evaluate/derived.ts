import type { BsaMethod } from '../formulas/bsa';
import { formatQuantity } from '../formatting';
import type { DerivedDef } from '../templates/types';
import type { DerivedValue } from './types';

export interface DerivedSink {
  add(code: string, value: number, meta?: { method?: string; bsaMethod?: BsaMethod }): DerivedValue;
  get(code: string): DerivedValue | undefined;
  list: DerivedValue[];
}

/**
 * Collects derived values against the template's catalogue, so every value carries the
 * catalogued label, unit and printing precision, e.g. `sink.add('lvmiGM2', 100.09, { bsaMethod: 'mosteller' })`.
 */
export function derivedSink(defs: readonly DerivedDef[]): DerivedSink {
  const list: DerivedValue[] = [];
  return {
    list,
    add(code, value, meta = {}) {
      const def = defs.find((d) => d.code === code);
      if (def === undefined) throw new Error(`Derived value ${code} is not in the template catalogue`);
      const item: DerivedValue = {
        code,
        label: def.label,
        value,
        unit: def.unit,
        decimals: def.decimals,
        display: formatQuantity(value, def.unit, def.decimals),
        method: meta.method ?? null,
        bsaMethod: meta.bsaMethod ?? null,
      };
      list.push(item);
      return item;
    },
    get: (code) => list.find((d) => d.code === code),
  };
}

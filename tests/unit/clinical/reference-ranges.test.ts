import { describe, expect, it } from 'vitest';
import { classifyValue, dataFingerprint, REFERENCE_RANGES, REFERENCE_SET_VERSION, roundHalfUp, selectReference, SEX_NOT_APPLIED, type ReferenceRange } from '@/lib/clinical';

// Fingerprint per reference-set version; add a line only together with a version bump.
const PINNED_FINGERPRINTS: Record<string, string> = { 'crestline-ref-1.0.0': '53de6f54' };

const rowFor = (code: string, sex: 'male' | 'female' | null, age = 50): ReferenceRange => {
  const sel = selectReference(REFERENCE_RANGES, code, sex, age);
  if (sel.kind !== 'row') throw new Error(`no row for ${code}`);
  return sel.row;
};
const grade = (code: string, sex: 'male' | 'female' | null, value: number) => {
  const r = rowFor(code, sex);
  const c = classifyValue(r, value, r.unit);
  return c.grade === null ? c.status : `${c.status}-${c.grade}`;
};

describe('REFERENCE_RANGES data', () => {
  it('is versioned, tagged and sourced on every row', () => {
    const ids = new Set<string>();
    for (const r of REFERENCE_RANGES) {
      expect(r.referenceSet).toBe(REFERENCE_SET_VERSION);
      expect(['SRC+', 'SRC~', 'CP', 'MEM']).toContain(r.provenance);
      expect(['male', 'female', 'any']).toContain(r.sex);
      expect(r.source.length).toBeGreaterThan(5);
      expect(ids.has(r.id)).toBe(false);
      ids.add(r.id);
    }
  });

  it('has monotone limits written at the row precision', () => {
    for (const r of REFERENCE_RANGES) {
      const limits = [r.normalMin, r.normalMax, r.mildLimit, r.moderateLimit].filter((x): x is number => x !== null);
      for (const x of limits) expect(roundHalfUp(x, r.decimals), `${r.id} ${x}`).toBe(x);
      if (r.normalMin !== null && r.normalMax !== null) expect(r.normalMin).toBeLessThan(r.normalMax);
      if (r.severityDirection === 'high') {
        expect(r.normalMax as number).toBeLessThan(r.mildLimit as number);
        expect(r.mildLimit as number).toBeLessThan(r.moderateLimit as number);
      }
      if (r.severityDirection === 'low') {
        expect(r.normalMin as number).toBeGreaterThan(r.mildLimit as number);
        expect(r.mildLimit as number).toBeGreaterThan(r.moderateLimit as number);
      }
    }
  });

  it('never has two rows for the same code, sex and age', () => {
    const keys = REFERENCE_RANGES.map((r) => `${r.code}|${r.sex}|${r.ageMinYears}|${r.ageMaxYears}`);
    expect(new Set(keys).size).toBe(keys.length);
  });

  it('changes only with a new reference-set version', () => {
    // Bump REFERENCE_SET_VERSION and this fingerprint together whenever a row changes.
    expect(dataFingerprint(REFERENCE_RANGES), 'reference rows changed: bump REFERENCE_SET_VERSION and pin the new fingerprint').toBe(
      PINNED_FINGERPRINTS[REFERENCE_SET_VERSION],
    );
  });

  it('records the section-9 decisions in the rows', () => {
    // Item 1: ASE 2015 LAVI normal ≤ 34 (not 2005 ≤ 28); Lang et al. JASE 2015
    expect(rowFor('lavi', null).normalMax).toBe(34);
    // Item 4: TAPSE < 17 mm (2015), not < 16 mm (2010)
    expect(rowFor('tapse', null).normalMin).toBe(17);
    // Item 2: consistent wall bands, women severe ≥ 1.6 cm, men ≥ 1.7 cm, tagged SRC~
    expect(rowFor('ivsd', 'female').moderateLimit).toBe(1.5);
    expect(rowFor('ivsd', 'male').moderateLimit).toBe(1.6);
    expect(rowFor('rwt', 'male').provenance).toBe('SRC~');
    // Item 12: FS normal ranges are from memory
    expect(rowFor('fs', 'male').provenance).toBe('MEM');
    // Item 9: portal vein 13 mm, spleen 12 cm, liver enlarged from 15.5 cm
    expect(rowFor('portal-vein', null).normalMax).toBe(13);
    expect(rowFor('spleen-length', null).normalMax).toBe(12);
    expect(rowFor('liver-length', null).normalMax).toBe(15.4);
    // Item 10: thyroid 18 mL women / 25 mL men
    expect(rowFor('thyroid-volume', 'female').normalMax).toBe(18);
    expect(rowFor('thyroid-volume', 'male').normalMax).toBe(25);
  });
});

// A step of one unit in the last published digit, e.g. 0.1 for a cm row with 1 decimal.
const step = (r: ReferenceRange): number => 10 ** -r.decimals;

describe('classifyValue at every limit of every row', () => {
  it.each(REFERENCE_RANGES.map((r) => [r.id, r] as const))('%s', (_id, r) => {
    const s = step(r);
    const at = (v: number) => classifyValue(r, v, r.unit);
    if (r.normalMax !== null) {
      expect(at(r.normalMax).status).toBe('normal');
      expect(at(r.normalMax + 0.49 * s).status).toBe('normal'); // prints as the limit
      expect(at(r.normalMax + 0.5 * s).status).toBe('high'); // prints one step above
      expect(at(r.normalMax + s)).toMatchObject({ status: 'high', grade: r.severityDirection === 'high' ? 'mild' : null });
    }
    if (r.normalMin !== null) {
      expect(at(r.normalMin).status).toBe('normal');
      expect(at(r.normalMin - 0.5 * s).status).toBe('normal'); // rounds half up to the limit
      expect(at(r.normalMin - 0.51 * s).status).toBe('low');
      expect(at(r.normalMin - s)).toMatchObject({ status: 'low', grade: r.severityDirection === 'low' ? 'mild' : null });
    }
    if (r.mildLimit !== null && r.moderateLimit !== null) {
      const out = r.severityDirection === 'high' ? 1 : -1;
      expect(at(r.mildLimit).grade).toBe('mild');
      expect(at(r.mildLimit + out * s).grade).toBe('moderate');
      expect(at(r.moderateLimit).grade).toBe('moderate');
      expect(at(r.moderateLimit + out * s).grade).toBe('severe');
    }
  });
});

describe('classifyValue against the published tables', () => {
  it('grades LVMI, LAVI, LVIDd and LVEF as Lang 2015 prints them', () => {
    // CLINICAL.md §2.1; Lang et al. JASE 2015
    expect([95, 96, 108, 109, 121, 122].map((v) => grade('lvmi', 'female', v))).toEqual(['normal', 'high-mild', 'high-mild', 'high-moderate', 'high-moderate', 'high-severe']);
    expect([115, 116, 131, 132, 148, 149].map((v) => grade('lvmi', 'male', v))).toEqual(['normal', 'high-mild', 'high-mild', 'high-moderate', 'high-moderate', 'high-severe']);
    expect([34, 35, 41, 42, 48, 49, 15].map((v) => grade('lavi', null, v))).toEqual(['normal', 'high-mild', 'high-mild', 'high-moderate', 'high-moderate', 'high-severe', 'low']);
    expect([5.8, 5.9, 6.3, 6.4, 6.8, 6.9].map((v) => grade('lvidd', 'male', v))).toEqual(['normal', 'high-mild', 'high-mild', 'high-moderate', 'high-moderate', 'high-severe']);
    expect([52, 51, 41, 40, 30, 29].map((v) => grade('lvef', 'male', v))).toEqual(['normal', 'low-mild', 'low-mild', 'low-moderate', 'low-moderate', 'low-severe']);
    expect([54, 53].map((v) => grade('lvef', 'female', v))).toEqual(['normal', 'low-mild']);
  });

  it('gives the gap value 95.4 g/m² its printed class', () => {
    // CLINICAL.md §0.2 item 3: what is 95.4 g/m²? It prints as 95 → normal; 95.5 prints as 96
    expect(grade('lvmi', 'female', 95.4)).toBe('normal');
    expect(grade('lvmi', 'female', 95.5)).toBe('high-mild');
  });

  it('flags the same numbers differently for a woman and a man (M1 vs M1-F)', () => {
    // CLINICAL.md §1.3 M1 / M1-F: LVMI 100.09 g/m² normal for a man, mildly abnormal for a woman
    expect(grade('lvmi', 'male', 100.09)).toBe('normal');
    expect(grade('lvmi', 'female', 100.09)).toBe('high-mild');
    // IVSd 1.0 cm: men 0.6–1.0 normal; women 1.0–1.2 mildly abnormal
    expect(grade('ivsd', 'male', 1.0)).toBe('normal');
    expect(grade('ivsd', 'female', 1.0)).toBe('high-mild');
  });

  it('grades right-heart limits at their printed precision', () => {
    // CLINICAL.md §2.1 right heart; Lang 2015: TAPSE < 17 mm, S′ < 9.5 cm/s, RV basal > 41 mm
    expect([17, 16].map((v) => grade('tapse', null, v))).toEqual(['normal', 'low']);
    expect([9.5, 9.4].map((v) => grade('rv-s-prime', null, v))).toEqual(['normal', 'low']);
    expect([41, 42].map((v) => grade('rv-basal', null, v))).toEqual(['normal', 'high']);
  });

  it('converts units before comparing', () => {
    // TAPSE row is in mm: 1.65 cm = 16.5 mm → prints 17 → normal; 1.64 cm → 16 → low
    const tapse = rowFor('tapse', null);
    expect(classifyValue(tapse, 1.65, 'cm').status).toBe('normal');
    expect(classifyValue(tapse, 1.64, 'cm').status).toBe('low');
  });
});

describe('selectReference', () => {
  it('does not apply a sex-specific range without a known sex', () => {
    // CLINICAL.md §0.2 item 4
    expect(selectReference(REFERENCE_RANGES, 'lvmi', null, 50)).toEqual({ kind: 'not-applied', reason: SEX_NOT_APPLIED });
    expect(selectReference(REFERENCE_RANGES, 'lavi', null, 50).kind).toBe('row');
  });

  it('applies adult ranges from 18 years only', () => {
    // CLINICAL.md §0.2 item 6: adult echo ranges do not apply to children
    expect(selectReference(REFERENCE_RANGES, 'lavi', 'male', 17).kind).toBe('no-reference');
    expect(selectReference(REFERENCE_RANGES, 'lavi', 'male', 18).kind).toBe('row');
  });

  it('prefers the own-sex row and the narrower age band', () => {
    const base = rowFor('lavi', null);
    const rows: ReferenceRange[] = [
      base,
      { ...base, id: 'x-f', sex: 'female', normalMax: 30 },
      { ...base, id: 'x-old', sex: 'female', ageMinYears: 70, ageMaxYears: null, normalMax: 40 },
    ];
    expect((selectReference(rows, 'lavi', 'female', 50) as { row: ReferenceRange }).row.id).toBe('x-f');
    expect((selectReference(rows, 'lavi', 'female', 75) as { row: ReferenceRange }).row.id).toBe('x-old');
    expect((selectReference(rows, 'lavi', 'male', 75) as { row: ReferenceRange }).row.id).toBe(base.id);
  });

  it('answers "no reference" for unknown codes', () => {
    expect(selectReference(REFERENCE_RANGES, 'nonsense', 'male', 50).kind).toBe('no-reference');
  });
});

import { describe, expect, it } from 'vitest';
import { getTemplate, type TemplateDef } from '@/lib/clinical';
import { buildEntries, draftBody, evaluateLive, parseDecimal, toFormErrorKeys } from '@/lib/report-form/entries';
import { emptyNodule, formFromStored, type FormState, type NoduleDraft } from '@/lib/report-form/form-state';
import { thyroidInputWithFourNodules } from './clinical/helpers';

const thyroid = getTemplate('thyroid') as TemplateDef;
const echo = getTemplate('echo') as TemplateDef;
const abdomen = getTemplate('abdomen') as TemplateDef;
const woman = { sex: 'female', birthDate: '1980-05-20', examDate: '2025-05-20' } as const;

const blank = (): FormState => ({ values: {}, marks: {}, sources: {}, nodules: [], heightCm: '', weightKg: '', probeId: null });
const typed = (values: Record<string, string>, extra: Partial<FormState> = {}): FormState => ({ ...blank(), values, ...extra });
const nodule = (over: Partial<NoduleDraft>): NoduleDraft => ({
  ...emptyNodule([]),
  lobe: 'right', lengthMm: '12', widthMm: '10', depthMm: '8', composition: 'solid', echogenicity: 'hypoechoic', shape: 'wider-than-tall', margin: 'smooth', foci: [],
  ...over,
});
const derived = (r: ReturnType<typeof evaluateLive>, code: string) => r.result?.derived.find((d) => d.code === code);

describe('parseDecimal', () => {
  it('reads a decimal point or a decimal comma, with spaces', () => {
    expect(parseDecimal('4.8')).toEqual({ kind: 'number', value: 4.8 });
    expect(parseDecimal(' 4,8 ')).toEqual({ kind: 'number', value: 4.8 });
    expect(parseDecimal('5.')).toEqual({ kind: 'number', value: 5 });
    expect(parseDecimal('.5')).toEqual({ kind: 'number', value: 0.5 });
  });
  it('tells blank from not a number', () => {
    expect(parseDecimal('')).toEqual({ kind: 'blank' });
    expect(parseDecimal('   ')).toEqual({ kind: 'blank' });
    for (const bad of ['4.8.1', 'abc', '4,8,1', '1e3', '4 8']) expect(parseDecimal(bad)).toEqual({ kind: 'invalid' });
  });
});

describe('buildEntries', () => {
  it('sends numbers in the field unit, choices as option values, and marks as states; blanks are left out', () => {
    const built = buildEntries(
      typed({ rightLobeLengthCm: '4,8', rightLobeWidthCm: '', echotexture: 'homogeneous' }, { marks: { isthmusThicknessMm: 'not-measurable', leftLobeDepthCm: 'not-done' } }),
      thyroid,
    );
    expect(built.measurements).toEqual({ rightLobeLengthCm: 4.8, echotexture: 'homogeneous', isthmusThicknessMm: 'not-measurable', leftLobeDepthCm: 'not-done' });
    expect(built.errors).toEqual({});
  });

  it('a mark wins over text still in the box (the text is kept for when the mark is lifted)', () => {
    const built = buildEntries(typed({ rightLobeLengthCm: '4.8' }, { marks: { rightLobeLengthCm: 'not-measurable' } }), thyroid);
    expect(built.measurements.rightLobeLengthCm).toBe('not-measurable');
  });

  it('keys a typing error like the server does', () => {
    const built = buildEntries(typed({ lviddCm: '4.8.1' }, { heightCm: '17o' }), echo);
    expect(built.errors).toHaveProperty(['measurements.lviddCm']);
    expect(built.errors).toHaveProperty(['patient.heightCm']);
    expect(built.measurements).not.toHaveProperty('lviddCm');
    expect(built.heightCm).toBeNull();
  });

  it('holds back an incomplete nodule and maps sent positions to draft keys', () => {
    const a = nodule({ id: 'N1' });
    const b = nodule({ id: 'N2', margin: '' });
    const c = nodule({ id: 'N3', zone: 'upper' });
    const built = buildEntries(typed({}, { nodules: [a, b, c] }), thyroid);
    expect(built.nodules.map((n) => n.id)).toEqual(['N1', 'N3']);
    expect(built.noduleKeys).toEqual([a.key, c.key]);
    expect(built.incompleteNodules).toEqual([b.key]);
    expect(built.nodules[0]).toMatchObject({ lobe: 'right', zone: null, lengthMm: 12, widthMm: 10, depthMm: 8, foci: [] });
    expect(built.nodules[1]!.zone).toBe('upper');
  });
});

describe('evaluateLive', () => {
  it('gives the CLINICAL.md §1.1 thyroid volumes from typed lobes (6.0 + 4.9 = 11.0 mL)', () => {
    const live = evaluateLive(
      typed({ rightLobeLengthCm: '4.8', rightLobeWidthCm: '1.6', rightLobeDepthCm: '1.5', leftLobeLengthCm: '4.5', leftLobeWidthCm: '1.5', leftLobeDepthCm: '1.4' }),
      thyroid,
      woman,
    );
    expect(derived(live, 'rightLobeVolumeMl')?.display).toBe('6.0 mL');
    expect(derived(live, 'leftLobeVolumeMl')?.display).toBe('4.9 mL');
    expect(derived(live, 'thyroidVolumeMl')?.display).toBe('11.0 mL');
    expect(live.errors).toEqual({});
  });

  it('keeps calculating the rest when one value is implausible, and names that field', () => {
    // 48 typed into a cm field (the mm value): refused, not flagged (CLINICAL.md §0.2, DESIGN.md).
    const live = evaluateLive(typed({ rightLobeLengthCm: '48', rightLobeWidthCm: '1.6', rightLobeDepthCm: '1.5', leftLobeLengthCm: '4.5', leftLobeWidthCm: '1.5', leftLobeDepthCm: '1.4' }), thyroid, woman);
    expect(live.errors['measurements.rightLobeLengthCm']).toMatch(/plausible/);
    expect(live.result).not.toBeNull();
    expect(derived(live, 'leftLobeVolumeMl')?.display).toBe('4.9 mL');
    expect(derived(live, 'rightLobeVolumeMl')).toBeUndefined();
    expect(live.entries.measurements).not.toHaveProperty('rightLobeLengthCm');
    expect(live.entries.measurements.leftLobeLengthCm).toBe(4.5);
  });

  it('re-keys a refused nodule to its place in the form, and leaves it out of the save', () => {
    const ok = nodule({ id: 'N1' });
    const incomplete = nodule({ id: 'N2', shape: '' });
    const tiny = nodule({ id: 'N3', lengthMm: '1' }); // below the 2 mm minimum
    const live = evaluateLive(typed({}, { nodules: [ok, incomplete, tiny] }), thyroid, woman);
    expect(Object.keys(live.errors)).toEqual(['nodules[2].lengthMm']);
    expect(live.entries.nodules.map((n) => n.id)).toEqual(['N1']);
    expect(live.result?.assessments.nodules?.map((a) => a.id)).toEqual(['N1']);
    expect(live.incompleteNodules).toEqual([incomplete.key]);
  });

  it('scores the §3.4 nodules as the engine does: T1 4 points TR4 follow-up, spongiform 0 points', () => {
    const stored = thyroidInputWithFourNodules();
    const form = formFromStored({ measurements: stored.measurements as Record<string, number | string>, nodules: stored.nodules as never, heightCm: null, weightKg: null, probeId: null }, thyroid);
    const live = evaluateLive(form, thyroid, { sex: 'female', birthDate: '1980-05-20', examDate: '2025-05-20' });
    const byId = new Map(live.result!.assessments.nodules!.map((a) => [a.id, a]));
    expect(byId.get('N1')).toMatchObject({ points: 4, level: 4, action: 'follow-up' });
    expect(byId.get('N3')).toMatchObject({ points: 3, level: 3, action: 'fna', biopsySelected: true });
    expect(byId.get('N4')).toMatchObject({ points: 0, level: 1 });
  });

  it('computes the spleen volume of CLINICAL.md §1.1 (12 × 7 × 4.5 cm → 198 mL)', () => {
    const live = evaluateLive(typed({ spleenLengthCm: '12', spleenWidthCm: '7', spleenDepthCm: '4.5' }), abdomen, woman);
    expect(derived(live, 'spleenVolumeMl')?.display).toBe('198 mL');
  });

  it('prompts for an AAA at the repair threshold unless the clinic switched that rule off', () => {
    // 5.6 cm in a woman is past the 5.0 cm threshold of the rule's own description (SVS/ESVS, common practice).
    const on = evaluateLive(typed({ aortaDiameterCm: '5.6' }), abdomen, woman);
    expect(on.result!.urgentPrompts.map((p) => p.ruleId)).toContain('aaa-repair-threshold');
    const off = evaluateLive(typed({ aortaDiameterCm: '5.6' }), abdomen, woman, null, ['aaa-repair-threshold']);
    expect(off.result!.urgentPrompts.map((p) => p.ruleId)).not.toContain('aaa-repair-threshold');
  });

  it('an implausible height drops BSA-indexed values only', () => {
    const live = evaluateLive(typed({ ivsdCm: '1.0', lviddCm: '5.0', pwdCm: '1.0' }, { heightCm: '1.70', weightKg: '70' }), echo, { sex: 'male', birthDate: '1970-03-01', examDate: '2025-03-01' });
    expect(live.errors['patient.heightCm']).toBeDefined();
    expect(derived(live, 'lvMassG')?.display).toBe('182 g'); // §1.3 M1
    expect(derived(live, 'lvmiGM2')).toBeUndefined();
    expect(live.entries.heightCm).toBeNull();
    expect(live.entries.weightKg).toBe(70);
  });
});

describe('evaluateLive with an error outside the entries', () => {
  it('sends every entry unchanged (the server refuses and keeps the stored draft) instead of an emptied draft', () => {
    const live = evaluateLive(typed({ spleenLengthCm: '12' }), abdomen, { sex: 'female', birthDate: 'not a date', examDate: '2025-05-20' });
    expect(live.result).toBeNull();
    expect(live.errors['patient.birthDate']).toBeDefined();
    expect(live.entries.measurements).toEqual({ spleenLengthCm: 12 });
  });
});

describe('toFormErrorKeys', () => {
  it('moves a sent nodule index to where that nodule is in the form now', () => {
    const a = nodule({ id: 'N1' });
    const b = nodule({ id: 'N2' });
    // Sent as [a, b]; since then the sonographer moved b above a.
    const now = typed({}, { nodules: [b, a] });
    expect(toFormErrorKeys({ 'nodules[1].widthMm': 'too wide', 'measurements.cbdMm': 'x', heightCm: 'y' }, [a.key, b.key], now)).toEqual({
      'nodules[0].widthMm': 'too wide',
      'measurements.cbdMm': 'x',
      'patient.heightCm': 'y',
    });
  });
  it('drops errors of a nodule removed since', () => {
    expect(toFormErrorKeys({ 'nodules[0].lengthMm': 'x' }, ['gone'], blank())).toEqual({});
  });
});

describe('draftBody', () => {
  it('is the PUT body without the version', () => {
    const live = evaluateLive(typed({ spleenLengthCm: '12' }, { heightCm: '170' }), abdomen, woman);
    expect(draftBody(live.entries, 7)).toEqual({ measurements: { spleenLengthCm: 12 }, measurementSources: {}, nodules: [], heightCm: 170, weightKg: null, probeId: 7 });
    // Provenance travels only with a value saved as a number.
    expect(draftBody(live.entries, 7, { spleenLengthCm: 'image', liverLengthCm: 'scanner' }).measurementSources).toEqual({ spleenLengthCm: 'image' });
  });
});

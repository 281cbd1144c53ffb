import { describe, expect, it } from 'vitest';
import { getTemplate, type Flag, type TemplateDef } from '@/lib/clinical';
import { differences } from '@/lib/report-form/conflict';
import { derivedMethodText, entryText, flagDetailLines, flagStatusText, modesUsed, noduleActionText } from '@/lib/report-form/display';
import { emptyNodule, formFromStored, nextNoduleId, numberText, type FormState } from '@/lib/report-form/form-state';
import { derivedPlacement, PATIENT_SECTION } from '@/lib/report-form/placement';
import { formReducer } from '@/lib/report-form/reducer';
import { fieldNames, waivedFields } from '@/lib/report-form/template-info';

const thyroid = getTemplate('thyroid') as TemplateDef;
const echo = getTemplate('echo') as TemplateDef;
const abdomen = getTemplate('abdomen') as TemplateDef;
const blank = (): FormState => ({ values: {}, marks: {}, sources: {}, nodules: [], heightCm: '', weightKg: '', probeId: null });

describe('formFromStored', () => {
  it('puts numbers back as text, states as marks, and drops codes the template does not know', () => {
    const form = formFromStored(
      { measurements: { lviddCm: 4.8, trVelocityMS: 'not-measurable', tapseMm: 'not-done', rhythm: 'sinus', retired: 3 }, nodules: [], heightCm: 170, weightKg: null, probeId: 4 },
      echo,
    );
    expect(form.values).toEqual({ lviddCm: '4.8', rhythm: 'sinus' });
    expect(formFromStored({ measurements: { ivsdCm: 1, lvefPercent: 60 }, nodules: [], heightCm: null, weightKg: null, probeId: null }, echo).values).toEqual({ ivsdCm: '1.0', lvefPercent: '60' });
    expect(form.marks).toEqual({ trVelocityMS: 'not-measurable', tapseMm: 'not-done' });
    expect(form).toMatchObject({ heightCm: '170', weightKg: '', probeId: 4 });
  });

  it('gives nodules without an id (or with a duplicate one) the next free id', () => {
    const n = { lobe: 'left', lengthMm: 10, widthMm: 8, depthMm: 6, composition: 'solid', echogenicity: 'hypoechoic', shape: 'wider-than-tall', margin: 'smooth', foci: [] };
    const form = formFromStored({ measurements: {}, nodules: [{ ...n, id: 'N2' }, n, { ...n, id: 'N2' }], heightCm: null, weightKg: null, probeId: null }, thyroid);
    expect(form.nodules.map((x) => x.id)).toEqual(['N2', 'N1', 'N3']);
    expect(form.nodules[0]).toMatchObject({ lobe: 'left', lengthMm: '10.0', zone: '' });
  });
});

describe('numberText', () => {
  it('pads to the field precision but never rounds what was typed', () => {
    expect(numberText(1, 1)).toBe('1.0');
    expect(numberText(4.85, 1)).toBe('4.85');
    expect(numberText(3, 2)).toBe('3.00');
    expect(numberText(3.5, 2)).toBe('3.50');
    expect(numberText(60, 0)).toBe('60');
    expect(numberText(null, 1)).toBe('');
  });
});

describe('formReducer', () => {
  it('returns the same state for a change that changes nothing (no save is scheduled)', () => {
    const s = { ...blank(), values: { cbdMm: '4' } };
    expect(formReducer(s, { type: 'value', code: 'cbdMm', value: '4' })).toBe(s);
    expect(formReducer(s, { type: 'mark', code: 'cbdMm', mark: null })).toBe(s);
    expect(formReducer(s, { type: 'probe', probeId: null })).toBe(s);
  });

  it('marks and unmarks a field without touching its text', () => {
    let s = formReducer({ ...blank(), values: { trVelocityMS: '2.4' } }, { type: 'mark', code: 'trVelocityMS', mark: 'not-measurable' });
    expect(s.marks).toEqual({ trVelocityMS: 'not-measurable' });
    s = formReducer(s, { type: 'mark', code: 'trVelocityMS', mark: null });
    expect(s.marks).toEqual({});
    expect(s.values.trVelocityMS).toBe('2.4');
  });

  it('adds nodules up to the limit, with fresh ids', () => {
    let s = blank();
    for (let i = 0; i < 12; i += 1) s = formReducer(s, { type: 'nodule-add', max: 10 });
    expect(s.nodules).toHaveLength(10);
    expect(s.nodules.map((n) => n.id).slice(0, 3)).toEqual(['N1', 'N2', 'N3']);
    expect(new Set(s.nodules.map((n) => n.key)).size).toBe(10);
  });

  it('moves a nodule up and down, keeping its id, and ignores moves past either end', () => {
    let s = blank();
    for (let i = 0; i < 3; i += 1) s = formReducer(s, { type: 'nodule-add', max: 10 });
    const [a, b, c] = s.nodules;
    s = formReducer(s, { type: 'nodule-move', key: c!.key, by: -1 });
    expect(s.nodules.map((n) => n.id)).toEqual(['N1', 'N3', 'N2']);
    expect(formReducer(s, { type: 'nodule-move', key: a!.key, by: -1 })).toBe(s);
    expect(formReducer(s, { type: 'nodule-move', key: b!.key, by: 1 })).toBe(s);
  });

  it('removes a nodule and restores it at its place; a reused id gives way', () => {
    let s = blank();
    for (let i = 0; i < 3; i += 1) s = formReducer(s, { type: 'nodule-add', max: 10 });
    const removed = s.nodules[1]!;
    s = formReducer(s, { type: 'nodule-remove', key: removed.key });
    expect(s.nodules.map((n) => n.id)).toEqual(['N1', 'N3']);
    const undone = formReducer(s, { type: 'nodule-restore', index: 1, nodule: removed, max: 10 });
    expect(undone.nodules.map((n) => n.id)).toEqual(['N1', 'N2', 'N3']);
    const readded = formReducer(s, { type: 'nodule-add', max: 10 }); // takes N2
    const restored = formReducer(readded, { type: 'nodule-restore', index: 1, nodule: removed, max: 10 });
    expect(restored.nodules.map((n) => n.id)).toEqual(['N1', 'N4', 'N3', 'N2']);
  });

  it('"no echogenic foci" excludes the others and the others clear it (ACR chart)', () => {
    let s = formReducer(blank(), { type: 'nodule-add', max: 10 });
    const key = s.nodules[0]!.key;
    s = formReducer(s, { type: 'nodule-focus', key, focus: 'punctate', on: true });
    s = formReducer(s, { type: 'nodule-focus', key, focus: 'macrocalcifications', on: true });
    expect(s.nodules[0]!.foci).toEqual(['macrocalcifications', 'punctate']);
    s = formReducer(s, { type: 'nodule-focus', key, focus: 'none-or-comet-tail', on: true });
    expect(s.nodules[0]!.foci).toEqual(['none-or-comet-tail']);
    s = formReducer(s, { type: 'nodule-focus', key, focus: 'peripheral-rim', on: true });
    expect(s.nodules[0]!.foci).toEqual(['peripheral-rim']);
    s = formReducer(s, { type: 'nodule-focus', key, focus: 'peripheral-rim', on: false });
    expect(s.nodules[0]!.foci).toEqual([]);
  });

  it('nextNoduleId fills the first gap', () => {
    expect(nextNoduleId([{ id: 'N1' }, { id: 'N3' }])).toBe('N2');
    expect(nextNoduleId([])).toBe('N1');
    expect(emptyNodule([{ ...emptyNodule([]), id: 'N1' }]).id).toBe('N2');
  });
});

describe('derivedPlacement', () => {
  it('puts each calculated value under the section that completes it, found by asking the engine', () => {
    expect(derivedPlacement(thyroid)).toEqual({ rightLobeVolumeMl: 'right-lobe', leftLobeVolumeMl: 'left-lobe', thyroidVolumeMl: 'left-lobe' });
    const e = derivedPlacement(echo);
    expect(e).toMatchObject({ bsaM2: PATIENT_SECTION, lvmiGM2: 'plax', rwt: 'plax', laviMlM2: 'left-atrium', eOverEPrimeAverage: 'mitral', eOverEPrimeSeptal: 'mitral', rvspMmHg: 'subcostal' });
    expect(Object.keys(e).sort()).toEqual(echo.derived.map((d) => d.code).sort());
    expect(derivedPlacement(abdomen)).toMatchObject({ spleenVolumeMl: 'spleen', kidneyLengthDifferenceCm: 'left-kidney', postVoidResidualMl: 'bladder' });
  });
});

const flag = (over: Partial<Flag>): Flag => ({
  valueCode: 'lvmiGM2', referenceCode: 'lvmi', label: 'LV mass index', value: 100.09, unit: 'g/m2', display: '100 g/m²', status: 'high', grade: 'mild',
  range: { min: 43, max: 95, unit: 'g/m2', sex: 'female', text: '43–95 g/m²' }, referenceId: 'x', source: 'Lang RM et al. JASE 2015', provenance: 'SRC+',
  referenceSetVersion: 'crestline-ref-1.0.0', message: 'LV mass index 100 g/m²: mildly abnormal (high)', note: null, adjustment: null, ...over,
});

describe('display wording', () => {
  it('says the direction and the ASE grade in words, not only in colour', () => {
    expect(flagStatusText(flag({}))).toBe('High, mildly abnormal');
    expect(flagStatusText(flag({ status: 'low', grade: null }))).toBe('Low');
    expect(flagStatusText(flag({ status: 'normal', grade: null }))).toBe('Normal');
    expect(flagStatusText(flag({ status: 'not-applied', grade: null, range: null }))).toBe('Sex-specific reference not applied');
    expect(flagStatusText(flag({ status: 'no-reference', message: 'X 1 cm: no reference range for age 12 y' }))).toBe('No reference range for age 12 y');
  });

  it('lists range, source with provenance and reference-set version', () => {
    expect(flagDetailLines(flag({}))).toEqual(['Reference 43–95 g/m² (women)', 'Source: Lang RM et al. JASE 2015 [SRC+]', 'Reference set crestline-ref-1.0.0']);
    const unknownSex = flag({ status: 'not-applied', grade: null, range: null, source: null, provenance: null, referenceSetVersion: null, message: 'LV mass index 100 g/m²: sex-specific reference not applied' });
    expect(flagDetailLines(unknownSex)).toEqual(['LV mass index 100 g/m²: sex-specific reference not applied']);
  });

  it('prints entries at the field precision, states in words, choices by label', () => {
    const field = (code: string) => [...thyroid.sections, ...echo.sections].flatMap((s) => s.fields).find((f) => f.code === code)!;
    expect(entryText(field('rightLobeLengthCm'), 4.8)).toBe('4.8 cm');
    expect(entryText(field('isthmusThicknessMm'), 3)).toBe('3.0 mm');
    expect(entryText(field('trVelocityMS'), 'not-measurable')).toBe('not measurable');
    expect(entryText(field('echotexture'), 'homogeneous')).toBe('Homogeneous');
  });

  it('names the BSA formula of an indexed value once', () => {
    expect(derivedMethodText({ method: 'ASE linear method', bsaMethod: 'mosteller' })).toBe('ASE linear method; BSA Mosteller');
    expect(derivedMethodText({ method: 'Mosteller', bsaMethod: 'mosteller' })).toBe('Mosteller');
    expect(derivedMethodText({ method: null, bsaMethod: null })).toBe('');
  });

  it('names the imaging modes of the recorded values only', () => {
    expect(modesUsed(echo, { lviddCm: 5, tapseMm: 22, trVelocityMS: 'not-measurable', rhythm: 'sinus' })).toEqual(['B-mode', 'M-mode']);
  });

  it('words the size rule of a nodule', () => {
    // TR4 size rule (CLINICAL.md §3.2): FNA ≥ 1.5 cm, follow-up ≥ 1.0 cm at 1, 2, 3 and 5 years
    const rec = { action: 'follow-up', followUpYears: [1, 2, 3, 5], fnaThresholdCm: 1.5, followUpThresholdCm: 1.0 } as const;
    expect(noduleActionText({ action: 'follow-up', recommendation: rec })).toBe('Follow-up at 1, 2, 3 and 5 years');
    expect(noduleActionText({ action: 'fna', recommendation: { ...rec, action: 'fna', followUpYears: [] } })).toBe('FNA (size ≥ 1.5 cm)');
    expect(noduleActionText({ action: 'fna-not-selected', recommendation: { ...rec, action: 'fna' } })).toMatch(/^Meets FNA size, not among the nodules selected for FNA: follow-up at 1, 2, 3 and 5 years/);
    expect(noduleActionText({ action: 'none', recommendation: { action: 'none', followUpYears: [], fnaThresholdCm: null, followUpThresholdCm: null } })).toBe('No FNA or follow-up');
  });
});

describe('differences', () => {
  it('lists what differs between my entries and theirs, in scan order', () => {
    const mine = { measurements: { rightLobeLengthCm: 5.1, echotexture: 'homogeneous' }, nodules: [], heightCm: null, weightKg: null, probeId: null };
    const theirs = { measurements: { rightLobeLengthCm: 4.8, isthmusThicknessMm: 3, echotexture: 'homogeneous' }, nodules: [{ lobe: 'left' }], heightCm: 170, weightKg: null, probeId: null };
    expect(differences(thyroid, mine, theirs)).toEqual([
      { label: 'Right lobe: Length (craniocaudal)', mine: '5.1 cm', theirs: '4.8 cm' },
      { label: 'Isthmus: Isthmus thickness (AP)', mine: 'blank', theirs: '3.0 mm' },
      { label: 'Height', mine: 'blank', theirs: '170 cm' },
      { label: 'Nodules', mine: '0 nodules', theirs: '1 nodule' },
    ]);
  });
});

describe('template facts', () => {
  it('waives the lobe diameters of an absent lobe and the gallbladder wall after cholecystectomy, saying why', () => {
    expect(waivedFields(thyroid, { rightLobeState: 'absent' })).toEqual({
      rightLobeLengthCm: 'Lobe: Absent (resected or agenesis)',
      rightLobeWidthCm: 'Lobe: Absent (resected or agenesis)',
      rightLobeDepthCm: 'Lobe: Absent (resected or agenesis)',
    });
    expect(waivedFields(thyroid, { rightLobeState: 'present' })).toEqual({});
    expect(waivedFields(abdomen, { cholecystectomy: 'yes' })).toEqual({ gbWallMm: 'Status after cholecystectomy: Yes' });
  });

  it('names a field by its label, adding the section only where the label repeats', () => {
    const names = fieldNames(thyroid);
    expect(names.get('rightLobeLengthCm')).toBe('Right lobe: length (craniocaudal)');
    expect(names.get('leftLobeLengthCm')).toBe('Left lobe: length (craniocaudal)');
    expect(names.get('isthmusThicknessMm')).toBe('Isthmus thickness (AP)');
    expect(fieldNames(echo).get('lviddCm')).toBe('LVIDd');
  });
});

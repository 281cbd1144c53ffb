// Every change the form can make, as one pure reducer, so the island stays a thin shell and
// the rules (exclusive "no foci", nodule limit, reorder) are unit-tested.
import { ECHOGENIC_FOCI } from '../clinical';
import type { MeasurementSource } from '../schemas/reports';
import { emptyNodule, nextNoduleId, type EntryMark, type FormState, type NoduleDraft, type NoduleTextField } from './form-state';

export type FormAction =
  | { type: 'value'; code: string; value: string }
  /** A value no person typed: accepted from the scanner, or measured with the calipers. */
  | { type: 'external'; code: string; value: string; source: MeasurementSource }
  | { type: 'mark'; code: string; mark: EntryMark | null }
  | { type: 'patient'; field: 'heightCm' | 'weightKg'; value: string }
  | { type: 'probe'; probeId: number | null }
  | { type: 'nodule-add'; max: number }
  | { type: 'nodule-remove'; key: string }
  | { type: 'nodule-restore'; index: number; nodule: NoduleDraft; max: number }
  | { type: 'nodule-move'; key: string; by: -1 | 1 }
  | { type: 'nodule-field'; key: string; field: NoduleTextField; value: string }
  | { type: 'nodule-focus'; key: string; focus: string; on: boolean }
  | { type: 'replace'; state: FormState };

/** "None" cannot be combined with other echogenic foci (ACR chart); choosing one clears the other side. */
export const NO_FOCI = 'none-or-comet-tail' satisfies keyof typeof ECHOGENIC_FOCI;

function toggleFocus(foci: readonly string[], focus: string, on: boolean): string[] {
  if (!on) return foci.filter((f) => f !== focus);
  if (focus === NO_FOCI) return [NO_FOCI];
  const order = Object.keys(ECHOGENIC_FOCI);
  return order.filter((f) => f !== NO_FOCI && (f === focus || foci.includes(f)));
}

/** The sources without `code`: a person typed over it, or marked it. */
function withoutSource(sources: FormState['sources'], code: string): FormState['sources'] {
  if (!(code in sources)) return sources;
  const next = { ...sources };
  delete next[code];
  return next;
}

function updateNodule(state: FormState, key: string, change: (n: NoduleDraft) => NoduleDraft): FormState {
  return { ...state, nodules: state.nodules.map((n) => (n.key === key ? change(n) : n)) };
}

/** The form after one action; unchanged input returns the same object (no save is scheduled). */
export function formReducer(state: FormState, action: FormAction): FormState {
  switch (action.type) {
    case 'value':
      return (state.values[action.code] ?? '') === action.value
        ? state
        : { ...state, values: { ...state.values, [action.code]: action.value }, sources: withoutSource(state.sources, action.code) };
    case 'external': {
      const marks = { ...state.marks };
      delete marks[action.code];
      return { ...state, values: { ...state.values, [action.code]: action.value }, marks, sources: { ...state.sources, [action.code]: action.source } };
    }
    case 'mark': {
      if ((state.marks[action.code] ?? null) === action.mark) return state;
      const marks = { ...state.marks };
      if (action.mark === null) delete marks[action.code];
      else marks[action.code] = action.mark;
      return { ...state, marks, sources: withoutSource(state.sources, action.code) };
    }
    case 'patient':
      return state[action.field] === action.value ? state : { ...state, [action.field]: action.value };
    case 'probe':
      return state.probeId === action.probeId ? state : { ...state, probeId: action.probeId };
    case 'nodule-add':
      return state.nodules.length >= action.max ? state : { ...state, nodules: [...state.nodules, emptyNodule(state.nodules)] };
    case 'nodule-remove':
      return { ...state, nodules: state.nodules.filter((n) => n.key !== action.key) };
    case 'nodule-restore': {
      if (state.nodules.length >= action.max || state.nodules.some((n) => n.key === action.nodule.key)) return state;
      const nodules = [...state.nodules];
      // Its id may have been reused by a nodule added since; then it takes the next free one.
      const id = nodules.some((n) => n.id === action.nodule.id) ? nextNoduleId(nodules) : action.nodule.id;
      nodules.splice(Math.min(action.index, nodules.length), 0, { ...action.nodule, id });
      return { ...state, nodules };
    }
    case 'nodule-move': {
      const i = state.nodules.findIndex((n) => n.key === action.key);
      const j = i + action.by;
      if (i < 0 || j < 0 || j >= state.nodules.length) return state;
      const nodules = [...state.nodules];
      [nodules[i], nodules[j]] = [nodules[j] as NoduleDraft, nodules[i] as NoduleDraft];
      return { ...state, nodules };
    }
    case 'nodule-field': {
      const current = state.nodules.find((n) => n.key === action.key);
      if (current === undefined || current[action.field] === action.value) return state;
      return updateNodule(state, action.key, (n) => ({ ...n, [action.field]: action.value }));
    }
    case 'nodule-focus':
      return updateNodule(state, action.key, (n) => ({ ...n, foci: toggleFocus(n.foci, action.focus, action.on) }));
    case 'replace':
      return action.state;
  }
}

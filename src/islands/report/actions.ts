import type { EntryMark, NoduleTextField } from '../../lib/report-form/form-state';

/** The form's change handlers; one stable object, so memoised sections skip re-rendering. */
export interface FieldActions {
  value(code: string, value: string): void;
  mark(code: string, mark: EntryMark | null): void;
  patient(field: 'heightCm' | 'weightKg', value: string): void;
  probe(probeId: number | null): void;
  addNodule(): void;
  removeNodule(key: string): void;
  restoreNodule(index: number, nodule: import('../../lib/report-form/form-state').NoduleDraft): void;
  moveNodule(key: string, by: -1 | 1): void;
  noduleField(key: string, field: NoduleTextField, value: string): void;
  noduleFocus(key: string, focus: string, on: boolean): void;
}

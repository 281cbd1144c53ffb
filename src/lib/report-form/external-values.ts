import type { MeasurementSource } from '../schemas/reports';

/**
 * Values that reach the structured form from elsewhere on the report page: a length measured
 * with the calipers in the image viewer (another island), put into a field the sonographer chose.
 * The islands are separate React roots, so they talk through two window events: the viewer asks
 * with `crestline:put-value`, the form answers with `crestline:value-taken`.
 */
export const PUT_VALUE_EVENT = 'crestline:put-value';
export const VALUE_TAKEN_EVENT = 'crestline:value-taken';

export interface PutValueDetail {
  /** Template field code, e.g. 'lviddCm'. */
  code: string;
  /** In the field's unit. */
  value: number;
  source: MeasurementSource;
}

export interface ValueTakenDetail {
  code: string;
  ok: boolean;
  /** What the form did, for the viewer to show, e.g. "LV internal diameter (diastole) set to 4.8 cm." */
  message: string;
}

export function putValue(detail: PutValueDetail): void {
  window.dispatchEvent(new CustomEvent<PutValueDetail>(PUT_VALUE_EVENT, { detail }));
}

export function answerValue(detail: ValueTakenDetail): void {
  window.dispatchEvent(new CustomEvent<ValueTakenDetail>(VALUE_TAKEN_EVENT, { detail }));
}

/** Subscribes to one of the two events; returns the unsubscribe function (for a useEffect). */
export function listen<T>(name: typeof PUT_VALUE_EVENT | typeof VALUE_TAKEN_EVENT, handler: (detail: T) => void): () => void {
  const listener = (e: Event) => handler((e as CustomEvent<T>).detail);
  window.addEventListener(name, listener);
  return () => window.removeEventListener(name, listener);
}

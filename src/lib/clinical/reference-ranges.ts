import { ABDOMEN_REFERENCE_RANGES } from './reference/abdomen-rows';
import { ECHO_REFERENCE_RANGES } from './reference/echo-rows';
import { THYROID_REFERENCE_RANGES } from './reference/thyroid-rows';
import type { ReferenceRange } from './reference/types';

export type { ReferenceRange } from './reference/types';
export { REFERENCE_SET_VERSION } from './reference/build';

/** The built-in reference set as plain rows, ready to seed into `reference_ranges`. */
export const REFERENCE_RANGES: readonly ReferenceRange[] = [
  ...ECHO_REFERENCE_RANGES,
  ...ABDOMEN_REFERENCE_RANGES,
  ...THYROID_REFERENCE_RANGES,
];

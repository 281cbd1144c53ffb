import { row } from './build';
import type { ReferenceRange } from './types';

// Section 9 item 10: goitre limits 18 mL women / 25 mL men (Gutekunst 1988 as cited, SRC~)
// rather than the sex-neutral 19.1 mL: thyroid volume differs by sex (Langer 1989), and these
// are the limits clinicians use to call a goitre. No lower limit is flagged.
const GUTEKUNST = 'Gutekunst R et al. 1988 (as cited by secondary texts)';

export const THYROID_REFERENCE_RANGES: readonly ReferenceRange[] = [
  row('thy', { code: 'thyroid-volume', label: 'Total thyroid volume', sex: 'female', unit: 'mL', decimals: 1, normal: [null, 18], source: GUTEKUNST, provenance: 'SRC~' }),
  row('thy', { code: 'thyroid-volume', label: 'Total thyroid volume', sex: 'male', unit: 'mL', decimals: 1, normal: [null, 25], source: GUTEKUNST, provenance: 'SRC~' }),
  row('thy', {
    code: 'isthmus-thickness', label: 'Isthmus thickness', sex: 'any', unit: 'mm', decimals: 1, normal: [null, 5],
    source: 'Radiopaedia "Goiter" (secondary)', provenance: 'SRC~',
  }),
];

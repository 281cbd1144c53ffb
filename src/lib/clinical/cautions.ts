/** Shown with every evaluation and on every report screen (CLINICAL.md §6.1, common practice). */
export const CAUTIONS =
  'Calculated values, category flags and TI-RADS suggestions are decision support only. ' +
  'Interpretation and recommendations belong to the licensed physician, ' +
  'and local protocols prevail over the defaults of this software.';

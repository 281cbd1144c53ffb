/** The caution every screen and report carries (DESIGN.md; CLINICAL.md §6). */
export const CAUTION_TEXT =
  'Calculated values and flags are decision support only. Interpretation belongs to the licensed physician, and local protocols prevail.';

import { z } from 'zod';

/** The sonographer's answer to one value offered from a scanner's structured report. */
export const scannerValueDecisionSchema = z.object({ decision: z.enum(['accept', 'reject'], { message: 'Choose accept or reject.' }) });
export type ScannerValueDecision = z.infer<typeof scannerValueDecisionSchema>;

/** One offered value, ready to show beside the form. */
export interface ScannerValueDto {
  id: number;
  fieldCode: string;
  /** The template field's label and unit, e.g. "LV internal diameter, diastole", "cm". */
  label: string;
  unit: string;
  /** In the field's unit, as it would be entered, e.g. 4.8. */
  value: number;
  /** The same with its unit, e.g. "4.8 cm". */
  valueText: string;
  /** What the scanner sent, e.g. "48 mm, Left Ventricle Internal End Diastolic Dimension (LN 29436-3)". */
  sentAs: string;
  state: 'offered' | 'accepted' | 'rejected';
  receivedLabel: string;
}

import { evaluate, type EvaluationSuccess } from '../../lib/clinical';
import type { EvaluateRequest } from '../../lib/schemas/clinical';
import { HttpError } from '../http/errors';
import { referenceSet } from './reference-ranges';

/**
 * Runs the clinical engine on the server with the stored reference set, exactly as the
 * browser runs it; values outside plausible bounds come back as 400 with field errors.
 */
export async function evaluateMeasurements(input: EvaluateRequest): Promise<EvaluationSuccess> {
  const referenceRanges = await referenceSet();
  const result = evaluate({ ...input, referenceRanges } as Parameters<typeof evaluate>[0]);
  if (!result.ok) {
    throw new HttpError(400, 'VALIDATION', 'Some values are outside what is plausible; check the units.', result.fieldErrors);
  }
  return result;
}

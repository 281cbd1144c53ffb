import { ensureBuiltInReferenceSet } from '../src/server/services/reference-ranges';

/**
 * Clinical reference data, not demo data: run on every start (and in production), it stores
 * the built-in reference set once per version and never rewrites a stored set.
 */
export async function seedReferenceRanges(): Promise<string> {
  const { version, inserted } = await ensureBuiltInReferenceSet();
  return inserted ? `stored reference set ${version} (${inserted} rows)` : `reference set ${version} already stored`;
}

import { REFERENCE_RANGES, REFERENCE_SET_VERSION, type ReferenceRange, type Unit } from '../../lib/clinical';
import { col, fn, literal } from 'sequelize';
import { ReferenceRangeRow } from '../../db/models';
import { HttpError } from '../http/errors';

/** The engine's row as a table row. */
export function toStoredRow(r: ReferenceRange) {
  return {
    referenceSet: r.referenceSet,
    rowKey: r.id,
    code: r.code,
    label: r.label,
    sex: r.sex,
    ageMinYears: r.ageMinYears,
    ageMaxYears: r.ageMaxYears,
    unit: r.unit,
    decimals: r.decimals,
    normalMin: r.normalMin,
    normalMax: r.normalMax,
    severityDirection: r.severityDirection,
    mildLimit: r.mildLimit,
    moderateLimit: r.moderateLimit,
    source: r.source,
    provenance: r.provenance,
    note: r.note,
  };
}

/** A table row as the engine's plain data. */
export function fromStoredRow(row: ReferenceRangeRow): ReferenceRange {
  return {
    id: row.rowKey,
    code: row.code,
    label: row.label,
    sex: row.sex,
    ageMinYears: row.ageMinYears,
    ageMaxYears: row.ageMaxYears,
    unit: row.unit as Unit,
    decimals: row.decimals,
    normalMin: row.normalMin,
    normalMax: row.normalMax,
    severityDirection: row.severityDirection,
    mildLimit: row.mildLimit,
    moderateLimit: row.moderateLimit,
    source: row.source,
    provenance: row.provenance,
    referenceSet: row.referenceSet,
    note: row.note,
  };
}

/**
 * Stores the built-in reference set when its version is not in the table yet. Existing sets
 * are never touched: reports signed against them must keep reading the same limits.
 */
export async function ensureBuiltInReferenceSet(): Promise<{ version: string; inserted: number }> {
  const present = await ReferenceRangeRow.count({ where: { referenceSet: REFERENCE_SET_VERSION } });
  if (present > 0) return { version: REFERENCE_SET_VERSION, inserted: 0 };
  await ReferenceRangeRow.bulkCreate(REFERENCE_RANGES.map(toStoredRow));
  return { version: REFERENCE_SET_VERSION, inserted: REFERENCE_RANGES.length };
}

// Sets never change once stored, so a loaded set can be kept for the life of the process.
const cache = new Map<string, readonly ReferenceRange[]>();

/** The rows of one reference set (default: the current built-in version), from the database. */
export async function referenceSet(version = REFERENCE_SET_VERSION): Promise<readonly ReferenceRange[]> {
  const hit = cache.get(version);
  if (hit) return hit;
  const rows = await ReferenceRangeRow.findAll({ where: { referenceSet: version }, order: [['id', 'ASC']] });
  if (rows.length === 0) {
    throw new HttpError(503, 'DEPENDENCY_DOWN', `Reference set ${version} is not loaded. Run "npm run db:reference" or restart npm start, then try again.`);
  }
  const set = rows.map(fromStoredRow);
  cache.set(version, set);
  return set;
}

export interface ReferenceSetSummary {
  version: string;
  rows: number;
}

/** Every stored set, newest first by insertion. */
export async function referenceSets(): Promise<ReferenceSetSummary[]> {
  const rows = (await ReferenceRangeRow.findAll({
    attributes: ['referenceSet', [fn('COUNT', col('id')), 'n'], [fn('MAX', col('id')), 'last']],
    group: ['referenceSet'],
    order: [[literal('last'), 'DESC']],
    raw: true,
  })) as unknown as Array<{ referenceSet: string; n: number | string }>;
  return rows.map((r) => ({ version: r.referenceSet, rows: Number(r.n) }));
}

/** Rows of a set for the reference page, optionally narrowed by code or label text. */
export async function listReferenceRows(version: string, search?: string): Promise<ReferenceRange[]> {
  const rows = (await referenceSet(version)).filter((r) =>
    search ? `${r.code} ${r.label}`.toLowerCase().includes(search.toLowerCase()) : true,
  );
  return [...rows];
}

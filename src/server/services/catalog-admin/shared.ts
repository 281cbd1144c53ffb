import { QueryTypes, type Model, type ModelStatic, type Transaction } from 'sequelize';
import { db } from '../../../db/connection';
import type { SessionUser } from '../../../lib/session-user';
import { HttpError, notFound, stale } from '../../http/errors';
import { audit } from '../audit';

/** What the catalog's use-cases share: version locks, audited changes, counts of exams. */

export type Ctx = { actor: SessionUser; requestId: string };
export type Entity = 'exam-type' | 'room' | 'scanner' | 'probe';
export const NAMES: Record<Entity, string> = { 'exam-type': 'exam type', room: 'room', scanner: 'scanner', probe: 'probe' };
export const PRICES = new Set(['selfPayPriceCents', 'depositCents']);

export const clash = (message: string, field: string, fieldMessage: string) => new HttpError(409, 'CONFLICT', message, { [field]: fieldMessage });
export const badInput = (field: string, message: string) => new HttpError(400, 'VALIDATION', 'Some values need correcting.', { [field]: message });

/** Equal as stored: single-precision FLOAT columns (probe MHz) read back slightly off what was written. */
export const same = (a: unknown, b: unknown) => a === b || (a == null && b == null) || (typeof a === 'number' && typeof b === 'number' && Math.abs(a - b) < 1e-4);

/** Loads a row for an edit, locked, refusing a version other than the one the manager opened. */
export async function lockVersioned<M extends Model & { version: number }>(model: ModelStatic<M>, entity: Entity, id: number, version: number, transaction: Transaction): Promise<M> {
  const row = await model.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!row) throw notFound(`The ${NAMES[entity]}`);
  if (row.version !== version) throw stale(NAMES[entity]);
  return row;
}

/**
 * Writes the changed fields with the next version and audits their names (prices with their old
 * and new cents). Returns the names; an edit that changes nothing writes and audits nothing.
 */
export async function saveChanges<M extends Model & { version: number }>(row: M, entity: Entity, next: Record<string, unknown>, ctx: Ctx, transaction: Transaction): Promise<string[]> {
  const current = row.get() as Record<string, unknown>;
  const changed = Object.keys(next).filter((k) => !same(current[k], next[k]));
  if (changed.length === 0) return changed;
  const detail: Record<string, unknown> = { changed };
  for (const k of changed) if (PRICES.has(k)) detail[k] = { from: current[k], to: next[k] };
  await row.update({ ...Object.fromEntries(changed.map((k) => [k, next[k]])), version: row.version + 1 } as Partial<M>, { transaction });
  await audit({ actorUserId: ctx.actor.id, action: `catalog.${entity}.update`, entityType: entity, entityId: row.get('id') as number, detail, requestId: ctx.requestId }, transaction);
  return changed;
}

export async function audited(entity: Entity, verb: 'create' | 'deactivate' | 'reactivate', id: number, detail: Record<string, unknown>, ctx: Ctx, transaction: Transaction): Promise<void> {
  await audit({ actorUserId: ctx.actor.id, action: `catalog.${entity}.${verb}`, entityType: entity, entityId: id, detail, requestId: ctx.requestId }, transaction);
}

export async function countBy(sql: string, replacements: unknown[], transaction?: Transaction): Promise<Map<number, number>> {
  const rows = await db().query<{ id: number; n: number }>(sql, { replacements, type: QueryTypes.SELECT, transaction });
  return new Map(rows.map((r) => [Number(r.id), Number(r.n)]));
}

export const examCounts = (transaction?: Transaction, id?: number) =>
  countBy(`SELECT exam_type_id AS id, COUNT(*) AS n FROM exams ${id ? 'WHERE exam_type_id = ?' : ''} GROUP BY exam_type_id`, id ? [id] : [], transaction);

/** Booked or arrived exams that have not ended yet, per scanner. */
export const upcomingByScanner = (transaction?: Transaction, id?: number) =>
  countBy(
    `SELECT scanner_id AS id, COUNT(*) AS n FROM exams WHERE status IN ('booked', 'arrived') AND scheduled_end >= ? ${id ? 'AND scanner_id = ?' : ''} GROUP BY scanner_id`,
    id ? [new Date(), id] : [new Date()],
    transaction,
  );


import { Op, QueryTypes, type WhereOptions } from 'sequelize';
import { db } from '../../db/connection';
import { AuditEvent, User } from '../../db/models';

export interface AuditRow {
  id: number;
  at: string;
  actor: string | null;
  action: string;
  entity: string;
  detail: string;
}

export interface AuditFilter {
  page: number;
  pageSize: number;
  /** An action prefix: 'auth', 'user', 'patient', 'exam', 'report', 'payment' … */
  action?: string;
  actorId?: number;
  from?: Date;
  /** Exclusive. */
  to?: Date;
  /** Only events about this patient: their record, their exams and their exams' reports. */
  mrn?: string;
}

/** The records an audit event may name for one patient, by MRN; null when no patient has it. */
async function patientEntities(mrn: string): Promise<Array<{ type: string; ids: string[] }> | null> {
  const rows = await db().query<{ patient_id: number; exam_id: number | null; report_id: number | null }>(
    `SELECT p.id AS patient_id, e.id AS exam_id, r.id AS report_id
       FROM patients p LEFT JOIN exams e ON e.patient_id = p.id LEFT JOIN reports r ON r.exam_id = e.id
      WHERE p.mrn = ?`,
    { replacements: [mrn], type: QueryTypes.SELECT },
  );
  if (rows.length === 0) return null;
  const ids = (pick: (r: (typeof rows)[number]) => number | null) => [...new Set(rows.map(pick).filter((v): v is number => v !== null))].map(String);
  return [
    { type: 'patient', ids: ids((r) => r.patient_id) },
    { type: 'exam', ids: ids((r) => r.exam_id) },
    { type: 'report', ids: ids((r) => r.report_id) },
  ].filter((g) => g.ids.length > 0);
}

/**
 * One page of the audit trail, newest first, narrowed by who, what (an action prefix), when and
 * which patient. Returns `patientFound: false` when an MRN matches nobody.
 */
export async function listAuditEvents(opts: AuditFilter): Promise<{ rows: AuditRow[]; total: number; patientFound: boolean }> {
  const and: WhereOptions<AuditEvent>[] = [];
  if (opts.action) and.push({ action: { [Op.startsWith]: opts.action } });
  if (opts.actorId) and.push({ actorUserId: opts.actorId });
  if (opts.from) and.push({ at: { [Op.gte]: opts.from } });
  if (opts.to) and.push({ at: { [Op.lt]: opts.to } });
  if (opts.mrn) {
    const groups = await patientEntities(opts.mrn);
    if (!groups) return { rows: [], total: 0, patientFound: false };
    and.push({ [Op.or]: groups.map((g) => ({ entityType: g.type, entityId: g.ids })) });
  }
  const { rows, count } = await AuditEvent.findAndCountAll({
    where: and.length ? { [Op.and]: and } : {},
    order: [['id', 'DESC']],
    limit: opts.pageSize,
    offset: (opts.page - 1) * opts.pageSize,
  });
  const actorIds = [...new Set(rows.map((r) => r.actorUserId).filter((id): id is number => id != null))];
  const actors = new Map(
    (await User.findAll({ where: { id: actorIds }, attributes: ['id', 'displayName'] })).map((u) => [u.id, u.displayName]),
  );
  return {
    total: count,
    patientFound: true,
    rows: rows.map((r) => ({
      id: r.id,
      at: r.at.toISOString(),
      actor: r.actorUserId != null ? (actors.get(r.actorUserId) ?? `user ${r.actorUserId}`) : null,
      action: r.action,
      entity: r.entityId ? `${r.entityType} ${r.entityId}` : r.entityType,
      detail: r.detail ? JSON.stringify(r.detail) : '',
    })),
  };
}

import { Op, type WhereOptions } from 'sequelize';
import { AuditEvent, User } from '../../db/models';

export interface AuditRow {
  id: number;
  at: string;
  actor: string | null;
  action: string;
  entity: string;
  detail: string;
}

/** One page of the audit trail, newest first, optionally narrowed to an action prefix. */
export async function listAuditEvents(opts: { page: number; pageSize: number; action?: string }): Promise<{ rows: AuditRow[]; total: number }> {
  const where: WhereOptions<AuditEvent> = opts.action ? { action: { [Op.startsWith]: opts.action } } : {};
  const { rows, count } = await AuditEvent.findAndCountAll({
    where,
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

import type { Transaction } from 'sequelize';
import { AuditEvent } from '../../db/models';

export interface AuditEntry {
  actorUserId: number | null;
  action: string;
  entityType: string;
  entityId?: string | number | null;
  /** Identifiers and changed values only: never names, birth dates or report text. */
  detail?: Record<string, unknown> | null;
  requestId?: string | null;
}

/** Appends one audit event, inside the caller's transaction when given one. */
export async function audit(entry: AuditEntry, transaction?: Transaction): Promise<void> {
  await AuditEvent.create(
    {
      actorUserId: entry.actorUserId,
      action: entry.action,
      entityType: entry.entityType,
      entityId: entry.entityId == null ? null : String(entry.entityId),
      detail: entry.detail ?? null,
      requestId: entry.requestId ?? null,
    },
    { transaction },
  );
}

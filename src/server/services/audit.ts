import { QueryTypes, type Transaction } from 'sequelize';
import { db } from '../../db/connection';

export interface AuditEntry {
  actorUserId: number | null;
  action: string;
  entityType: string;
  entityId?: string | number | null;
  /** Identifiers and changed values only: never names, birth dates or report text. */
  detail?: Record<string, unknown> | null;
  requestId?: string | null;
}

/**
 * Appends one audit event, inside the caller's transaction when given one. A plain INSERT (the
 * `AuditEvent` model reads the table): every write in the app comes through here, autosaves too.
 */
export async function audit(entry: AuditEntry, transaction?: Transaction): Promise<void> {
  await db().query(
    'INSERT INTO audit_events (at, actor_user_id, action, entity_type, entity_id, detail, request_id) VALUES (?, ?, ?, ?, ?, ?, ?)',
    {
      replacements: [
        new Date(),
        entry.actorUserId,
        entry.action,
        entry.entityType,
        entry.entityId == null ? null : String(entry.entityId),
        entry.detail == null ? null : JSON.stringify(entry.detail),
        entry.requestId ?? null,
      ],
      type: QueryTypes.INSERT,
      transaction,
    },
  );
}

import type { Transaction } from 'sequelize';
import { OutboxMessage } from '../../db/models';
import type { MailContent } from './templates';

/**
 * Puts a message in the outbox inside the caller's transaction: it is sent only if the
 * use-case commits, and sending never makes the use-case fail. A `dedupeKey` that was
 * already used makes this a no-op (e.g. one reminder per exam).
 */
export async function queueMail(
  msg: MailContent & { kind: string; to: string; examId?: number | null; dedupeKey?: string | null; attachReportId?: number | null },
  transaction: Transaction,
  now = new Date(),
): Promise<boolean> {
  if (msg.dedupeKey) {
    const seen = await OutboxMessage.findOne({ where: { dedupeKey: msg.dedupeKey }, transaction, attributes: ['id'] });
    if (seen) return false;
  }
  await OutboxMessage.create(
    {
      kind: msg.kind,
      dedupeKey: msg.dedupeKey ?? null,
      examId: msg.examId ?? null,
      attachReportId: msg.attachReportId ?? null,
      toAddress: msg.to,
      subject: msg.subject,
      textBody: msg.text,
      htmlBody: msg.html,
      nextAttemptAt: now,
    },
    { transaction },
  );
  return true;
}

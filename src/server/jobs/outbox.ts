import { Op } from 'sequelize';
import type { Transporter } from 'nodemailer';
import { db } from '../../db/connection';
import { OutboxMessage } from '../../db/models';
import { log } from '../log';
import { config } from '../config';
import { reportPdf } from '../pdf/report-pdf';
import { clinicProfile } from '../services/settings';

/** Waits before the next try: 30 s, 1, 2, 4, 8 … minutes, at most an hour. */
export function retryDelayMs(attempts: number): number {
  return Math.min(30_000 * 2 ** Math.max(0, attempts - 1), 3_600_000);
}
/** After this many failures a message is marked failed and shown as such. */
export const MAX_ATTEMPTS = 15;
const CLAIM_MS = 60_000;

/**
 * Sends due messages from the outbox. Rows are claimed first (a lease), so several workers
 * can run side by side without sending one message twice.
 */
export async function deliverDueMail(transport: Transporter, opts: { workerId: string; now?: Date; batch?: number }): Promise<{ sent: number; failed: number }> {
  const now = opts.now ?? new Date();
  await db().query(
    `UPDATE outbox SET claimed_by = ?, claimed_until = ? WHERE status = 'pending' AND next_attempt_at <= ?
       AND (claimed_until IS NULL OR claimed_until < ?) ORDER BY id LIMIT ?`,
    { replacements: [opts.workerId, new Date(now.getTime() + CLAIM_MS), now, now, opts.batch ?? 20] },
  );
  const claimed = await OutboxMessage.findAll({ where: { claimedBy: opts.workerId, status: 'pending', claimedUntil: { [Op.gt]: now } }, order: [['id', 'ASC']] });
  if (claimed.length === 0) return { sent: 0, failed: 0 };
  const clinic = await clinicProfile();
  const from = config().MAIL_FROM ?? `"${clinic.name}" <${clinic.email}>`;
  let sent = 0;
  let failed = 0;
  for (const msg of claimed) {
    try {
      // A report's PDF is rendered now, from the signed report as it stands (with any addenda).
      const attachments = msg.attachReportId === null ? [] : [await reportPdf(msg.attachReportId)].map((p) => ({ filename: p.filename, content: p.bytes, contentType: 'application/pdf' }));
      const info = await transport.sendMail({ from, to: msg.toAddress, subject: msg.subject, text: msg.textBody, html: msg.htmlBody, attachments });
      await msg.update({ status: 'sent', sentAt: new Date(), attempts: msg.attempts + 1, claimedBy: null, claimedUntil: null, lastError: null, providerMessageId: String(info.messageId ?? '').slice(0, 200) });
      sent += 1;
    } catch (error) {
      // The error code only (ECONNREFUSED, ETIMEDOUT, EAUTH): its text may quote the recipient.
      const code = String((error as { code?: string }).code ?? (error as Error).name).slice(0, 60);
      const attempts = msg.attempts + 1;
      await msg.update({
        status: attempts >= MAX_ATTEMPTS ? 'failed' : 'pending',
        attempts,
        nextAttemptAt: new Date(now.getTime() + retryDelayMs(attempts)),
        claimedBy: null,
        claimedUntil: null,
        lastError: code,
      });
      log.warn({ outboxId: msg.id, attempts, code }, 'e-mail not sent; will retry');
      failed += 1;
    }
  }
  return { sent, failed };
}

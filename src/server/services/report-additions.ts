import { createHash } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { db } from '../../db/connection';
import { Report, ReportAddendum, ReportCommunication } from '../../db/models';
import { canonicalJson } from '../../lib/canonical-json';
import { type AddendumInput, type CommunicationInput, type ReportDto } from '../../lib/schemas/reports';
import type { SessionUser } from '../../lib/session-user';
import { zonedTimeToUtc } from '../../lib/time';
import { HttpError, notFound } from '../http/errors';
import { plainText, sanitizeReportHtml } from '../report-text/sanitize';
import { audit } from './audit';
import { checkSignerPassword } from './reading';
import { queueDelivery } from './report-delivery';
import { dtoWithEditor, reportRefusal } from './reports';
import { clinicProfile } from './settings';

/**
 * What is added to a report once the physician has read it: addenda (corrections to a signed
 * report, signed the same way) and the record of urgent findings told directly to a clinician.
 * Both are written once; the database refuses to change or delete them afterwards.
 */

/** What an addendum's signature covers: its text, its signer and time, and the signature it follows (so the chain cannot be reordered). */
export function addendumContent(x: { reportId: number; follows: string; bodyHtml: string; signer: { id: number; name: string }; signedAt: Date }): string {
  return canonicalJson({ reportId: x.reportId, follows: x.follows, addendumHtml: x.bodyHtml, signer: x.signer, signedAt: x.signedAt.toISOString() });
}

const notSignedYet = (status: Report['status']) =>
  new HttpError(409, 'CONFLICT', status === 'preliminary' ? 'This report is not signed yet: edit its findings or impression instead of writing an addendum.' : `This report is ${status}; only a signed report takes an addendum.`);

/**
 * An addendum to a final (or already amended) report: the password again, then in one
 * transaction the addendum with its signature, the report → `amended`, and the referrer's e-mail
 * queued again. The report's own text and signature stay as signed. Two addenda written against
 * the same version: one is stored, the other gets 409.
 */
export async function addAddendum(actor: SessionUser, reportId: number, input: AddendumInput, requestId: string): Promise<ReportDto> {
  await checkSignerPassword(actor, reportId, input.password, 'report.addendum-refused', 'The addendum was not signed.', requestId);
  const bodyHtml = sanitizeReportHtml(input.bodyHtml);
  if (plainText(bodyHtml) === '') throw new HttpError(400, 'VALIDATION', 'The addendum was not signed.', { bodyHtml: 'Write the addendum before signing it.' });
  const signedAt = new Date();
  const applied = await db().transaction(async (transaction) => {
    // The status and version change is the lock: it applies to the version the physician saw.
    const [, changed] = await db().query(
      `UPDATE reports SET status = 'amended', version = version + 1, updated_by = ?, updated_at = ?
        WHERE id = ? AND version = ? AND status IN ('final', 'amended')`,
      { replacements: [actor.id, signedAt, reportId, input.version], type: QueryTypes.UPDATE, transaction },
    );
    if (changed !== 1) return false;
    const [chain] = await db().query<{ follows: string }>(
      `SELECT COALESCE((SELECT a.signed_hash FROM report_addenda a WHERE a.report_id = r.id ORDER BY a.signed_at DESC, a.id DESC LIMIT 1), r.signed_hash) AS follows
         FROM reports r WHERE r.id = ?`,
      { replacements: [reportId], type: QueryTypes.SELECT, transaction },
    );
    const signedHash = createHash('sha256').update(addendumContent({ reportId, follows: chain!.follows, bodyHtml, signer: { id: actor.id, name: actor.displayName }, signedAt })).digest('hex');
    const addendum = await ReportAddendum.create({ reportId, bodyHtml, signedBy: actor.id, signedAt, signedHash }, { transaction });
    await audit({ actorUserId: actor.id, action: 'report.addendum', entityType: 'report', entityId: reportId, detail: { addendumId: addendum.id, version: input.version, sha256: signedHash, chars: bodyHtml.length }, requestId }, transaction);
    await queueDelivery({ reportId, reason: 'addendum', actorUserId: actor.id, requestId }, transaction, signedAt);
    return true;
  });
  if (!applied) {
    const current = await Report.findByPk(reportId);
    if (!current) throw notFound('The report');
    if (current.status !== 'final' && current.status !== 'amended') throw notSignedYet(current.status);
    return reportRefusal(reportId, current.status, notSignedYet);
  }
  return dtoWithEditor((await Report.findByPk(reportId))!);
}

/** A communication may be recorded up to five minutes ahead of the server's clock (clocks differ a little). */
const CLOCK_SLACK_MS = 5 * 60_000;

/**
 * Records an urgent finding told directly to a clinician (who, how, when, read back). Allowed
 * while the report is being read and after it is signed (a call often follows the signature);
 * the report then carries the statement, on its page and in its PDF. Not on a draft: the
 * physician has not read it yet.
 */
export async function recordCommunication(actor: SessionUser, reportId: number, input: CommunicationInput, requestId: string): Promise<ReportDto> {
  const { timeZone } = await clinicProfile();
  const [day, clock] = input.communicatedAt.split('T') as [string, string];
  const communicatedAt = zonedTimeToUtc(day, Number(clock.slice(0, 2)), Number(clock.slice(3, 5)), timeZone);
  const stored = await db().transaction(async (transaction) => {
    const report = await Report.findByPk(reportId, { transaction, lock: transaction.LOCK.SHARE });
    if (!report) throw notFound('The report');
    if (report.status === 'draft') throw new HttpError(409, 'CONFLICT', 'This report is still a draft; urgent communications are recorded by the reading physician.');
    if (communicatedAt.getTime() > Date.now() + CLOCK_SLACK_MS) throw new HttpError(400, 'VALIDATION', 'Some values need correcting.', { communicatedAt: 'That time is still to come.' });
    // Nothing was found before the scan started (the report is created by "Start scan"; the
    // booked time says little when a patient is seen early).
    if (communicatedAt.getTime() < report.createdAt.getTime() - CLOCK_SLACK_MS) {
      throw new HttpError(400, 'VALIDATION', 'Some values need correcting.', { communicatedAt: 'That is before the scan started.' });
    }
    const c = await ReportCommunication.create(
      { reportId, ruleId: input.ruleId, finding: input.finding, recipientName: input.recipientName, recipientRole: input.recipientRole, method: input.method, communicatedAt, readBack: input.readBack, recordedBy: actor.id },
      { transaction },
    );
    // The log says that a call was made and how, not what was said.
    await audit({ actorUserId: actor.id, action: 'report.communication', entityType: 'report', entityId: reportId, detail: { communicationId: c.id, method: input.method, readBack: input.readBack, ruleId: input.ruleId, status: report.status }, requestId }, transaction);
    return report;
  });
  return dtoWithEditor(stored);
}

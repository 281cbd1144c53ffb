import { createHash, randomBytes } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import { db } from '../../db/connection';
import { ReportLink } from '../../db/models';
import type { SessionUser } from '../../lib/session-user';
import { formatDay, zonedDate } from '../../lib/time';
import { publicUrl } from '../config';
import { queueMail } from '../mail/outbox';
import { reportReady } from '../mail/templates';
import { audit } from './audit';
import { clinicProfile, reportDelivery } from './settings';

/**
 * Delivery of final reports to the referring clinician: an e-mail through the outbox saying a
 * report is ready (never what it says), with a link that carries a random token. Only the token's
 * sha256 is stored; the link expires after the clinic's `reports.delivery.linkDays`, works only
 * for the referrer it was sent to, once signed in, and every opening is counted and audited.
 */

export const tokenHash = (token: string) => createHash('sha256').update(token, 'utf8').digest('hex');

/** Inside the signing (or addendum) transaction: the link and the e-mail, or a note why none went. */
export async function queueDelivery(x: { reportId: number; reason: 'final' | 'addendum'; actorUserId: number; requestId: string }, transaction: Transaction, now = new Date()): Promise<boolean> {
  const [row] = await db().query<{ exam_id: number; referrer_id: number | null; name: string | null; email: string | null; active: number | null; accession_number: string; scheduled_start: Date; exam_type: string }>(
    `SELECT e.id AS exam_id, e.referrer_id, f.name, f.email, f.active, e.accession_number, e.scheduled_start, t.name AS exam_type
       FROM reports r JOIN exams e ON e.id = r.exam_id JOIN exam_types t ON t.id = e.exam_type_id
       LEFT JOIN referrers f ON f.id = e.referrer_id
      WHERE r.id = ?`,
    { replacements: [x.reportId], type: QueryTypes.SELECT, transaction },
  );
  if (!row || row.referrer_id === null || !row.email) {
    await audit({ actorUserId: x.actorUserId, action: 'report.delivery-skipped', entityType: 'report', entityId: x.reportId, detail: { reason: 'no referring clinician with an e-mail address' }, requestId: x.requestId }, transaction);
    return false;
  }
  const [{ linkDays, attachPdf }, clinic] = await Promise.all([reportDelivery(transaction), clinicProfile(transaction)]);
  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(now.getTime() + linkDays * 86_400_000);
  const link = await ReportLink.create({ reportId: x.reportId, referrerId: row.referrer_id, tokenHash: tokenHash(token), reason: x.reason, expiresAt }, { transaction });
  const mail = reportReady(clinic, {
    referrerName: row.name!,
    examTypeName: row.exam_type,
    examDay: formatDay(zonedDate(new Date(row.scheduled_start), clinic.timeZone)),
    accessionNumber: row.accession_number,
    link: `${publicUrl()}/r/${token}`,
    expiresOn: formatDay(zonedDate(expiresAt, clinic.timeZone)),
    reason: x.reason,
  });
  // The PDF goes with the e-mail only where the clinic allows it; it is made when the e-mail is sent.
  await queueMail({ ...mail, kind: 'report-ready', to: row.email, examId: row.exam_id, attachReportId: attachPdf ? x.reportId : null }, transaction, now);
  await audit({ actorUserId: x.actorUserId, action: 'report.delivery-queued', entityType: 'report', entityId: x.reportId, detail: { linkId: link.id, referrerId: row.referrer_id, reason: x.reason, pdfAttached: attachPdf }, requestId: x.requestId }, transaction);
  return true;
}

export type LinkOpening = { kind: 'open'; reportId: number } | { kind: 'expired' } | { kind: 'unknown' };

/**
 * A referrer follows an e-mailed link. Unknown tokens and links sent to someone else look the same
 * (unknown: the page answers 404); an expired link says so. Each opening is counted and audited.
 */
export async function openReportLink(user: SessionUser, token: string, requestId: string, now = new Date()): Promise<LinkOpening> {
  if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) return { kind: 'unknown' };
  const link = await ReportLink.findOne({ where: { tokenHash: tokenHash(token) } });
  if (!link || user.role !== 'referrer' || user.referrerId !== link.referrerId) {
    if (link) await audit({ actorUserId: user.id, action: 'report.link-refused', entityType: 'report', entityId: link.reportId, detail: { linkId: link.id }, requestId });
    return { kind: 'unknown' };
  }
  if (link.expiresAt.getTime() <= now.getTime()) {
    await audit({ actorUserId: user.id, action: 'report.link-expired', entityType: 'report', entityId: link.reportId, detail: { linkId: link.id }, requestId });
    return { kind: 'expired' };
  }
  await db().transaction(async (transaction) => {
    await db().query(
      'UPDATE report_links SET open_count = open_count + 1, first_opened_at = COALESCE(first_opened_at, ?), last_opened_at = ? WHERE id = ?',
      { replacements: [now, now, link.id], type: QueryTypes.UPDATE, transaction },
    );
    await audit({ actorUserId: user.id, action: 'report.link-open', entityType: 'report', entityId: link.reportId, detail: { linkId: link.id }, requestId }, transaction);
  });
  return { kind: 'open', reportId: link.reportId };
}

/**
 * The exam id of a report a referrer may read: final or amended, of an exam they referred.
 * Anything else is null, and the page answers 404 (not 403: it does not say the report exists).
 */
export async function referrerMayRead(user: SessionUser, reportId: number): Promise<number | null> {
  if (user.role !== 'referrer' || user.referrerId === null) return null;
  const [row] = await db().query<{ exam_id: number }>(
    `SELECT e.id AS exam_id FROM reports r JOIN exams e ON e.id = r.exam_id
      WHERE r.id = ? AND r.status IN ('final', 'amended') AND e.referrer_id = ?`,
    { replacements: [reportId, user.referrerId], type: QueryTypes.SELECT },
  );
  return row?.exam_id ?? null;
}

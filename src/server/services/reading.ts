import { createHash } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { db } from '../../db/connection';
import { Report } from '../../db/models';
import { canonicalJson } from '../../lib/canonical-json';
import type { CommunicationDto, ReadingInput, ReportDto, SignedDto } from '../../lib/schemas/reports';
import type { SessionUser } from '../../lib/session-user';
import { verifyPassword } from '../auth/password';
import { HttpError, notFound } from '../http/errors';
import { findingsToHtml, plainText, sanitizeReportHtml } from '../report-text/sanitize';
import { audit } from './audit';
import { queueDelivery } from './report-delivery';
import { dtoWithEditor, reportRefusal } from './reports';

/**
 * The reading physician's side of a report: claiming it from the queue, editing the findings and
 * impression, and signing. Every step is one transaction with its audit event; text is sanitized
 * here, whatever the browser sent.
 */

const signedAlready = () => new HttpError(409, 'SIGNED', 'This report is signed and can no longer be edited; corrections are written as an addendum.');

/** A preliminary report is what the reading physician may edit or sign; signed ones and drafts are refused, each in its words. */
const refusal = (reportId: number) =>
  reportRefusal(reportId, 'preliminary', (status) =>
    status === 'draft' ? new HttpError(409, 'CONFLICT', 'This report is still a draft: the sonographer has not submitted it yet.') : signedAlready(),
  );

/**
 * Opening a preliminary report claims it for the physician, so others see who is reading it.
 * A report someone else is reading stays theirs unless `takeOver` is asked for. Anything but a
 * preliminary report is left as it is.
 */
export async function claimReport(actor: SessionUser, reportId: number, takeOver: boolean, requestId: string): Promise<ReportDto> {
  const report = await db().transaction(async (transaction) => {
    const r = await Report.findByPk(reportId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!r) throw notFound('The report');
    if (r.status !== 'preliminary' || r.claimedBy === actor.id) return r;
    if (r.claimedBy !== null && !takeOver) return r;
    const from = r.claimedBy;
    // A claim is not an edit: the version (which guards the text) stays as it is.
    await r.update({ claimedBy: actor.id, claimedAt: new Date() }, { transaction, silent: true });
    await audit({ actorUserId: actor.id, action: from === null ? 'report.claim' : 'report.take-over', entityType: 'report', entityId: r.id, detail: { examId: r.examId, from }, requestId }, transaction);
    return r;
  });
  return dtoWithEditor(report);
}

/** Saves the physician's findings and impression on a preliminary report (409 once signed or when stale). */
export async function saveReading(actor: SessionUser, reportId: number, input: ReadingInput, requestId: string): Promise<ReportDto> {
  // An emptied box is no text (null): empty findings are signed as the generated ones.
  const findingsHtml = sanitizeReportHtml(input.findingsHtml) || null;
  const impressionHtml = sanitizeReportHtml(input.impressionHtml) || null;
  const applied = await db().transaction(async (transaction) => {
    const [, changed] = await db().query(
      `UPDATE reports SET findings_html = ?, impression_html = ?, updated_by = ?, version = version + 1, updated_at = ?,
              claimed_at = IF(claimed_by IS NULL, ?, claimed_at), claimed_by = COALESCE(claimed_by, ?)
        WHERE id = ? AND version = ? AND status = 'preliminary'`,
      { replacements: [findingsHtml, impressionHtml, actor.id, new Date(), new Date(), actor.id, reportId, input.version], type: QueryTypes.UPDATE, transaction },
    );
    if (changed !== 1) return false;
    await audit({ actorUserId: actor.id, action: 'report.edit', entityType: 'report', entityId: reportId, detail: { version: input.version, findingsChars: findingsHtml?.length ?? 0, impressionChars: impressionHtml?.length ?? 0 }, requestId }, transaction);
    return true;
  });
  if (!applied) return refusal(reportId);
  return dtoWithEditor((await Report.findByPk(reportId))!);
}

/** The urgent communications of a report as a signature covers them (the same values the report's DTO shows). */
async function communicationsOf(reportId: number): Promise<NonNullable<Parameters<typeof signedContent>[0]['communications']>> {
  const rows = await db().query<{ finding: string; recipient_name: string; recipient_role: string | null; method: CommunicationDto['method']; communicated_at: Date; read_back: number; recorded_by: string }>(
    `SELECT c.finding, c.recipient_name, c.recipient_role, c.method, c.communicated_at, c.read_back, u.display_name AS recorded_by
       FROM report_communications c JOIN users u ON u.id = c.recorded_by WHERE c.report_id = ? ORDER BY c.communicated_at, c.id`,
    { replacements: [reportId], type: QueryTypes.SELECT },
  );
  return rows.map((c) => ({ finding: c.finding, recipientName: c.recipient_name, recipientRole: c.recipient_role, method: c.method, communicatedAt: new Date(c.communicated_at).toISOString(), readBack: Boolean(c.read_back), recordedBy: c.recorded_by }));
}

/**
 * A signature (of a report or an addendum) asks for the physician's own password again; a wrong
 * one is a 400 on the password field, and the refusal is audited.
 */
export async function checkSignerPassword(actor: SessionUser, reportId: number, password: string, refusedAction: string, message: string, requestId: string): Promise<void> {
  const [row] = await db().query<{ password_hash: string }>('SELECT password_hash FROM users WHERE id = ?', { replacements: [actor.id], type: QueryTypes.SELECT });
  if (!row || !(await verifyPassword(row.password_hash, password))) {
    await audit({ actorUserId: actor.id, action: refusedAction, entityType: 'report', entityId: reportId, detail: { reason: 'password' }, requestId });
    throw new HttpError(400, 'VALIDATION', message, { password: 'That is not your password.' });
  }
}

/** What a signature covers, as one canonical JSON text (its sha256 is stored with the signature). */
export function signedContent(x: {
  report: Pick<Report, 'id' | 'examId' | 'templateId' | 'templateVersion' | 'referenceSetVersion' | 'measurements' | 'nodules' | 'heightCm' | 'weightKg' | 'probeKind' | 'evaluation'>;
  findingsHtml: string;
  impressionHtml: string;
  /** Urgent findings communicated before signing. */
  communications?: ReadonlyArray<Pick<CommunicationDto, 'finding' | 'recipientName' | 'recipientRole' | 'method' | 'communicatedAt' | 'readBack' | 'recordedBy'>>;
  signer: { id: number; name: string };
  signedAt: Date;
}): string {
  const r = x.report;
  const evaluation = (r.evaluation ?? {}) as { derived?: unknown; flags?: unknown; assessments?: unknown };
  return canonicalJson({
    reportId: r.id,
    examId: r.examId,
    template: `${r.templateId}@${r.templateVersion}`,
    referenceSet: r.referenceSetVersion,
    measurements: r.measurements,
    nodules: r.nodules,
    patientFactors: { heightCm: r.heightCm, weightKg: r.weightKg },
    probeKind: r.probeKind,
    derived: evaluation.derived ?? null,
    flags: evaluation.flags ?? null,
    assessments: evaluation.assessments ?? null,
    findingsHtml: x.findingsHtml,
    impressionHtml: x.impressionHtml,
    communications: (x.communications ?? []).map((c) => ({
      finding: c.finding,
      recipientName: c.recipientName,
      recipientRole: c.recipientRole,
      method: c.method,
      communicatedAt: c.communicatedAt,
      readBack: c.readBack,
      recordedBy: c.recordedBy,
    })),
    signer: x.signer,
    signedAt: x.signedAt.toISOString(),
  });
}

/**
 * "Sign": the physician's password again, then in one transaction the signature (signer, time,
 * sha256 of the signed content), `final`, and the referrer's e-mail queued. Of two physicians signing at once exactly one wins;
 * the other gets 409. A report without an impression is not signed.
 */
export async function signReport(actor: SessionUser, reportId: number, input: { version: number; password: string }, requestId: string): Promise<SignedDto> {
  // The report and its urgent communications are read while the password is checked (argon2id
  // runs off the main thread); nothing is decided before the password holds.
  const [, report, communications] = await Promise.all([
    checkSignerPassword(actor, reportId, input.password, 'report.sign-refused', 'The report was not signed.', requestId),
    Report.findByPk(reportId),
    // Urgent findings told before signing are part of what is signed (recorded once, never changed).
    communicationsOf(reportId),
  ]);
  if (!report) throw notFound('The report');
  if (report.version !== input.version || report.status !== 'preliminary') return refusal(reportId);
  const impressionHtml = report.impressionHtml ?? '';
  if (plainText(impressionHtml) === '') throw new HttpError(400, 'VALIDATION', 'The report was not signed.', { impressionHtml: 'Write the impression before signing.' });
  // Findings nobody edited are the engine's generated text, fixed now as the signed findings.
  const findingsHtml = report.findingsHtml ?? findingsToHtml(report.findingsText);
  const signedAt = new Date();
  const hash = createHash('sha256').update(signedContent({ report, findingsHtml, impressionHtml, communications, signer: { id: actor.id, name: actor.displayName }, signedAt })).digest('hex');
  const applied = await db().transaction(async (transaction) => {
      const [, changed] = await db().query(
        `UPDATE reports SET status = 'final', findings_html = ?, signed_by = ?, signed_at = ?, signed_hash = ?, updated_by = ?, updated_at = ?, version = version + 1
          WHERE id = ? AND version = ? AND status = 'preliminary'`,
        { replacements: [findingsHtml, actor.id, signedAt, hash, actor.id, signedAt, reportId, input.version], type: QueryTypes.UPDATE, transaction },
      );
      if (changed !== 1) return false;
      await audit({ actorUserId: actor.id, action: 'report.sign', entityType: 'report', entityId: reportId, detail: { examId: report.examId, version: input.version, sha256: hash }, requestId }, transaction);
      // The referrer's e-mail and link go in the same transaction: sent only if the signature holds.
      await queueDelivery({ reportId, reason: 'final', actorUserId: actor.id, requestId }, transaction, signedAt);
      return true;
  });
  if (!applied) return refusal(reportId);
  return { id: reportId, examId: report.examId, status: 'final', version: input.version + 1, signedBy: actor.displayName, signedAt: signedAt.toISOString(), signedHash: hash, updatedAt: signedAt.toISOString() };
}

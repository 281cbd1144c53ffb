import { Op, type WhereOptions } from 'sequelize';
import { db } from '../../db/connection';
import { Attachment, AuditEvent, Exam, ExamType, Patient } from '../../db/models';
import { IMAGE_EXAM_STATUSES } from '../../lib/attachments/file-types';
import { SOP_CLASS_NAMES } from '../../lib/dicom/dictionary';
import { EXAM_STATUS_LABELS, type ExamStatus } from '../../lib/exam-status';
import type { AttachHeldAnswer, AttachHeldInput, CandidateReason, DiscardHeldInput, HeldCandidate, HeldList, HeldObject } from '../../lib/schemas/holding';
import { patientName } from '../../lib/schemas/patients';
import type { SessionUser } from '../../lib/session-user';
import { formatInstant, zonedDate, zonedDayRange } from '../../lib/time';
import { matchToExam, mismatchMessage, type ExamIdentity, type FileIdentity } from '../dicom/matching';
import { offerScannerValues } from '../dicom/scanner-values';
import { conflict, HttpError, notFound, ruleBroken } from '../http/errors';
import { log } from '../log';
import { removeFiles } from './attachments';
import { audit } from './audit';
import { clinicProfile } from './settings';
import { examsChanged } from './worklist-cache';

/** The holding list shows this many, newest first; the total says when there are more. */
const HELD_PAGE = 100;
const CANDIDATES_PER_OBJECT = 3;
const TAKEN = 'This object was already attached or discarded by someone else. Nothing was changed; the list now shows what is still waiting.';

type ExamWithFacts = Exam & { patient: Patient; examType: ExamType };
const EXAM_FACTS = [
  { model: Patient, as: 'patient', attributes: ['id', 'mrn', 'familyName', 'givenName'] },
  { model: ExamType, as: 'examType', attributes: ['id', 'name'] },
];

/** The objects a scanner sent that matched no exam, each with up to three exams it may belong to. */
export async function listHeld(): Promise<HeldList> {
  const [{ rows, count }, { timeZone }] = await Promise.all([
    Attachment.findAndCountAll({ where: { matchStatus: 'unmatched' }, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: HELD_PAGE }),
    clinicProfile(),
  ]);
  const candidates = await candidatesFor(rows, timeZone);
  return { total: count, rows: rows.map((r) => heldDto(r, candidates.get(r.id) ?? [], timeZone)) };
}

/** The exam with the accession number someone typed, offered for one held object (empty when none has it). */
export async function candidatesByAccession(attachmentId: number, accessionNumber: string): Promise<HeldCandidate[]> {
  const row = await Attachment.findByPk(attachmentId);
  if (!row) throw await missingHeld(attachmentId);
  if (row.matchStatus !== 'unmatched') throw conflict(TAKEN);
  const [exam, { timeZone }] = await Promise.all([
    Exam.findOne({ where: { accessionNumber }, include: EXAM_FACTS }) as Promise<ExamWithFacts | null>,
    clinicProfile(),
  ]);
  return exam ? [candidateDto(exam, 'typed', fileIdentityOf(row), timeZone)] : [];
}

/**
 * Files a held object with an exam the front desk chose, in one transaction: the object must
 * still be held, the exam must take images, and when the file's Patient ID or accession is not
 * the exam's the request is refused (409 IDENTITY_MISMATCH, naming both) unless the person
 * confirmed it. Measurements of a structured report are then offered to the exam's form.
 */
export async function attachHeld(actor: SessionUser, attachmentId: number, input: AttachHeldInput, requestId: string): Promise<AttachHeldAnswer> {
  let offered = 0;
  const answer = await db().transaction(async (transaction): Promise<AttachHeldAnswer | null> => {
    const row = await Attachment.findByPk(attachmentId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) return null;
    if (row.matchStatus !== 'unmatched') throw conflict(TAKEN);
    // Shared lock: the exam must not be cancelled while the object is being filed with it.
    const exam = (await Exam.findByPk(input.examId, {
      transaction,
      lock: transaction.LOCK.SHARE,
      include: [{ model: Patient, as: 'patient', attributes: ['id', 'mrn'] }],
    })) as (Exam & { patient: Patient }) | null;
    if (!exam) throw notFound('The exam');
    assertTakesImages(exam);

    const file = fileIdentityOf(row);
    const identity = examIdentityOf(exam);
    const match = matchToExam(file, identity);
    if (!match.ok && !input.confirmMismatch) {
      throw new HttpError(409, 'IDENTITY_MISMATCH', mismatchMessage(file, identity, 'Attach it anyway only if you are sure it belongs to this exam.'));
    }
    const same = await Attachment.findOne({ where: { examId: exam.id, sha256: row.sha256 }, attributes: ['id'], transaction });
    if (same) throw conflict(`Exam ${exam.accessionNumber} already has this very file. Discard the held copy instead.`);

    const heldReason = row.heldReason;
    await row.update({ examId: exam.id, matchStatus: 'matched', heldReason: null }, { transaction });
    await audit(
      {
        actorUserId: actor.id,
        action: 'attachment.attach',
        entityType: 'exam',
        entityId: exam.id,
        // Codes only (Patient ID, accession, UIDs); the held reason moves here from the row.
        detail: {
          attachmentId: row.id,
          examId: exam.id,
          patientId: row.patientId,
          accessionNumber: row.accessionNumber,
          studyInstanceUid: row.studyInstanceUid,
          sopInstanceUid: row.sopInstanceUid,
          receivedFrom: row.receivedFrom,
          heldReason,
          mismatchConfirmed: !match.ok,
        },
        requestId,
      },
      transaction,
    );
    if (!match.ok) log.warn({ requestId, attachmentId: row.id, examId: exam.id, actorUserId: actor.id }, 'held object attached despite an identity mismatch (confirmed)');
    offered = await offerScannerValues(row, transaction);
    return { attachmentId: row.id, examId: exam.id, accessionNumber: exam.accessionNumber, mismatchConfirmed: !match.ok };
  });
  if (!answer) throw await missingHeld(attachmentId);
  // Offered measurements show on the worklist, like those of an object matched on arrival.
  if (offered > 0) examsChanged();
  return answer;
}

/**
 * Deletes a held object the front desk recognised as not belonging here (a test image, a
 * wrong patient), with its audit event, in one transaction; its files go after the commit.
 */
export async function discardHeld(actor: SessionUser, attachmentId: number, input: DiscardHeldInput, requestId: string): Promise<void> {
  const keys = await db().transaction(async (transaction) => {
    const row = await Attachment.findByPk(attachmentId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) return null;
    if (row.matchStatus !== 'unmatched') throw conflict(TAKEN);
    await row.destroy({ transaction });
    await audit(
      {
        actorUserId: actor.id,
        action: 'attachment.discard',
        entityType: 'attachment',
        entityId: row.id,
        detail: {
          attachmentId: row.id,
          sha256: row.sha256,
          patientId: row.patientId,
          accessionNumber: row.accessionNumber,
          studyInstanceUid: row.studyInstanceUid,
          sopInstanceUid: row.sopInstanceUid,
          receivedFrom: row.receivedFrom,
          heldReason: row.heldReason,
          reason: input.reason,
        },
        requestId,
      },
      transaction,
    );
    // removeFiles wants two keys; with no thumbnail the file's own key stands in (removing it twice is harmless).
    return { file: row.storageKey, thumbnail: row.thumbnailKey ?? row.storageKey };
  });
  if (!keys) throw await missingHeld(attachmentId);
  await removeFiles(keys, requestId);
}

/** A row that is gone: discarded by someone else (409), or never there (404). */
async function missingHeld(attachmentId: number): Promise<HttpError> {
  const discarded = await AuditEvent.count({ where: { action: 'attachment.discard', entityType: 'attachment', entityId: String(attachmentId) } });
  return discarded ? conflict(TAKEN) : notFound('The held object');
}

function assertTakesImages(exam: Exam): void {
  const status: ExamStatus = exam.status;
  if ((IMAGE_EXAM_STATUSES as readonly string[]).includes(status)) return;
  const when = status === 'booked' ? ' once the patient has arrived' : ' while it is open';
  const message = `Images can be attached to an exam only${when}; exam ${exam.accessionNumber} is ${EXAM_STATUS_LABELS[status].toLowerCase()}. The object is still held.`;
  throw ruleBroken(message, { examId: message });
}

const fileIdentityOf = (r: Attachment): FileIdentity => ({
  patientId: r.patientId ?? '',
  accessionNumber: r.accessionNumber ?? '',
  studyInstanceUid: r.studyInstanceUid ?? '',
});

const examIdentityOf = (e: Exam & { patient: Patient }): ExamIdentity => ({
  mrn: e.patient.mrn,
  accessionNumber: e.accessionNumber,
  studyInstanceUid: e.studyInstanceUid,
});

/**
 * Exams each held object may belong to, found in three queries for the whole page: the same
 * accession number or Study Instance UID, or the same patient (Patient ID = MRN) booked on the
 * clinic day the object was acquired (or received). Closest first, at most three per object.
 */
async function candidatesFor(rows: Attachment[], timeZone: string): Promise<Map<number, HeldCandidate[]>> {
  const out = new Map<number, HeldCandidate[]>();
  if (!rows.length) return out;
  const accessions = unique(rows.map((r) => r.accessionNumber));
  const studies = unique(rows.map((r) => r.studyInstanceUid));
  const mrns = unique(rows.map((r) => r.patientId));
  const byCode: WhereOptions[] = [];
  if (accessions.length) byCode.push({ accessionNumber: accessions });
  if (studies.length) byCode.push({ studyInstanceUid: studies });

  const [codeExams, patients] = await Promise.all([
    byCode.length ? (Exam.findAll({ where: { [Op.or]: byCode }, include: EXAM_FACTS }) as Promise<ExamWithFacts[]>) : [],
    mrns.length ? Patient.findAll({ where: { mrn: mrns }, attributes: ['id', 'mrn'] }) : [],
  ]);
  const patientIdOf = new Map(patients.map((p) => [p.mrn, p.id]));
  const dayOf = (r: Attachment) => zonedDayRange(zonedDate(r.acquiredAt ?? r.createdAt, timeZone), timeZone);
  const sameDay = rows.flatMap((r) => {
    const patientId = r.patientId ? patientIdOf.get(r.patientId) : undefined;
    if (!patientId) return [];
    const { start, end } = dayOf(r);
    return [{ patientId, scheduledStart: { [Op.gte]: start, [Op.lt]: end } }];
  });
  const dayExams = sameDay.length ? ((await Exam.findAll({ where: { [Op.or]: sameDay }, include: EXAM_FACTS })) as ExamWithFacts[]) : [];

  for (const r of rows) {
    const file = fileIdentityOf(r);
    const when = (r.acquiredAt ?? r.createdAt).getTime();
    const { start, end } = dayOf(r);
    const found: Array<[ExamWithFacts, CandidateReason]> = [
      ...codeExams.filter((e) => r.accessionNumber && e.accessionNumber === r.accessionNumber).map((e) => [e, 'accession'] as [ExamWithFacts, CandidateReason]),
      ...codeExams.filter((e) => r.studyInstanceUid && e.studyInstanceUid === r.studyInstanceUid).map((e) => [e, 'study-uid'] as [ExamWithFacts, CandidateReason]),
      ...dayExams
        .filter((e) => e.patient.mrn === r.patientId && e.scheduledStart >= start && e.scheduledStart < end)
        .sort((a, b) => Math.abs(a.scheduledStart.getTime() - when) - Math.abs(b.scheduledStart.getTime() - when))
        .map((e) => [e, 'patient-day'] as [ExamWithFacts, CandidateReason]),
    ];
    // An exam found twice (same accession and same day) is offered once, for its first reason.
    const picked = new Map<number, HeldCandidate>();
    for (const [e, reason] of found) if (!picked.has(e.id)) picked.set(e.id, candidateDto(e, reason, file, timeZone));
    out.set(r.id, [...picked.values()].slice(0, CANDIDATES_PER_OBJECT));
  }
  return out;
}

function candidateDto(e: ExamWithFacts, reason: CandidateReason, file: FileIdentity, timeZone: string): HeldCandidate {
  const status: ExamStatus = e.status;
  return {
    examId: e.id,
    accessionNumber: e.accessionNumber,
    mrn: e.patient.mrn,
    patientName: patientName(e.patient),
    examType: e.examType.name,
    scheduledLabel: formatInstant(e.scheduledStart, timeZone),
    status,
    statusLabel: EXAM_STATUS_LABELS[status],
    reason,
    takesImages: (IMAGE_EXAM_STATUSES as readonly string[]).includes(status),
    identityMatches: matchToExam(file, examIdentityOf(e)).ok,
  };
}

function heldDto(r: Attachment, candidates: HeldCandidate[], timeZone: string): HeldObject {
  return {
    id: r.id,
    receivedAt: r.createdAt.toISOString(),
    receivedLabel: formatInstant(r.createdAt, timeZone),
    receivedFrom: r.receivedFrom ?? null,
    heldReason: r.heldReason ?? null,
    patientId: r.patientId,
    accessionNumber: r.accessionNumber,
    studyInstanceUid: r.studyInstanceUid,
    sopClassName: r.sopClassUid ? (SOP_CLASS_NAMES[r.sopClassUid] ?? r.sopClassUid) : null,
    modality: r.modality,
    acquiredLabel: r.acquiredAt ? formatInstant(r.acquiredAt, timeZone) : null,
    thumbnailUrl: r.thumbnailKey ? `/api/attachments/${r.id}/thumbnail` : null,
    candidates,
  };
}

function unique(values: Array<string | null>): string[] {
  return [...new Set(values.filter((v): v is string => Boolean(v)))];
}

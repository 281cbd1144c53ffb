import { createHash } from 'node:crypto';
import { UniqueConstraintError } from 'sequelize';
import { db } from '../../db/connection';
import { Attachment, Exam, Patient } from '../../db/models';
import { IMAGE_EXAM_STATUSES } from '../../lib/attachments/file-types';
import { EXAM_STATUS_LABELS, type ExamStatus } from '../../lib/exam-status';
import { SOP_CLASS_NAMES } from '../../lib/dicom/dictionary';
import { newKeys, removeFiles, storeFiles, thumbnailFor } from '../services/attachments';
import { audit } from '../services/audit';
import { clinicProfile } from '../services/settings';
import { DicomReadError, readDicomFacts, toInstant, type DicomFacts } from './identifiers';
import { matchToExam, mismatchMessage } from './matching';
import { offerScannerValues } from './scanner-values';

/** What became of one object a scanner sent. */
export type ReceiveOutcome =
  | { kind: 'matched'; attachmentId: number; examId: number; offered: number }
  | { kind: 'held'; attachmentId: number; reason: string }
  | { kind: 'duplicate'; attachmentId: number }
  /** The same SOP Instance UID arrived before with other bytes: refused, the first copy kept. */
  | { kind: 'conflict'; message: string }
  | { kind: 'unreadable'; message: string };

/** Where an object belongs, or why it waits in the holding list. */
type Placement = { examId: number; held: null } | { examId: null; held: string };

/**
 * Finds the exam an object belongs to: by accession number, else by Study Instance UID (the
 * one the worklist gave the scanner). The same identity check as uploads applies; an object
 * that fails it, or belongs to an exam that takes no images, is held, never filed.
 */
async function placementOf(facts: DicomFacts): Promise<Placement> {
  const where = facts.accessionNumber
    ? { accessionNumber: facts.accessionNumber }
    : facts.studyInstanceUid
      ? { studyInstanceUid: facts.studyInstanceUid }
      : null;
  if (!where) return { examId: null, held: 'The object has neither an accession number nor a Study Instance UID.' };
  const exam = (await Exam.findOne({ where, include: [{ model: Patient, as: 'patient', attributes: ['mrn'] }] })) as (Exam & { patient: Patient }) | null;
  if (!exam) {
    return {
      examId: null,
      held: facts.accessionNumber
        ? `No exam has accession number ${facts.accessionNumber}.`
        : `No exam has Study Instance UID ${facts.studyInstanceUid} (the object has no accession number).`,
    };
  }
  const identity = { mrn: exam.patient.mrn, accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid };
  const match = matchToExam(facts, identity);
  if (!match.ok) return { examId: null, held: mismatchMessage(facts, identity, '') };
  if (!(IMAGE_EXAM_STATUSES as readonly string[]).includes(exam.status)) {
    return { examId: null, held: `Exam ${exam.accessionNumber} is ${EXAM_STATUS_LABELS[exam.status as ExamStatus].toLowerCase()}; images are filed only while the patient is here or the exam is scanned.` };
  }
  return { examId: exam.id, held: null };
}

/**
 * Files one DICOM object a scanner sent (C-STORE), kept byte for byte: the Part 10 bytes are
 * stored through the file store with their sha256, the row and its audit event written in one
 * transaction (with any measurements of a structured report offered to the form), and the
 * stored files removed again when that fails. Never throws for the object's content; an
 * unexpected failure (database, disk) does throw, and the listener answers "out of resources".
 */
export async function receiveObject(bytes: Buffer, callingAe: string, associationId: string): Promise<ReceiveOutcome> {
  let facts: DicomFacts;
  try {
    facts = readDicomFacts(bytes);
  } catch (error) {
    if (error instanceof DicomReadError) return { kind: 'unreadable', message: 'The object could not be read as DICOM.' };
    throw error;
  }
  if (!facts.sopInstanceUid || facts.sopInstanceUid.length > 64 || facts.patientId.length > 64 || facts.accessionNumber.length > 16) {
    return { kind: 'unreadable', message: 'The object has no usable SOP Instance UID, or an identifier longer than DICOM allows.' };
  }
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const earlier = await Attachment.findOne({ where: { sopInstanceUid: facts.sopInstanceUid } });
  if (earlier) {
    if (earlier.sha256 === sha256) return { kind: 'duplicate', attachmentId: earlier.id };
    return { kind: 'conflict', message: 'An object with this SOP Instance UID but other content is already stored; the first copy is kept.' };
  }

  const placement = await placementOf(facts);
  const thumbnail = facts.hasPixelData ? await thumbnailFor('dicom', bytes, facts).catch(() => null) : null;
  const { timeZone } = await clinicProfile();
  const keys = newKeys(sha256);
  await storeFiles(keys, bytes, thumbnail, associationId);
  try {
    return await db().transaction(async (transaction): Promise<ReceiveOutcome> => {
      let { examId, held } = placement;
      if (examId !== null) {
        // Read again, locked: the exam may have been cancelled meanwhile.
        const exam = await Exam.findByPk(examId, { transaction, lock: transaction.LOCK.SHARE });
        if (!exam || !(IMAGE_EXAM_STATUSES as readonly string[]).includes(exam.status)) {
          held = `Exam ${exam?.accessionNumber ?? examId} no longer takes images.`;
          examId = null;
        }
      }
      const row = await Attachment.create(
        {
          examId,
          matchStatus: examId === null ? 'unmatched' : 'matched',
          kind: 'dicom',
          source: 'network',
          originalName: `${facts.modality || 'DICOM'}-${facts.sopInstanceUid}.dcm`.slice(0, 255),
          contentType: 'application/dicom',
          sizeBytes: bytes.length,
          sha256,
          storageKey: keys.file,
          thumbnailKey: thumbnail ? keys.thumbnail : null,
          patientId: facts.patientId || null,
          accessionNumber: facts.accessionNumber || null,
          studyInstanceUid: facts.studyInstanceUid || null,
          seriesInstanceUid: facts.seriesInstanceUid || null,
          sopInstanceUid: facts.sopInstanceUid,
          sopClassUid: facts.sopClassUid || null,
          modality: facts.modality.slice(0, 16) || null,
          acquiredAt: facts.acquired ? toInstant(facts.acquired, timeZone) : null,
          imageRows: facts.rows,
          imageColumns: facts.columns,
          frameCount: facts.frames,
          transferSyntaxUid: facts.transferSyntaxUid || null,
          uploadedBy: null,
          receivedFrom: callingAe,
          heldReason: held,
        },
        { transaction },
      );
      const offered = examId === null ? 0 : await offerScannerValues(row, transaction, bytes);
      await audit(
        {
          actorUserId: null,
          action: examId === null ? 'attachment.hold' : 'attachment.receive',
          entityType: examId === null ? 'attachment' : 'exam',
          entityId: examId ?? row.id,
          detail: { attachmentId: row.id, scannerAe: callingAe, sopClass: SOP_CLASS_NAMES[facts.sopClassUid] ?? facts.sopClassUid, sizeBytes: bytes.length, sha256, offered, ...(held ? { reason: held } : {}) },
          requestId: associationId,
        },
        transaction,
      );
      return examId === null ? { kind: 'held', attachmentId: row.id, reason: held! } : { kind: 'matched', attachmentId: row.id, examId, offered };
    });
  } catch (error) {
    await removeFiles(keys, associationId);
    if (error instanceof UniqueConstraintError) {
      // The same object twice at once (two associations): the other one won.
      const winner = await Attachment.findOne({ where: { sopInstanceUid: facts.sopInstanceUid, sha256 } });
      if (winner) return { kind: 'duplicate', attachmentId: winner.id };
    }
    throw error;
  }
}

import { createHash, randomBytes } from 'node:crypto';
import { UniqueConstraintError } from 'sequelize';
import { db } from '../../db/connection';
import { Attachment, Exam, Patient, User } from '../../db/models';
import {
  CONTENT_TYPES,
  IMAGE_EXAM_STATUSES,
  kindOf,
  sizeRefusal,
  sniffType,
  typeRefusal,
  type FileType,
} from '../../lib/attachments/file-types';
import { EXAM_STATUS_LABELS, type ExamStatus } from '../../lib/exam-status';
import { pixelRoute, SOP_CLASS_NAMES, TRANSFER_SYNTAX_NAMES } from '../../lib/dicom/dictionary';
import type { AttachmentDto, UploadAnswer } from '../../lib/schemas/attachments';
import type { SessionUser } from '../../lib/session-user';
import { formatInstant } from '../../lib/time';
import { DicomReadError, readDicomFacts, toInstant, type DicomFacts } from '../dicom/identifiers';
import { matchToExam } from '../dicom/matching';
import { dicomThumbnail, imageThumbnail, THUMBNAIL_CONTENT_TYPE } from '../dicom/thumbnails';
import { conflict, HttpError, notFound, ruleBroken } from '../http/errors';
import { log } from '../log';
import { FileNotFound, fileStore } from '../storage';
import type { IncomingFile } from '../storage/incoming';
import type { Sendable } from '../storage/send';
import { audit } from './audit';
import { clinicProfile } from './settings';

const unsupported = (message: string) => new HttpError(415, 'UNSUPPORTED_MEDIA_TYPE', message, { file: message });

export function assertImagesAllowed(status: ExamStatus): void {
  if (!(IMAGE_EXAM_STATUSES as readonly string[]).includes(status)) {
    const when = status === 'booked' ? ' once the patient has arrived' : '';
    throw ruleBroken(`Images can be added to an exam only${when || ' while it is open'}; this one is ${EXAM_STATUS_LABELS[status].toLowerCase()}. Nothing was stored.`);
  }
}

/**
 * Storage keys for one stored file: the content hash for people reading the folder, plus a
 * random part so no two rows ever share a file (removing one upload's file after a failure can
 * never remove another's).
 */
export function newKeys(sha256: string): { file: string; thumbnail: string } {
  const name = `${sha256}-${randomBytes(6).toString('hex')}`;
  const dir = `${sha256.slice(0, 2)}/${sha256.slice(2, 4)}`;
  return { file: `attachments/${dir}/${name}`, thumbnail: `thumbnails/${dir}/${name}.jpg` };
}

/** Reads and checks a DICOM upload; throws 415 for a damaged or incomplete object. */
function dicomFactsOf(bytes: Uint8Array): DicomFacts {
  let facts: DicomFacts;
  try {
    facts = readDicomFacts(bytes);
  } catch (error) {
    if (error instanceof DicomReadError) throw unsupported('This DICOM file is damaged or incomplete and cannot be read. Export it from the scanner again. Nothing was stored.');
    throw error;
  }
  const uids = [facts.sopInstanceUid, facts.studyInstanceUid, facts.seriesInstanceUid, facts.sopClassUid, facts.transferSyntaxUid];
  if (!facts.sopInstanceUid || uids.some((u) => u.length > 64) || facts.patientId.length > 64) {
    throw unsupported('This DICOM file is not a complete DICOM object (its identifiers are missing or malformed). Nothing was stored.');
  }
  return facts;
}

/** An attachment already holding these bytes or this DICOM object, on this exam; 409 when elsewhere. */
async function existingCopy(examId: number, sha256: string, sopInstanceUid: string | null): Promise<Attachment | null> {
  const same = await Attachment.findOne({ where: { examId, sha256 } });
  if (same) return same;
  if (!sopInstanceUid) return null;
  const object = await Attachment.findOne({ where: { sopInstanceUid } });
  if (object && object.examId === examId) return object;
  if (object) {
    throw conflict(`This DICOM image (SOP Instance UID ${sopInstanceUid}) is already stored, with another exam or waiting to be matched. Nothing was stored.`);
  }
  return null;
}

/**
 * Adds one uploaded file to an exam. Everything is checked before a byte is stored: the exam
 * takes images, the real type matches the claimed one, the size is within its limit, and a DICOM
 * object's Patient ID and Accession Number are this exam's. Then the file and its thumbnail are
 * stored and the row and its audit event written in one transaction; when that fails the stored
 * files are removed again. The same bytes (or DICOM object) twice answer `duplicate: true`.
 */
export async function uploadAttachment(actor: SessionUser, examId: number, file: IncomingFile, requestId: string): Promise<UploadAnswer> {
  const exam = (await Exam.findByPk(examId, { include: [{ model: Patient, as: 'patient', attributes: ['id', 'mrn'] }] })) as (Exam & { patient: Patient }) | null;
  if (!exam) throw notFound('The exam');
  assertImagesAllowed(exam.status);

  const { bytes } = file;
  const type = sniffType(bytes);
  const typeProblem = typeRefusal(type, file.name, file.mediaType, bytes);
  if (typeProblem || !type) throw unsupported(typeProblem ?? 'This file cannot be added. Nothing was stored.');
  const sizeProblem = sizeRefusal(type, bytes.length);
  if (sizeProblem) throw new HttpError(413, 'PAYLOAD_TOO_LARGE', sizeProblem, { file: sizeProblem });

  const facts = type === 'dicom' ? dicomFactsOf(bytes) : null;
  if (facts) {
    const match = matchToExam(facts, { mrn: exam.patient.mrn, accessionNumber: exam.accessionNumber, studyInstanceUid: exam.studyInstanceUid });
    if (!match.ok) {
      log.warn({ requestId, examId, actorUserId: actor.id }, 'DICOM upload refused: its identifiers are not this exam’s');
      throw ruleBroken(match.message, { file: match.message });
    }
  }

  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const already = await existingCopy(examId, sha256, facts?.sopInstanceUid ?? null);
  if (already) return { attachment: await toDto(already), duplicate: true };

  const thumbnail = await thumbnailFor(type, bytes, facts);
  const { timeZone } = await clinicProfile();
  const keys = newKeys(sha256);
  await storeFiles(keys, bytes, thumbnail, requestId);
  let row: Attachment;
  try {
    row = await db().transaction(async (transaction) => {
      // Read again, locked: the exam may have been cancelled while the file was being checked.
      const current = await Exam.findByPk(examId, { transaction, lock: transaction.LOCK.SHARE });
      if (!current) throw notFound('The exam');
      assertImagesAllowed(current.status);
      const created = await Attachment.create(
        {
          examId,
          matchStatus: 'matched',
          kind: kindOf(type),
          source: 'upload',
          originalName: file.name,
          contentType: CONTENT_TYPES[type],
          sizeBytes: bytes.length,
          sha256,
          storageKey: keys.file,
          thumbnailKey: thumbnail ? keys.thumbnail : null,
          patientId: facts?.patientId || null,
          accessionNumber: facts?.accessionNumber || null,
          studyInstanceUid: facts?.studyInstanceUid || null,
          seriesInstanceUid: facts?.seriesInstanceUid || null,
          sopInstanceUid: facts?.sopInstanceUid || null,
          sopClassUid: facts?.sopClassUid || null,
          modality: facts?.modality.slice(0, 16) || null,
          acquiredAt: facts?.acquired ? toInstant(facts.acquired, timeZone) : null,
          imageRows: facts?.rows ?? null,
          imageColumns: facts?.columns ?? null,
          frameCount: facts?.frames ?? null,
          transferSyntaxUid: facts?.transferSyntaxUid || null,
          uploadedBy: actor.id,
        },
        { transaction },
      );
      await audit(
        {
          actorUserId: actor.id,
          action: 'attachment.upload',
          entityType: 'exam',
          entityId: examId,
          detail: { attachmentId: created.id, kind: created.kind, sizeBytes: bytes.length, thumbnailBytes: thumbnail?.length ?? 0, sha256 },
          requestId,
        },
        transaction,
      );
      return created;
    });
  } catch (error) {
    await removeFiles(keys, requestId);
    // Two uploads of the same file at once: the other one won; answer as a duplicate.
    if (error instanceof UniqueConstraintError) {
      const winner = await existingCopy(examId, sha256, facts?.sopInstanceUid ?? null);
      if (winner) return { attachment: await toDto(winner), duplicate: true };
    }
    throw error;
  }
  return { attachment: await toDto(row), duplicate: false };
}

export async function thumbnailFor(type: FileType, bytes: Uint8Array, facts: DicomFacts | null): Promise<Buffer | null> {
  if (facts) return dicomThumbnail(bytes, facts);
  try {
    return await imageThumbnail(bytes);
  } catch {
    throw unsupported(`This ${type === 'png' ? 'PNG' : 'JPEG'} image is damaged and cannot be read. Nothing was stored.`);
  }
}

export async function storeFiles(keys: { file: string; thumbnail: string }, bytes: Uint8Array, thumbnail: Buffer | null, requestId: string): Promise<void> {
  const store = fileStore();
  try {
    await store.put(keys.file, bytes);
    if (thumbnail) await store.put(keys.thumbnail, thumbnail);
  } catch (error) {
    await removeFiles(keys, requestId);
    log.error({ requestId, err: { name: (error as Error)?.name, code: (error as NodeJS.ErrnoException)?.code } }, 'file store write failed');
    throw new HttpError(503, 'DEPENDENCY_DOWN', 'The file could not be stored right now (the file store did not accept it). Nothing was stored; please try again.');
  }
}

/** Removes the files of an upload that did not complete; a failure here is logged (an orphan file). */
export async function removeFiles(keys: { file: string; thumbnail: string }, requestId: string): Promise<void> {
  const store = fileStore();
  const results = await Promise.allSettled([store.delete(keys.file), store.delete(keys.thumbnail)]);
  if (results.some((r) => r.status === 'rejected')) log.error({ requestId, keys }, 'could not remove the files of a failed upload');
}

/** The exam's images and DICOM objects, oldest first. */
export async function listAttachments(examId: number): Promise<AttachmentDto[]> {
  const exam = await Exam.findByPk(examId, { attributes: ['id'] });
  if (!exam) throw notFound('The exam');
  const [rows, { timeZone }] = await Promise.all([
    Attachment.findAll({
      where: { examId },
      include: [{ model: User, as: 'uploader', attributes: ['id', 'displayName'] }],
      order: [['createdAt', 'ASC'], ['id', 'ASC']],
    }),
    clinicProfile(),
  ]);
  return rows.map((r) => dto(r, timeZone));
}

async function toDto(row: Attachment): Promise<AttachmentDto> {
  const [uploader, { timeZone }] = await Promise.all([row.uploadedBy ? User.findByPk(row.uploadedBy, { attributes: ['id', 'displayName'] }) : null, clinicProfile()]);
  return dto(Object.assign(row, { uploader }), timeZone);
}

function dto(r: Attachment & { uploader?: User | null }, timeZone: string): AttachmentDto {
  return {
    id: r.id,
    examId: r.examId,
    kind: r.kind,
    source: r.source,
    originalName: r.originalName,
    contentType: r.contentType,
    sizeBytes: r.sizeBytes,
    sha256: r.sha256,
    createdAt: r.createdAt.toISOString(),
    createdLabel: formatInstant(r.createdAt, timeZone),
    uploadedBy: r.uploader?.displayName ?? null,
    fileUrl: `/api/attachments/${r.id}/file`,
    thumbnailUrl: r.thumbnailKey ? `/api/attachments/${r.id}/thumbnail` : null,
    dicom:
      r.kind === 'dicom'
        ? {
            modality: r.modality,
            sopClassUid: r.sopClassUid,
            sopClassName: r.sopClassUid ? (SOP_CLASS_NAMES[r.sopClassUid] ?? null) : null,
            acquiredAt: r.acquiredAt?.toISOString() ?? null,
            acquiredLabel: r.acquiredAt ? formatInstant(r.acquiredAt, timeZone) : null,
            rows: r.imageRows,
            columns: r.imageColumns,
            frames: r.frameCount,
            transferSyntaxUid: r.transferSyntaxUid,
            transferSyntaxName: r.transferSyntaxUid ? (TRANSFER_SYNTAX_NAMES[r.transferSyntaxUid] ?? r.transferSyntaxUid) : null,
            pixelRoute: r.imageRows ? pixelRoute(r.transferSyntaxUid) : 'unsupported',
          }
        : null,
  };
}

/** The stored bytes of an attachment, or of its thumbnail. */
export async function openAttachment(id: number, part: 'file' | 'thumbnail', requestId: string): Promise<Sendable> {
  const row = await Attachment.findByPk(id);
  if (!row) throw notFound('The image');
  const key = part === 'file' ? row.storageKey : row.thumbnailKey;
  if (!key) throw notFound('A thumbnail of this image');
  const store = fileStore();
  try {
    const { body, sizeBytes } = store.stream ? await store.stream(key) : await bufferStream(await store.get(key));
    const base = row.originalName.replace(/\.[^.]*$/, '');
    return {
      body,
      sizeBytes,
      contentType: part === 'file' ? row.contentType : THUMBNAIL_CONTENT_TYPE,
      fileName: part === 'file' ? row.originalName : `${base}-thumbnail.jpg`,
      etag: `"${part === 'file' ? row.sha256 : `${row.sha256}-t`}"`,
    };
  } catch (error) {
    if (!(error instanceof FileNotFound)) throw error;
    log.error({ requestId, attachmentId: row.id, part }, 'stored file missing for an attachment');
    throw notFound('The stored file of this image');
  }
}

async function bufferStream(bytes: Buffer): Promise<{ body: ReadableStream<Uint8Array>; sizeBytes: number }> {
  return { body: new Blob([new Uint8Array(bytes)]).stream(), sizeBytes: bytes.length };
}

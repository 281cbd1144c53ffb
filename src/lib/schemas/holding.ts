import { z } from 'zod';
import type { ExamStatus } from '../exam-status';
import { ACCESSION_PATTERN } from '../identifiers';

/** Attaching a held object to an exam; `confirmMismatch` is the second, explicit "attach anyway". */
export const attachHeldSchema = z.object({
  examId: z.number({ error: 'Choose an exam.' }).int('Choose an exam.').positive('Choose an exam.'),
  confirmMismatch: z.boolean().default(false),
});
export type AttachHeldInput = z.infer<typeof attachHeldSchema>;

/** Discarding a held object, with the reason kept in the audit trail. */
export const discardHeldSchema = z.object({
  reason: z
    .string({ error: 'Say why it is discarded.' })
    .trim()
    .min(3, 'Say why it is discarded (at least 3 characters).')
    .max(200, 'Keep the reason under 200 characters.'),
});
export type DiscardHeldInput = z.infer<typeof discardHeldSchema>;

/** Looking up an exam by the accession number someone typed, e.g. "a2612020007" → "A2612020007". */
export const candidateQuerySchema = z.object({
  accession: z.string().trim().toUpperCase().regex(ACCESSION_PATTERN, 'An accession number looks like A2612020007.'),
});
export type CandidateQuery = z.infer<typeof candidateQuerySchema>;

/** Why an exam is offered for a held object. */
export type CandidateReason = 'accession' | 'study-uid' | 'patient-day' | 'typed';

/** An exam a held object may belong to. */
export interface HeldCandidate {
  examId: number;
  accessionNumber: string;
  mrn: string;
  patientName: string;
  examType: string;
  /** e.g. "Thu 3 Dec 2026 at 09:15", in the clinic's time zone. */
  scheduledLabel: string;
  status: ExamStatus;
  statusLabel: string;
  reason: CandidateReason;
  /** The exam is open for images (the patient has arrived, or it is being or was scanned). */
  takesImages: boolean;
  /** The file's Patient ID and accession (or Study Instance UID) are this exam's. */
  identityMatches: boolean;
}

/**
 * One DICOM object a scanner sent that matched no exam, as the holding list shows it: the
 * identifiers read from the file (codes, never the patient's name) and where it came from.
 */
export interface HeldObject {
  id: number;
  receivedAt: string;
  /** e.g. "Thu 3 Dec 2026 at 09:15", in the clinic's time zone. */
  receivedLabel: string;
  receivedFrom: string | null;
  heldReason: string | null;
  patientId: string | null;
  accessionNumber: string | null;
  studyInstanceUid: string | null;
  sopClassName: string | null;
  modality: string | null;
  acquiredLabel: string | null;
  thumbnailUrl: string | null;
  candidates: HeldCandidate[];
}

export interface HeldList {
  rows: HeldObject[];
  /** All held objects, also those past the first page. */
  total: number;
}

/** What an attach answers: the exam the object now belongs to. */
export interface AttachHeldAnswer {
  attachmentId: number;
  examId: number;
  accessionNumber: string;
  mismatchConfirmed: boolean;
}

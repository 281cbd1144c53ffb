/**
 * Whether a DICOM object belongs to an exam. Images filed under the wrong patient are a safety
 * problem, so both identifiers must agree:
 *
 * - Patient ID (0010,0020) must equal the patient's MRN, and
 * - Accession Number (0008,0050) must equal the exam's accession number. When the file has no
 *   accession number at all, its Study Instance UID (0020,000D) must equal the exam's instead:
 *   that UID is generated for this one exam at booking and reaches the scanner through the
 *   worklist, so it identifies the exam at least as well as the accession number does.
 *
 * Values are compared exactly after DICOM's padding is trimmed (they are codes, not names).
 */

export interface ExamIdentity {
  mrn: string;
  accessionNumber: string;
  studyInstanceUid: string;
}

export interface FileIdentity {
  patientId: string;
  accessionNumber: string;
  studyInstanceUid: string;
}

export type MatchResult = { ok: true; by: 'accession' | 'study-uid' } | { ok: false; message: string };

/** Decides whether the file belongs to the exam; a refusal carries the message for staff. */
export function matchToExam(file: FileIdentity, exam: ExamIdentity): MatchResult {
  const patientOk = file.patientId !== '' && file.patientId === exam.mrn;
  if (file.accessionNumber !== '') {
    if (patientOk && file.accessionNumber === exam.accessionNumber) return { ok: true, by: 'accession' };
  } else if (patientOk && file.studyInstanceUid !== '' && file.studyInstanceUid === exam.studyInstanceUid) {
    return { ok: true, by: 'study-uid' };
  }
  return { ok: false, message: mismatchMessage(file, exam) };
}

/**
 * The refusal, naming the file's values and the exam's, e.g. "This file is for patient ID
 * P0000099 and accession A2612010004, but this exam is P0000012 / A2612010007. Nothing was stored."
 */
export function mismatchMessage(file: FileIdentity, exam: ExamIdentity, tail = 'Nothing was stored.'): string {
  const patient = file.patientId || '(none)';
  const end = tail ? ` ${tail}` : '';
  if (file.accessionNumber !== '') {
    return `This file is for patient ID ${patient} and accession ${file.accessionNumber}, but this exam is ${exam.mrn} / ${exam.accessionNumber}.${end}`;
  }
  return `This file is for patient ID ${patient} with no accession number and Study Instance UID ${file.studyInstanceUid || '(none)'}, but this exam is ${exam.mrn} / ${exam.accessionNumber} (Study Instance UID ${exam.studyInstanceUid}).${end}`;
}

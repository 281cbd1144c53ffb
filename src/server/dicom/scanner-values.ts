import type { Transaction } from 'sequelize';
import { Attachment, Exam, ExamType, ScannerValue } from '../../db/models';
import { mapMeasurements } from '../../lib/dicom/measurement-map';
import { readSrMeasurements } from '../../lib/dicom/sr-measurements';
import { log } from '../log';
import { fileStore } from '../storage';

/** Structured report storage classes (PS3.4 B.5: …88.11 Basic Text SR up to …88.35 Extensible SR). */
export const isStructuredReport = (sopClassUid: string | null): boolean => Boolean(sopClassUid?.startsWith('1.2.840.10008.5.1.4.1.1.88.'));

/**
 * Reads the numeric measurements of a structured report filed on an exam, maps them to the
 * fields of the exam's template through the one mapping table (with unit conversion), and
 * offers each to the sonographer. Nothing is written into the report: a person accepts or
 * rejects each value in the form, and an imported value never replaces a typed one. Runs in the
 * caller's transaction (the object being filed or attached); returns how many were offered.
 * An SR whose content cannot be read is kept as filed, with nothing offered (logged).
 */
export async function offerScannerValues(attachment: Attachment, transaction: Transaction, bytes?: Uint8Array): Promise<number> {
  if (attachment.examId == null || !isStructuredReport(attachment.sopClassUid)) return 0;
  const exam = await Exam.findByPk(attachment.examId, { transaction, include: [{ model: ExamType, as: 'examType', attributes: ['templateId'] }] });
  const templateId = (exam as (Exam & { examType?: ExamType }) | null)?.examType?.templateId;
  if (!templateId) return 0;
  let mapped: ReturnType<typeof mapMeasurements>['mapped'];
  try {
    const content = bytes ?? (await fileStore().get(attachment.storageKey));
    ({ mapped } = mapMeasurements(readSrMeasurements(content), templateId));
  } catch (error) {
    log.warn({ attachmentId: attachment.id, err: { name: (error as Error)?.name } }, 'structured report content could not be read; nothing offered');
    return 0;
  }
  if (mapped.length === 0) return 0;
  await ScannerValue.bulkCreate(
    mapped.map((m) => ({
      examId: attachment.examId!,
      attachmentId: attachment.id,
      fieldCode: m.fieldCode,
      value: m.value,
      concept: `${m.concept.scheme}:${m.concept.code}`.slice(0, 80),
      conceptMeaning: m.concept.meaning.slice(0, 120),
      sourceValue: String(m.sourceValue).slice(0, 40),
      sourceUnit: m.sourceUnit.slice(0, 40),
    })),
    { transaction, ignoreDuplicates: true },
  );
  return mapped.length;
}

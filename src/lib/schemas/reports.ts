import { z } from 'zod';
import type { EvaluationSuccess } from '../clinical';
import type { ProbeKind } from '../exam-status';
import type { ReportStatus } from '../report-status';
import { measurementsSchema, noduleSchema } from './clinical';

/** An autosave of the sonographer's entries; `version` is the one the form last saw. */
export const saveDraftSchema = z.object({
  version: z.number().int().min(0),
  measurements: measurementsSchema,
  nodules: z.array(noduleSchema).max(10, 'At most 10 nodules.'),
  heightCm: z.number().nullable(),
  weightKg: z.number().nullable(),
  probeId: z.number().int().positive().nullable(),
});
export type SaveDraftInput = z.infer<typeof saveDraftSchema>;

export const versionOnlySchema = z.object({ version: z.number().int().min(0) });

/** The reading physician's text: HTML from the editor, sanitized by the server before it is stored. */
const reportHtml = z.string().max(40_000, 'This text is too long (at most about 40,000 characters).');
export const readingSchema = z.object({ version: z.number().int().min(0), findingsHtml: reportHtml, impressionHtml: reportHtml });
export type ReadingInput = z.infer<typeof readingSchema>;

export const claimSchema = z.object({ takeOver: z.boolean().default(false) });

/** Signing asks for the physician's password again. */
export const signSchema = z.object({ version: z.number().int().min(0), password: z.string().min(1, 'Enter your password to sign.').max(200) });

/** What the server keeps of an evaluation (the engine's answer minus its echo of the inputs). */
export type StoredEvaluation = Pick<EvaluationSuccess, 'derived' | 'flags' | 'findings' | 'assessments' | 'urgentPrompts' | 'algorithms' | 'patient' | 'options' | 'cautions'>;

/** What is stored of an engine answer: the server's saves and the demo seed keep the same parts. */
export const storedEvaluation = (e: EvaluationSuccess): StoredEvaluation => ({
  derived: e.derived,
  flags: e.flags,
  findings: e.findings,
  assessments: e.assessments,
  urgentPrompts: e.urgentPrompts,
  algorithms: e.algorithms,
  patient: e.patient,
  options: e.options,
  cautions: e.cautions,
});

/** How many values are flagged low or high (the reading queue's count). */
export const abnormalCount = (e: Pick<EvaluationSuccess, 'flags'>): number => e.flags.filter((f) => f.status === 'low' || f.status === 'high').length;

/** A report as the form and the reading screens see it. */
export interface ReportDto {
  id: number;
  examId: number;
  status: ReportStatus;
  version: number;
  templateId: 'thyroid' | 'abdomen' | 'echo';
  templateVersion: string;
  referenceSetVersion: string;
  measurements: Record<string, number | string>;
  nodules: z.infer<typeof noduleSchema>[];
  heightCm: number | null;
  weightKg: number | null;
  probeId: number | null;
  probeKind: ProbeKind | null;
  evaluation: StoredEvaluation | null;
  findingsText: string | null;
  abnormalCount: number;
  updatedAt: string;
  updatedBy: string | null;
  submittedAt: string | null;
  /** The physician's text (sanitized HTML); null until the reading starts. */
  findingsHtml: string | null;
  impressionHtml: string | null;
  claimedBy: { id: number; name: string } | null;
  claimedAt: string | null;
  signedBy: string | null;
  signedAt: string | null;
  signedHash: string | null;
}

/**
 * The answer to an autosave: what was stored, without echoing the entries and evaluation back
 * (the form computed the same values itself; the report's GET has the stored copy).
 */
export type DraftSavedDto = Pick<ReportDto, 'id' | 'examId' | 'status' | 'version' | 'templateVersion' | 'referenceSetVersion' | 'abnormalCount' | 'updatedAt' | 'updatedBy'>;

/** The exam facts a report form needs (patient factors come from the exam, not the form). */
export interface ReportContext {
  examId: number;
  examVersion: number;
  examStatus: import('../exam-status').ExamStatus;
  accessionNumber: string;
  examTypeName: string;
  indication: string;
  patient: { name: string; mrn: string; sex: import('../exam-status').Sex; birthDate: string; ageYears: number };
  examDate: string;
  when: string;
  room: string;
  sonographer: string;
  probes: Array<{ id: number; kind: ProbeKind; label: string; frequencyMhz: string }>;
}

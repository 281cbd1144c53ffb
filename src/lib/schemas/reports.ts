import { z } from 'zod';
import { flagMessage, type EvaluationSuccess, type Flag, type ReferenceRange } from '../clinical';
import type { ProbeKind } from '../exam-status';
import type { ReportStatus } from '../report-status';
import { measurementsSchema, noduleSchema } from './clinical';

/** Where a value came from when no person typed it: a scanner's structured report, or calipers on an image. */
export const MEASUREMENT_SOURCES = ['scanner', 'image'] as const;
export type MeasurementSource = (typeof MEASUREMENT_SOURCES)[number];
export const MEASUREMENT_SOURCE_LABELS: Record<MeasurementSource, string> = { scanner: 'from the scanner', image: 'measured on the image' };
export const measurementSourcesSchema = z
  .record(z.string().min(1).max(60), z.enum(MEASUREMENT_SOURCES))
  .refine((m) => Object.keys(m).length <= 200, 'Too many entries.');
export type MeasurementSources = z.infer<typeof measurementSourcesSchema>;

/** An autosave of the sonographer's entries; `version` is the one the form last saw. */
export const saveDraftSchema = z.object({
  version: z.number().int().min(0),
  measurements: measurementsSchema,
  /** Provenance of values the form took from the scanner or the calipers; typing over one drops it. */
  measurementSources: measurementSourcesSchema.default({}),
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

/** Signing (a report or an addendum) asks for the physician's password again. */
const signerPassword = z.string().min(1, 'Enter your password to sign.').max(200);
export const signSchema = z.object({ version: z.number().int().min(0), password: signerPassword });

/** An addendum to a signed report: its text, and the physician's password again (signed the same way as the report). */
export const addendumSchema = z.object({
  version: z.number().int().min(0),
  bodyHtml: reportHtml,
  password: signerPassword,
});
export type AddendumInput = z.infer<typeof addendumSchema>;

export const COMMUNICATION_METHODS = ['telephone', 'in-person', 'video-call', 'secure-message'] as const;
export type CommunicationMethod = (typeof COMMUNICATION_METHODS)[number];
export const COMMUNICATION_METHOD_LABELS: Record<CommunicationMethod, string> = {
  telephone: 'by telephone',
  'in-person': 'in person',
  'video-call': 'by video call',
  'secure-message': 'by secure message',
};

/**
 * An urgent finding told directly to a clinician: what, to whom, how, when (clinic time,
 * "YYYY-MM-DDTHH:mm" as a datetime field gives it) and whether they read it back.
 */
export const communicationSchema = z.object({
  ruleId: z.string().max(60).regex(/^[a-z0-9-]+$/).nullable().default(null),
  finding: z.string().trim().min(3, 'Say which finding was communicated.').max(500, 'At most 500 characters.'),
  recipientName: z.string().trim().min(2, 'Who was told?').max(200),
  recipientRole: z.string().trim().max(120).nullable().default(null).transform((v) => (v === '' ? null : v)),
  method: z.enum(COMMUNICATION_METHODS, { message: 'Choose how it was communicated.' }),
  communicatedAt: z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/, 'Give the date and time it was communicated.'),
  readBack: z.boolean(),
});
export type CommunicationInput = z.output<typeof communicationSchema>;

export interface AddendumDto {
  id: number;
  bodyHtml: string;
  signedBy: string;
  signedAt: string;
  signedHash: string;
}

export interface CommunicationDto {
  id: number;
  ruleId: string | null;
  finding: string;
  recipientName: string;
  recipientRole: string | null;
  method: CommunicationMethod;
  communicatedAt: string;
  readBack: boolean;
  recordedBy: string;
  recordedAt: string;
}

/** What a report carries of an evaluation (the engine's answer minus its echo of the inputs). */
export type ReportEvaluation = Pick<EvaluationSuccess, 'derived' | 'flags' | 'findings' | 'assessments' | 'urgentPrompts' | 'algorithms' | 'patient' | 'options' | 'cautions'>;

/**
 * A flag as stored. One judged against a reference row leaves out what that row and its own parts
 * say again: the row's citation (source, provenance, set version, found again by its id in the
 * set the report names) and the sentence (made again by `flagMessage`). Those were two thirds of
 * every save's JSON. A flag with no row (e.g. no range for the patient's age) is kept whole.
 * Reports saved before this keep whole flags; both read the same.
 */
export type StoredFlag = Omit<Flag, 'source' | 'provenance' | 'referenceSetVersion' | 'message'> & Partial<Pick<Flag, 'source' | 'provenance' | 'referenceSetVersion' | 'message'>>;

/** What the database keeps of an evaluation: a ReportEvaluation with stored flags. */
export type StoredEvaluation = Omit<ReportEvaluation, 'flags'> & { flags: StoredFlag[] };

function storedFlag(f: Flag): StoredFlag {
  if (f.referenceId === null) return f;
  const { source: _source, provenance: _provenance, referenceSetVersion: _set, message: _message, ...kept } = f;
  return kept;
}

/** What is stored of an engine answer: the server's saves and the demo seed keep the same parts. */
export const storedEvaluation = (e: EvaluationSuccess): StoredEvaluation => ({
  derived: e.derived,
  flags: e.flags.map(storedFlag),
  findings: e.findings,
  assessments: e.assessments,
  urgentPrompts: e.urgentPrompts,
  algorithms: e.algorithms,
  patient: e.patient,
  options: e.options,
  cautions: e.cautions,
});

/**
 * A stored evaluation as readers see it: each flag's citation from the rows of the report's
 * reference set and its sentence made again, exactly as the engine wrote them.
 */
export function readEvaluation(e: StoredEvaluation, references: readonly Pick<ReferenceRange, 'id' | 'source' | 'provenance' | 'referenceSet'>[]): ReportEvaluation {
  const byId = new Map(references.map((r) => [r.id, r]));
  const flags = e.flags.map((f): Flag => {
    // Stored whole: a flag with no reference row, or one saved before flags were stored lean.
    if (f.message !== undefined) return f as Flag;
    // A row missing from the set cannot happen for a report saved by this code (sets never change once stored).
    const row = f.referenceId === null ? undefined : byId.get(f.referenceId);
    const source = row?.source ?? 'reference row not found';
    return {
      ...f,
      source,
      provenance: row?.provenance ?? null,
      referenceSetVersion: row?.referenceSet ?? null,
      message: f.range === null ? `${f.label} ${f.display}` : flagMessage({ ...f, range: f.range, source }),
    };
  });
  return { ...e, flags };
}

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
  /** Where values came from when no person typed them (scanner report, calipers), by field code. */
  measurementSources: MeasurementSources;
  nodules: z.infer<typeof noduleSchema>[];
  heightCm: number | null;
  weightKg: number | null;
  probeId: number | null;
  probeKind: ProbeKind | null;
  evaluation: ReportEvaluation | null;
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
  /** Signed addenda, oldest first (empty before signing). */
  addenda: AddendumDto[];
  /** Urgent findings communicated directly, oldest first. */
  communications: CommunicationDto[];
}

/**
 * The answer to an autosave: what was stored, without echoing the entries and evaluation back
 * (the form computed the same values itself; the report's GET has the stored copy).
 */
export type DraftSavedDto = Pick<ReportDto, 'id' | 'examId' | 'status' | 'version' | 'templateVersion' | 'referenceSetVersion' | 'abnormalCount' | 'updatedAt' | 'updatedBy'>;

/** The answer to a signature (report or addendum): what was signed, not the whole report again (the page reloads). */
export type SignedDto = Pick<ReportDto, 'id' | 'examId' | 'status' | 'version' | 'signedBy' | 'signedAt' | 'signedHash' | 'updatedAt'>;

/** The exam facts a report form needs (patient factors come from the exam, not the form). */
export interface ReportContext {
  examId: number;
  examVersion: number;
  examStatus: import('../exam-status').ExamStatus;
  accessionNumber: string;
  examTypeName: string;
  indication: string;
  /** Who referred (name), where the page needs it. */
  referrer?: string | null;
  patient: { name: string; mrn: string; sex: import('../exam-status').Sex; birthDate: string; ageYears: number };
  examDate: string;
  when: string;
  room: string;
  sonographer: string;
  probes: Array<{ id: number; kind: ProbeKind; label: string; frequencyMhz: string }>;
}

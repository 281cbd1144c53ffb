import type { PriorExamInput, ProbeKind, UrgentRuleId } from '../clinical';
import type { ReportContext, ReportDto } from '../schemas/reports';

/** What the form island needs of the report (the stored evaluation stays on the server). */
export type FormReport = Pick<ReportDto, 'id' | 'version' | 'templateId' | 'measurements' | 'measurementSources' | 'nodules' | 'heightCm' | 'weightKg' | 'probeId' | 'updatedAt' | 'updatedBy'>;

/** What the form island needs of the exam: patient factors it may not edit, and the room's probes. */
export interface FormContext {
  examId: number;
  patient: Pick<ReportContext['patient'], 'sex' | 'birthDate' | 'ageYears'>;
  examDate: string;
  probes: Array<{ id: number; kind: ProbeKind; label: string; frequencyMhz: string }>;
  /** The latest signed prior exam of this template (growth since then), as the server evaluates with it. */
  prior?: PriorExamInput | null;
  /** Urgent-finding rules the clinic switched off (Clinic settings). */
  disabledUrgentRules?: UrgentRuleId[];
}

/** Trim the page's report to the island's props. */
export function formReport(r: ReportDto): FormReport {
  return { id: r.id, version: r.version, templateId: r.templateId, measurements: r.measurements, measurementSources: r.measurementSources, nodules: r.nodules, heightCm: r.heightCm, weightKg: r.weightKg, probeId: r.probeId, updatedAt: r.updatedAt, updatedBy: r.updatedBy };
}

/** Trim the page's context to the island's props (no name or MRN in the island's data). */
export function formContext(c: ReportContext, prior: PriorExamInput | null = null, disabledUrgentRules: UrgentRuleId[] = []): FormContext {
  return { examId: c.examId, patient: { sex: c.patient.sex, birthDate: c.patient.birthDate, ageYears: c.patient.ageYears }, examDate: c.examDate, probes: c.probes, prior: prior !== null && prior.examDate < c.examDate ? prior : null, disabledUrgentRules };
}

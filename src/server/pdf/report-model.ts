import { CAUTION_TEXT } from '../../lib/caution';
import { BSA_METHOD_LABELS, formatNumber, formatQuantity, type Flag, type TemplateDef } from '../../lib/clinical';
import {
  derivedMethodText,
  entryText,
  flagSourceText,
  flagStatusText,
  flagTone,
  modesUsed,
  noduleActionText,
  probeText,
  tiradsLevelText,
  type FlagTone,
} from '../../lib/report-form/display';
import { communicationStatement } from '../../lib/report-text/communication';
import { findingsToHtml } from '../../lib/report-text/findings-html';
import type { ClinicProfile } from '../../lib/schemas/clinic';
import type { ReportContext, ReportDto } from '../../lib/schemas/reports';
import { formatInstant } from '../../lib/time';
import { htmlToBlocks, type RichBlock } from './html-runs';

/**
 * The final report as plain data, ready to lay out: every word and number is decided here, from
 * the stored report, its exam and template, with the same wording helpers as the report page
 * (src/lib/report-form/display.ts). Pure: no database, no PDF library, so tests and the bench
 * build it from fixed data.
 */

export type PdfReport = ReportDto;

export interface ReportPdfInput {
  report: PdfReport;
  context: ReportContext;
  template: TemplateDef;
  clinic: Pick<ClinicProfile, 'name' | 'addressLines' | 'phone' | 'email'>;
  timeZone: string;
  /** What the report page does not show: the exam's start instant (ISO) and who referred. */
  exam: { startsAt: string; referrer: { name: string; practice: string | null } | null };
}

export interface PdfField {
  label: string;
  value: string;
}

export interface PdfMeasurementRow {
  label: string;
  /** A second, smaller line under the label (how a value was calculated). */
  note: string | null;
  value: string;
  result: { text: string; tone: FlagTone } | null;
  reference: string | null;
  /** Why the limits were adjusted for this patient (e.g. an age allowance). */
  referenceNote: string | null;
  /** 1-based number in `sources`. */
  source: number | null;
}

export interface PdfNoduleRow {
  id: string;
  location: string;
  sizeMm: string;
  points: string;
  level: string;
  recommendation: string;
  note: string | null;
}

export interface PdfAddendum {
  heading: string;
  body: RichBlock[];
  fingerprint: string;
}

export interface ReportPdfModel {
  documentTitle: string;
  clinic: { name: string; addressLines: string[]; contact: string[] };
  title: string;
  statusLabel: string;
  accessionNumber: string;
  patient: PdfField[];
  exam: PdfField[];
  indication: string;
  technique: PdfField[];
  measurementGroups: Array<{ title: string; rows: PdfMeasurementRow[] }>;
  sources: string[];
  /** null: the template has no nodules; []: none recorded. */
  nodules: PdfNoduleRow[] | null;
  findings: RichBlock[];
  impression: RichBlock[];
  /** One statement per urgent finding communicated directly (empty: none). */
  urgentStatement: string[];
  signature: { statement: string; fingerprint: string | null };
  addenda: PdfAddendum[];
  caution: string;
  /** Top line of every page after the first, so a loose page still names its patient. */
  runningHeader: string;
  footer: string;
}

const SEX = { female: 'Female', male: 'Male', other: 'Other', unknown: 'Not recorded' } as const;
const RANGE_FOR = { male: 'men', female: 'women', any: 'all adults' } as const;
const LOBE: Readonly<Record<string, string>> = { right: 'Right lobe', left: 'Left lobe', isthmus: 'Isthmus' };

const zoneNames = new Map<string, Intl.DateTimeFormat>();

/** An instant as the clinic reads it, with its zone, e.g. "Thu 3 Dec 2026 at 09:15 CST". */
export function clinicTime(iso: string, timeZone: string): string {
  const instant = new Date(iso);
  let fmt = zoneNames.get(timeZone);
  if (!fmt) {
    fmt = new Intl.DateTimeFormat('en-US', { timeZone, timeZoneName: 'short' });
    zoneNames.set(timeZone, fmt);
  }
  const zone = fmt.formatToParts(instant).find((p) => p.type === 'timeZoneName')?.value;
  return `${formatInstant(instant, timeZone)}${zone ? ` ${zone}` : ''}`;
}

function flagCells(f: Flag, sourceNumber: (text: string) => number): Pick<PdfMeasurementRow, 'result' | 'reference' | 'referenceNote' | 'source'> {
  const source = flagSourceText(f);
  return {
    result: { text: flagStatusText(f), tone: flagTone(f) },
    reference: f.range === null ? null : `${f.range.text} (${RANGE_FOR[f.range.sex]})`,
    referenceNote: f.adjustment,
    source: source === null ? null : sourceNumber(source),
  };
}

/**
 * Entered values by template section, then calculated values, each with its reference check
 * when it has one; sources are numbered in order of first use.
 */
function measurementTable(report: PdfReport, template: TemplateDef): Pick<ReportPdfModel, 'measurementGroups' | 'sources'> {
  const e = report.evaluation;
  const sources: string[] = [];
  const sourceNumber = (text: string) => {
    const at = sources.indexOf(text);
    return at >= 0 ? at + 1 : sources.push(text);
  };
  const flagsOf = new Map<string, Flag[]>();
  for (const f of e?.flags ?? []) flagsOf.set(f.valueCode, [...(flagsOf.get(f.valueCode) ?? []), f]);
  const shown = new Set<Flag>();
  const rows = (code: string, label: string, note: string | null, value: string): PdfMeasurementRow[] => {
    const flags = flagsOf.get(code) ?? [];
    if (flags.length === 0) return [{ label, note, value, result: null, reference: null, referenceNote: null, source: null }];
    // A value checked against more than one reference gets one line per check.
    return flags.map((f, i) => {
      shown.add(f);
      return { label: i === 0 ? label : '', note: i === 0 ? note : null, value: i === 0 ? value : '', ...flagCells(f, sourceNumber) };
    });
  };

  const groups = template.sections.map((s) => ({
    title: s.title,
    // As on the report page: blank fields are left out, "not done" and "not measurable" shown.
    rows: s.fields.filter((f) => report.measurements[f.code] !== undefined).flatMap((f) => rows(f.code, f.label, null, entryText(f, report.measurements[f.code]))),
  }));
  groups.push({ title: 'Calculated values', rows: (e?.derived ?? []).flatMap((d) => rows(d.code, d.label, derivedMethodText(d) || null, d.display)) });
  const others = (e?.flags ?? []).filter((f) => !shown.has(f));
  groups.push({ title: 'Other reference checks', rows: others.map((f) => ({ label: f.label, note: null, value: f.display, ...flagCells(f, sourceNumber) })) });
  return { measurementGroups: groups.filter((g) => g.rows.length > 0), sources };
}

function noduleRows(report: PdfReport, template: TemplateDef): PdfNoduleRow[] | null {
  if (template.nodules === null) return null;
  return (report.evaluation?.assessments.nodules ?? []).map((a) => {
    const n = report.nodules[a.index];
    return {
      id: a.id,
      location: n ? [LOBE[n.lobe] ?? n.lobe, n.zone].filter(Boolean).join(', ') : '',
      sizeMm: n ? [n.lengthMm, n.widthMm, n.depthMm].map((v) => formatNumber(v, 1)).join(' × ') : '',
      points: String(a.points),
      level: tiradsLevelText(a),
      recommendation: noduleActionText(a),
      note: [a.biopsySelected ? 'Selected for FNA' : null, a.reported ? null : 'Not described individually'].filter(Boolean).join('; ') || null,
    };
  });
}

function technique(report: PdfReport, template: TemplateDef, context: ReportContext): PdfField[] {
  const e = report.evaluation;
  const probe = context.probes.find((p) => p.id === report.probeId) ?? null;
  const modes = modesUsed(template, report.measurements);
  const fields: PdfField[] = [
    { label: 'Probe', value: probeText(report.probeKind, probe) },
    { label: 'Imaging modes', value: modes.length > 0 ? modes.join(', ') : 'None recorded' },
  ];
  if (report.heightCm !== null || report.weightKg !== null) {
    const bsa = e?.patient.bsa ? `; BSA ${formatQuantity(e.patient.bsa.valueM2, 'm2', 2)} (${BSA_METHOD_LABELS[e.patient.bsa.method]})` : '';
    const size = [report.heightCm !== null ? `${report.heightCm} cm` : 'height not recorded', report.weightKg !== null ? `${report.weightKg} kg` : 'weight not recorded'];
    fields.push({ label: 'Height, weight', value: `${size.join(', ')}${bsa}` });
  }
  const algorithms = e ? Object.values(e.algorithms).filter((a): a is string => a !== null) : [];
  if (algorithms.length > 0) fields.push({ label: 'Algorithms', value: algorithms.join('; ') });
  fields.push({ label: 'Template', value: `${template.title}, version ${report.templateVersion}; reference set ${report.referenceSetVersion}` });
  return fields;
}

/**
 * The printable report, e.g. buildReportPdfModel({ report, context, template, clinic, timeZone, exam }).
 * Only a signed report has one: it throws for a report without a signature.
 */
export function buildReportPdfModel(input: ReportPdfInput): ReportPdfModel {
  const { report, context: c, template, clinic, timeZone, exam } = input;
  if (report.signedAt === null) throw new Error('Only a signed report is printed.');
  const statusLabel = report.status === 'amended' ? 'Amended report' : 'Final report';
  const referrer = exam.referrer ? [exam.referrer.name, exam.referrer.practice].filter(Boolean).join(', ') : 'Not recorded';
  const signer = report.signedBy ?? 'a reading physician';
  return {
    documentTitle: `${c.examTypeName}, ${statusLabel.toLowerCase()} (${c.accessionNumber})`,
    clinic: { name: clinic.name, addressLines: [...clinic.addressLines], contact: [clinic.phone, clinic.email].filter(Boolean) },
    title: c.examTypeName,
    statusLabel,
    accessionNumber: c.accessionNumber,
    patient: [
      { label: 'Name', value: c.patient.name },
      { label: 'MRN', value: c.patient.mrn },
      { label: 'Date of birth', value: c.patient.birthDate },
      { label: 'Sex', value: SEX[c.patient.sex] },
      { label: 'Age at exam', value: `${c.patient.ageYears} years` },
    ],
    exam: [
      { label: 'Accession', value: c.accessionNumber },
      { label: 'Exam date', value: clinicTime(exam.startsAt, timeZone) },
      { label: 'Referred by', value: referrer },
      { label: 'Sonographer', value: c.sonographer },
    ],
    indication: c.indication,
    technique: technique(report, template, c),
    ...measurementTable(report, template),
    nodules: noduleRows(report, template),
    // Findings nobody edited were fixed at signing; the fallback only covers older rows.
    findings: htmlToBlocks(report.findingsHtml ?? findingsToHtml(report.findingsText)),
    impression: htmlToBlocks(report.impressionHtml ?? ''),
    urgentStatement: report.communications.map((x) => communicationStatement(x, timeZone)),
    signature: {
      statement: `Electronically signed by ${signer} on ${clinicTime(report.signedAt, timeZone)}.`,
      fingerprint: report.signedHash,
    },
    addenda: report.addenda.map((a, i) => ({
      heading: `Addendum ${i + 1}, signed by ${a.signedBy} on ${clinicTime(a.signedAt, timeZone)}`,
      body: htmlToBlocks(a.bodyHtml),
      fingerprint: `Content fingerprint (SHA-256): ${a.signedHash}`,
    })),
    caution: CAUTION_TEXT,
    runningHeader: `${c.patient.name} · MRN ${c.patient.mrn} · ${c.examTypeName} · ${statusLabel}`,
    footer: `${clinic.name} · Accession ${c.accessionNumber}`,
  };
}

import type { Faker } from '@faker-js/faker';
import type { Transaction } from 'sequelize';
import { createHash } from 'node:crypto';
import { Exam, Patient, Probe, Report } from '../src/db/models';
import { evaluate, getTemplate, REFERENCE_RANGES, REFERENCE_SET_VERSION, type NoduleInput, type PriorExamInput, type TemplateDef, type TemplateId } from '../src/lib/clinical';
import { findingsToHtml } from '../src/lib/report-text/findings-html';
import { abnormalCount, storedEvaluation } from '../src/lib/schemas/reports';
import { zonedDate } from '../src/lib/time';
import { signedContent } from '../src/server/services/reading';

/**
 * Reports for the demo clinic's exams: preliminary ones waiting in the reading queue, drafts
 * being scanned, and signed reports of earlier exams (a year or two back) so the reading
 * physician has priors to compare with: thyroid nodules that grew, an aorta that widened.
 * Invented values near each field's typical adult value; nothing here is a real patient's.
 */

export interface DemoEntries {
  measurements: Record<string, number | string>;
  nodules: NoduleInput[];
  heightCm: number | null;
  weightKg: number | null;
}

/** Entries for one exam: every field near its typical value (half of them when the scan is under way). */
export function demoEntries(faker: Faker, template: TemplateDef, opts: { partial: boolean }): DemoEntries {
  const measurements: Record<string, number | string> = {};
  for (const section of template.sections) {
    for (const f of section.fields) {
      if (opts.partial && faker.datatype.boolean(0.5)) continue; // a scan half done
      if (f.kind === 'choice') measurements[f.code] = f.options[0]!.value;
      else {
        const v = f.example * (1 + faker.number.float({ min: -0.18, max: 0.22 }));
        measurements[f.code] = Math.min(f.max, Math.max(f.min, Number(v.toFixed(f.decimals))));
      }
    }
  }
  const nodules: NoduleInput[] = [];
  if (template.nodules && !opts.partial) {
    const count = faker.helpers.weightedArrayElement([{ value: 0, weight: 4 }, { value: 1, weight: 4 }, { value: 2, weight: 2 }]);
    for (let i = 1; i <= count; i++) {
      const length = faker.number.float({ min: 7, max: 24, fractionDigits: 1 });
      nodules.push({
        id: `N${i}`,
        lobe: faker.helpers.arrayElement(['right', 'left'] as const),
        zone: faker.helpers.arrayElement(['upper', 'mid', 'lower'] as const),
        lengthMm: length,
        widthMm: Number((length * faker.number.float({ min: 0.6, max: 0.9 })).toFixed(1)),
        depthMm: Number((length * faker.number.float({ min: 0.5, max: 0.7 })).toFixed(1)),
        composition: faker.helpers.arrayElement(['solid', 'mixed', 'solid'] as const),
        echogenicity: faker.helpers.arrayElement(['hypoechoic', 'hyperechoic-or-isoechoic'] as const),
        shape: 'wider-than-tall',
        margin: 'smooth',
        foci: [faker.helpers.arrayElement(['none-or-comet-tail', 'none-or-comet-tail', 'punctate'] as const)],
      });
    }
  }
  const echo = template.id === 'echo';
  return { measurements, nodules, heightCm: echo ? faker.number.int({ min: 152, max: 192 }) : null, weightKg: echo ? faker.number.int({ min: 52, max: 108 }) : null };
}

/**
 * The same patient some years earlier: nodules smaller (a few grew significantly, most did not)
 * and the aorta a little narrower; the other values vary as measurements do.
 */
export function earlierEntries(faker: Faker, template: TemplateDef, later: DemoEntries, years: number): DemoEntries {
  const fresh = demoEntries(faker, template, { partial: false });
  const measurements = { ...fresh.measurements };
  if (typeof later.measurements.aortaDiameterCm === 'number') {
    measurements.aortaDiameterCm = Number(Math.max(1.2, later.measurements.aortaDiameterCm - years * faker.number.float({ min: 0.05, max: 0.35 })).toFixed(1));
  }
  const nodules = later.nodules.map((n) => {
    const shrink = 1 / (1 + years * faker.number.float({ min: 0.02, max: 0.2 }));
    return { ...n, lengthMm: Number((n.lengthMm * shrink).toFixed(1)), widthMm: Number((n.widthMm * shrink).toFixed(1)), depthMm: Number((n.depthMm * shrink).toFixed(1)) };
  });
  return { ...fresh, measurements, nodules };
}

/** A short impression for a signed demo report, from the engine's answer (the physician's words in real life). */
function demoImpression(result: { findings: string[]; flags: Array<{ status: string; label: string }> }): string {
  const abnormal = result.flags.filter((f) => f.status === 'low' || f.status === 'high').map((f) => f.label);
  const lines = abnormal.length ? [`Outside the reference range: ${abnormal.slice(0, 4).join(', ')}.`, 'Clinical correlation suggested.'] : ['No measured value outside its reference range.'];
  return `<ul>${lines.map((l) => `<li><p>${l}</p></li>`).join('')}</ul>`;
}

/**
 * A report for a seeded exam: a draft (exam in progress), preliminary (scanned, waiting for a
 * reading physician) or, with `signer`, final and signed as the app signs (hash of the content).
 */
export async function seedReport(
  faker: Faker,
  x: {
    exam: Exam;
    patient: Patient;
    templateId: string;
    timeZone: string;
    sonographerId: number;
    entries?: DemoEntries;
    prior?: PriorExamInput | null;
    signer?: { id: number; name: string };
    /** Hours from submission to signature; drawn at random when not given. */
    signAfterHours?: number;
  },
  transaction: Transaction,
): Promise<PriorExamInput | null> {
  const template = getTemplate(x.templateId as TemplateId);
  if (!template) return null;
  const draft = x.exam.status === 'in-progress';
  const entries = x.entries ?? demoEntries(faker, template, { partial: draft });
  const examDate = zonedDate(x.exam.scheduledStart, x.timeZone);
  const result = evaluate({
    templateId: template.id,
    measurements: entries.measurements,
    nodules: entries.nodules,
    patient: { sex: x.patient.sex, birthDate: x.patient.birthDate, examDate, heightCm: entries.heightCm, weightKg: entries.weightKg },
    prior: x.prior ?? null,
    referenceRanges: REFERENCE_RANGES,
  });
  if (!result.ok) return null;
  const probe = await Probe.findOne({ where: { scannerId: x.exam.scannerId, kind: template.defaultProbe }, transaction });
  const submittedAt = draft ? null : new Date(x.exam.scheduledEnd.getTime() + faker.number.int({ min: 5, max: 40 }) * 60_000);
  const report = await Report.create(
    {
      examId: x.exam.id,
      templateId: template.id,
      templateVersion: template.version,
      referenceSetVersion: REFERENCE_SET_VERSION,
      status: draft ? 'draft' : 'preliminary',
      measurements: entries.measurements,
      nodules: entries.nodules,
      heightCm: entries.heightCm,
      weightKg: entries.weightKg,
      probeId: probe?.id ?? null,
      probeKind: probe?.kind ?? template.defaultProbe,
      evaluation: storedEvaluation(result),
      findingsText: result.findings.join('\n'),
      impressionHtml: null,
      abnormalCount: abnormalCount(result),
      createdBy: x.sonographerId,
      updatedBy: x.sonographerId,
      submittedBy: draft ? null : x.sonographerId,
      submittedAt,
      version: draft ? 1 : 2,
      // Created by "Start scan", at the start of the exam.
      createdAt: x.exam.scheduledStart,
    },
    { transaction },
  );
  // The exam completes with its preliminary report, as "Submit preliminary" does.
  if (submittedAt) await x.exam.update({ completedAt: submittedAt }, { transaction, silent: true });
  if (x.signer && submittedAt) {
    const signedAt = new Date(submittedAt.getTime() + (x.signAfterHours ?? faker.number.int({ min: 2, max: 30 })) * 3_600_000);
    const findingsHtml = findingsToHtml(report.findingsText);
    const impressionHtml = demoImpression(result);
    const signedHash = createHash('sha256').update(signedContent({ report, findingsHtml, impressionHtml, signer: x.signer, signedAt })).digest('hex');
    await report.update(
      { status: 'final', findingsHtml, impressionHtml, claimedBy: x.signer.id, claimedAt: submittedAt, signedBy: x.signer.id, signedAt, signedHash, updatedBy: x.signer.id, version: 3 },
      { transaction, silent: true },
    );
  }
  return { examDate, measurements: entries.measurements, nodules: entries.nodules };
}

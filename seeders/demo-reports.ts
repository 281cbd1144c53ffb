import type { Faker } from '@faker-js/faker';
import type { Transaction } from 'sequelize';
import { Exam, Patient, Probe, Report } from '../src/db/models';
import { evaluate, getTemplate, REFERENCE_RANGES, REFERENCE_SET_VERSION, type TemplateId } from '../src/lib/clinical';
import { abnormalCount, storedEvaluation } from '../src/lib/schemas/reports';
import { zonedDate } from '../src/lib/time';

/**
 * A report for a seeded exam that has been scanned (preliminary, waiting in the reading queue)
 * or is being scanned (a draft): each template field near its typical adult value, so the demo
 * shows flags and findings. Invented values; nothing here is a real patient's.
 */
export async function seedReport(
  faker: Faker,
  x: { exam: Exam; patient: Patient; templateId: string; timeZone: string; sonographerId: number },
  transaction: Transaction,
): Promise<void> {
  const template = getTemplate(x.templateId as TemplateId);
  if (!template) return;
  const draft = x.exam.status === 'in-progress';
  const measurements: Record<string, number | string> = {};
  for (const section of template.sections) {
    for (const f of section.fields) {
      if (draft && faker.datatype.boolean(0.5)) continue; // a scan half done
      if (f.kind === 'choice') measurements[f.code] = f.options[0]!.value;
      else {
        const v = f.example * (1 + faker.number.float({ min: -0.18, max: 0.22 }));
        measurements[f.code] = Math.min(f.max, Math.max(f.min, Number(v.toFixed(f.decimals))));
      }
    }
  }
  const heightCm = template.id === 'echo' ? faker.number.int({ min: 152, max: 192 }) : null;
  const weightKg = template.id === 'echo' ? faker.number.int({ min: 52, max: 108 }) : null;
  const result = evaluate({
    templateId: template.id,
    measurements,
    patient: { sex: x.patient.sex, birthDate: x.patient.birthDate, examDate: zonedDate(x.exam.scheduledStart, x.timeZone), heightCm, weightKg },
    referenceRanges: REFERENCE_RANGES,
  });
  if (!result.ok) return;
  const probe = await Probe.findOne({ where: { scannerId: x.exam.scannerId, kind: template.defaultProbe }, transaction });
  const submittedAt = draft ? null : new Date(x.exam.scheduledEnd.getTime() + faker.number.int({ min: 5, max: 40 }) * 60_000);
  await Report.create(
    {
      examId: x.exam.id,
      templateId: template.id,
      templateVersion: template.version,
      referenceSetVersion: REFERENCE_SET_VERSION,
      status: draft ? 'draft' : 'preliminary',
      measurements,
      nodules: [],
      heightCm,
      weightKg,
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
    },
    { transaction },
  );
}

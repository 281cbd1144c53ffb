import { QueryTypes, type Transaction } from 'sequelize';
import { db } from '../../db/connection';
import { Exam, ExamType, Patient, Probe, Referrer, Report, ReportAddendum, ReportCommunication, Room, Scanner, User } from '../../db/models';
import { evaluate, getTemplate, missingRequired, REFERENCE_SET_VERSION, type EvaluationSuccess, type PriorExamInput, type ReferenceRange, type TemplateId, type UrgentRuleId } from '../../lib/clinical';
import { canMoveExam } from '../../lib/exam-status';
import { abnormalCount, readEvaluation, storedEvaluation, type AddendumDto, type CommunicationDto, type DraftSavedDto, type MeasurementSources, type ReportContext, type ReportDto, type ReportEvaluation, type SaveDraftInput, type StoredEvaluation } from '../../lib/schemas/reports';
import type { SessionUser } from '../../lib/session-user';
import { ageOn, formatInstant, zonedDate } from '../../lib/time';
import { HttpError, notFound, ruleBroken, stale } from '../http/errors';
import { audit } from './audit';
import { afterChange, lockExam } from './booking';
import { LATEST_PRIOR_ID_SQL, priorInput } from './priors';
import { referenceSet } from './reference-ranges';
import { clinicProfile, disabledUrgentRules } from './settings';

function toDto(r: Report, evaluation: ReportEvaluation | null, names: ReadonlyMap<number, string> = new Map(), added: { addenda: ReportAddendum[]; communications: ReportCommunication[] } = { addenda: [], communications: [] }): ReportDto {
  const name = (id: number | null | undefined) => (id == null ? null : (names.get(id) ?? null));
  const person = (id: number) => names.get(id) ?? 'a physician';
  return {
    id: r.id,
    examId: r.examId,
    status: r.status,
    version: r.version,
    templateId: r.templateId as ReportDto['templateId'],
    templateVersion: r.templateVersion,
    referenceSetVersion: r.referenceSetVersion,
    measurements: r.measurements,
    measurementSources: r.measurementSources ?? {},
    nodules: r.nodules as ReportDto['nodules'],
    heightCm: r.heightCm,
    weightKg: r.weightKg,
    probeId: r.probeId,
    probeKind: r.probeKind,
    evaluation,
    findingsText: r.findingsText,
    abnormalCount: r.abnormalCount,
    updatedAt: r.updatedAt.toISOString(),
    updatedBy: name(r.updatedBy),
    submittedAt: r.submittedAt?.toISOString() ?? null,
    findingsHtml: r.findingsHtml ?? null,
    impressionHtml: r.impressionHtml ?? null,
    claimedBy: r.claimedBy ? { id: r.claimedBy, name: name(r.claimedBy) ?? 'another physician' } : null,
    claimedAt: r.claimedAt?.toISOString() ?? null,
    signedBy: name(r.signedBy),
    signedAt: r.signedAt?.toISOString() ?? null,
    signedHash: r.signedHash ?? null,
    addenda: added.addenda.map((a): AddendumDto => ({ id: a.id, bodyHtml: a.bodyHtml, signedBy: person(a.signedBy), signedAt: a.signedAt.toISOString(), signedHash: a.signedHash })),
    communications: added.communications.map(
      (c): CommunicationDto => ({
        id: c.id,
        ruleId: c.ruleId,
        finding: c.finding,
        recipientName: c.recipientName,
        recipientRole: c.recipientRole,
        method: c.method,
        communicatedAt: c.communicatedAt.toISOString(),
        readBack: c.readBack,
        recordedBy: person(c.recordedBy),
        recordedAt: c.createdAt.toISOString(),
      }),
    ),
  };
}

/**
 * A report with what was added to it (addenda, urgent communications; a draft has none) and the
 * names of the people it mentions (last editor, reader, signer, addenda signers, recorders).
 */
export async function dtoWithEditor(r: Report, transaction?: Transaction): Promise<ReportDto> {
  const [addenda, communications] =
    r.status === 'draft'
      ? [[], []]
      : await Promise.all([
          ReportAddendum.findAll({ where: { reportId: r.id }, order: [['signedAt', 'ASC'], ['id', 'ASC']], transaction }),
          ReportCommunication.findAll({ where: { reportId: r.id }, order: [['communicatedAt', 'ASC'], ['id', 'ASC']], transaction }),
        ]);
  const ids = [...new Set([r.updatedBy, r.claimedBy, r.signedBy, ...addenda.map((a) => a.signedBy), ...communications.map((c) => c.recordedBy)].filter((id): id is number => typeof id === 'number'))];
  const [users, evaluation] = await Promise.all([
    ids.length ? User.findAll({ where: { id: ids }, attributes: ['id', 'displayName'], transaction }) : [],
    reportEvaluation(r),
  ]);
  return toDto(r, evaluation, new Map(users.map((u) => [u.id, u.displayName])), { addenda, communications });
}

/** The report's evaluation as readers see it (flags with their citations and sentences; see StoredFlag). */
async function reportEvaluation(r: Pick<Report, 'evaluation' | 'referenceSetVersion'>): Promise<ReportEvaluation | null> {
  const stored = r.evaluation as StoredEvaluation | null;
  return stored ? readEvaluation(stored, await referenceSet(r.referenceSetVersion)) : null;
}


/**
 * Runs the engine on a report's entries with the exam's patient factors, the stored reference
 * set and the latest signed prior of the same template (growth since then); values outside
 * plausible bounds are a 400 naming each field. Rules the clinic switched off raise no prompt
 * (the stored evaluation's options record which were off).
 */
function evaluateEntries(
  facts: { scheduledStart: Date; sex: Patient['sex']; birthDate: string },
  templateId: string,
  entries: Pick<SaveDraftInput, 'measurements' | 'nodules' | 'heightCm' | 'weightKg'>,
  timeZone: string,
  referenceRanges: readonly ReferenceRange[],
  prior: PriorExamInput | null,
  switchedOff: readonly UrgentRuleId[],
): EvaluationSuccess {
  const examDate = zonedDate(facts.scheduledStart, timeZone);
  const result = evaluate({
    templateId,
    measurements: entries.measurements,
    nodules: entries.nodules as never,
    patient: { sex: facts.sex, birthDate: facts.birthDate, examDate, heightCm: entries.heightCm, weightKg: entries.weightKg },
    // Growth is judged between exam days: an earlier exam the same day is no prior for it.
    prior: prior !== null && prior.examDate < examDate ? prior : null,
    referenceRanges,
    options: { disabledUrgentRules: switchedOff },
  });
  if (!result.ok) throw new HttpError(400, 'VALIDATION', 'Some values are outside what is plausible; check the units.', result.fieldErrors);
  return result;
}

/**
 * "Start scan": an arrived exam moves to in-progress and gets its draft report, with the
 * template of its exam type and a probe of the scanner's of the template's default kind.
 */
export async function startExam(actor: SessionUser, examId: number, version: number, requestId: string): Promise<{ reportId: number; examVersion: number }> {
  return afterChange(
    db().transaction(async (transaction) => {
      const exam = await lockExam(examId, version, transaction);
      const report = await beginScan(exam, actor.id, transaction);
      await audit({ actorUserId: actor.id, action: 'exam.start', entityType: 'exam', entityId: exam.id, detail: { from: 'arrived', to: 'in-progress', reportId: report.id }, requestId }, transaction);
      return { reportId: report.id, examVersion: exam.version };
    }),
  );
}

/**
 * Moves a locked, arrived exam to in-progress and gives it its draft report (kept if it has
 * one already), with the template of its exam type and a probe of the scanner's of the
 * template's default kind. Shared by "Start scan" and a scanner's procedure step.
 */
export async function beginScan(exam: Exam, actorUserId: number | null, transaction: Transaction): Promise<Report> {
  if (!canMoveExam(exam.status, 'in-progress')) throw ruleBroken(`Only an arrived exam can be started; this one is ${exam.status}.`);
  const type = await ExamType.findByPk(exam.examTypeId, { transaction });
  const template = getTemplate(type!.templateId as TemplateId);
  if (!template) throw ruleBroken(`The exam type has no structured template (${type!.templateId}).`);
  const probe = await Probe.findOne({ where: { scannerId: exam.scannerId, kind: template.defaultProbe }, transaction });
  await exam.update({ status: 'in-progress', startedAt: exam.startedAt ?? new Date(), version: exam.version + 1 }, { transaction });
  const existing = await Report.findOne({ where: { examId: exam.id }, transaction });
  return (
    existing ??
    Report.create(
      {
        examId: exam.id,
        templateId: template.id,
        templateVersion: template.version,
        referenceSetVersion: REFERENCE_SET_VERSION,
        measurements: {},
        nodules: [],
        heightCm: null,
        weightKg: null,
        probeId: probe?.id ?? null,
        probeKind: probe?.kind ?? template.defaultProbe,
        evaluation: null,
        findingsText: null,
        impressionHtml: null,
        createdBy: actorUserId,
        updatedBy: actorUserId,
      },
      { transaction },
    )
  );
}

/** The engine's prior for a report, read inside the caller's transaction. */
async function latestPriorInTx(reportId: number, timeZone: string, transaction: Transaction): Promise<PriorExamInput | null> {
  const [row] = await db().query<{ id: number | null }>(`SELECT ${LATEST_PRIOR_ID_SQL} AS id FROM reports r JOIN exams e ON e.id = r.exam_id WHERE r.id = ?`, {
    replacements: [reportId],
    type: QueryTypes.SELECT,
    transaction,
  });
  return priorInput(row?.id ?? null, timeZone, transaction);
}

/** Loads a report for a change, locked, checking the version the form saw. */
async function lockReport(id: number, version: number, transaction: Transaction): Promise<Report> {
  const report = await Report.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!report) throw notFound('The report');
  if (report.version !== version) {
    const err = stale('report');
    // The form keeps what was typed and shows who saved meanwhile.
    throw new HttpError(409, err.code, `${err.message}`, undefined, { current: await dtoWithEditor(report, transaction) });
  }
  return report;
}

/** The facts of an exam a report evaluation needs, in one narrow read. */
async function examFactsFor(examId: number, transaction: Transaction): Promise<{ scannerId: number; scheduledStart: Date; sex: Patient['sex']; birthDate: string }> {
  const [row] = await db().query<{ scanner_id: number; scheduled_start: Date; sex: Patient['sex']; birth_date: string }>(
    'SELECT e.scanner_id, e.scheduled_start, p.sex, p.birth_date FROM exams e JOIN patients p ON p.id = e.patient_id WHERE e.id = ?',
    { replacements: [examId], type: QueryTypes.SELECT, transaction },
  );
  if (!row) throw notFound('The exam');
  return { scannerId: row.scanner_id, scheduledStart: new Date(row.scheduled_start), sex: row.sex, birthDate: String(row.birth_date).slice(0, 10) };
}

/** What an autosave needs before evaluating, in one read: the report's head, the exam's facts and the chosen probe. */
async function draftHead(reportId: number, probeId: number | null) {
  const [row] = await db().query<{
    version: number;
    status: Report['status'];
    template_id: string;
    exam_id: number;
    probe_kind: Report['probeKind'];
    scanner_id: number;
    scheduled_start: Date;
    sex: Patient['sex'];
    birth_date: string;
    chosen_scanner_id: number | null;
    chosen_kind: Report['probeKind'];
    prior_report_id: number | null;
  }>(
    `SELECT r.version, r.status, r.template_id, r.exam_id, r.probe_kind, e.scanner_id, e.scheduled_start, p.sex, p.birth_date,
            pr.scanner_id AS chosen_scanner_id, pr.kind AS chosen_kind, ${LATEST_PRIOR_ID_SQL} AS prior_report_id
       FROM reports r JOIN exams e ON e.id = r.exam_id JOIN patients p ON p.id = e.patient_id
       LEFT JOIN probes pr ON pr.id = ?
      WHERE r.id = ?`,
    { replacements: [probeId, reportId], type: QueryTypes.SELECT },
  );
  return row;
}

/**
 * Why a guarded write to a report changed nothing, once it has: gone (404), no longer in the
 * status the write needs (409, worded by `wrongStatus`), or saved by someone else meanwhile
 * (409 STALE with the current report, so the form keeps what was typed and shows who saved).
 */
export async function reportRefusal(reportId: number, needs: Report['status'], wrongStatus: (status: Report['status']) => HttpError): Promise<never> {
  const current = await Report.findByPk(reportId);
  if (!current) throw notFound('The report');
  if (current.status !== needs) throw wrongStatus(current.status);
  const err = stale('report');
  throw new HttpError(409, err.code, err.message, undefined, { current: await dtoWithEditor(current) });
}

const notEditable = (needs: Report['status']) => (status: Report['status']) =>
  new HttpError(409, 'CONFLICT', needs === 'draft' ? `This report is ${status} and can no longer be edited here.` : `This report is ${status}; measurements can be corrected only while it is being read.`);
const staleSave = (reportId: number, needs: Report['status']) => reportRefusal(reportId, needs, notEditable(needs));

/**
 * Saving a report's entries: the sonographer's autosave of a draft, and the reading physician's
 * corrections to a preliminary report. The server recomputes with the same engine and stores
 * the entries, the evaluation, the template and reference-set versions. Refuses stale versions
 * (409) and values outside plausible bounds (400).
 *
 * The busiest write in the app (every pause in typing), so it does the least that is safe: one
 * read of what the evaluation needs, then a transaction holding a single guarded UPDATE (it
 * applies only to the version the form saw, still in the status this role edits; the row lock
 * it takes is the whole concurrency control) and the audit event. Nothing is re-read; the answer
 * says what was stored. A physician's correction is audited with the fields it changed.
 */
export async function saveDraft(actor: SessionUser, reportId: number, input: SaveDraftInput, requestId: string): Promise<DraftSavedDto> {
  const needs: Report['status'] = actor.role === 'radiologist' ? 'preliminary' : 'draft';
  const [{ timeZone }, referenceRanges, head, switchedOff] = await Promise.all([clinicProfile(), referenceSet(REFERENCE_SET_VERSION), draftHead(reportId, input.probeId), disabledUrgentRules()]);
  if (!head) throw notFound('The report');
  if (head.version !== input.version || head.status !== needs) return staleSave(reportId, needs);
  if (input.probeId !== null && head.chosen_scanner_id !== head.scanner_id) {
    throw new HttpError(400, 'VALIDATION', 'Some values need correcting.', { probeId: 'Choose a probe of this room’s scanner.' });
  }
  const facts = { scheduledStart: new Date(head.scheduled_start), sex: head.sex, birthDate: String(head.birth_date).slice(0, 10) };
  const result = evaluateEntries(facts, head.template_id, input, timeZone, referenceRanges, await priorInput(head.prior_report_id, timeZone), switchedOff);
  const saved: DraftSavedDto = {
    id: reportId,
    examId: head.exam_id,
    status: needs,
    version: head.version + 1,
    templateVersion: getTemplate(head.template_id as TemplateId)!.version,
    referenceSetVersion: result.referenceSetVersion,
    abnormalCount: abnormalCount(result),
    updatedAt: new Date().toISOString(),
    updatedBy: actor.displayName,
  };
  const applied = await db().transaction(async (transaction) => {
    // What a correction changes is worth the extra read; the sonographer's autosave skips it.
    const before = needs === 'preliminary' ? await Report.findByPk(reportId, { transaction, lock: transaction.LOCK.UPDATE, attributes: ['id', 'measurements', 'nodules', 'heightCm', 'weightKg'] }) : null;
    // Bound parameters go to the driver as they are; replacements would be escaped into the SQL
    // text by Sequelize first, a character-by-character pass over ~20 KB of JSON on every save.
    const [, changed] = await db().query(
      `UPDATE reports SET measurements = $1, measurement_sources = $2, nodules = $3, height_cm = $4, weight_kg = $5, probe_id = $6, probe_kind = $7, evaluation = $8,
              findings_text = $9, abnormal_count = $10, template_version = $11, reference_set_version = $12, updated_by = $13,
              version = version + 1, updated_at = $14
        WHERE id = $15 AND version = $16 AND status = $17`,
      {
        bind: [
          JSON.stringify(input.measurements),
          JSON.stringify(keptSources(input)),
          JSON.stringify(input.nodules),
          input.heightCm,
          input.weightKg,
          input.probeId,
          input.probeId === null ? head.probe_kind : head.chosen_kind,
          JSON.stringify(storedEvaluation(result)),
          result.findings.join('\n'),
          saved.abnormalCount,
          saved.templateVersion,
          saved.referenceSetVersion,
          actor.id,
          new Date(saved.updatedAt),
          reportId,
          input.version,
          needs,
        ],
        type: QueryTypes.UPDATE,
        transaction,
      },
    );
    // Someone saved (or submitted) between the read and the write: nothing was written.
    if (changed !== 1) return false;
    const detail = before
      ? { examId: head.exam_id, version: input.version, changed: changedEntries(before, input) }
      : { examId: head.exam_id, version: input.version, fields: Object.keys(input.measurements).length, nodules: input.nodules.length };
    await audit({ actorUserId: actor.id, action: before ? 'report.correct' : 'report.save', entityType: 'report', entityId: reportId, detail, requestId }, transaction);
    return true;
  });
  return applied ? saved : staleSave(reportId, needs);
}

/** Provenance only for values that are there and are numbers (a typed-over or cleared field has none). */
function keptSources(input: SaveDraftInput): MeasurementSources {
  return Object.fromEntries(Object.entries(input.measurementSources ?? {}).filter(([code]) => typeof input.measurements[code] === 'number'));
}

/** Which entries a correction changed, by field code (values are not logged: they are patient data). */
function changedEntries(before: Pick<Report, 'measurements' | 'nodules' | 'heightCm' | 'weightKg'>, after: SaveDraftInput): string[] {
  const codes = new Set([...Object.keys(before.measurements), ...Object.keys(after.measurements)]);
  const changed = [...codes].filter((c) => before.measurements[c] !== after.measurements[c]);
  if (JSON.stringify(before.nodules) !== JSON.stringify(after.nodules)) changed.push('nodules');
  if (Number(before.heightCm ?? NaN) !== Number(after.heightCm ?? NaN) && !(before.heightCm == null && after.heightCm == null)) changed.push('heightCm');
  if (Number(before.weightKg ?? NaN) !== Number(after.weightKg ?? NaN) && !(before.weightKg == null && after.weightKg == null)) changed.push('weightKg');
  return changed.sort();
}

/**
 * "Submit preliminary": every required measurement given (or marked not measurable), the
 * findings generated by the engine, report → preliminary, exam → completed; it then waits in
 * the reading queue.
 */
export async function submitPreliminary(actor: SessionUser, reportId: number, version: number, requestId: string): Promise<ReportDto> {
  const [{ timeZone }, referenceRanges, switchedOff] = await Promise.all([clinicProfile(), referenceSet(REFERENCE_SET_VERSION), disabledUrgentRules()]);
  return afterChange(
    db().transaction(async (transaction) => {
      const report = await lockReport(reportId, version, transaction);
      if (report.status !== 'draft') throw new HttpError(409, 'CONFLICT', `This report is already ${report.status}.`);
      const exam = await Exam.findByPk(report.examId, { transaction, lock: transaction.LOCK.UPDATE });
      if (exam!.status !== 'in-progress') throw ruleBroken(`The exam is ${exam!.status}; only an exam being scanned can be submitted.`);
      const template = getTemplate(report.templateId as TemplateId)!;
      const missing = missingRequired(template, report.measurements);
      if (missing.length) {
        const labels = new Map(template.sections.flatMap((s) => s.fields.map((f) => [f.code, f.label] as const)));
        throw ruleBroken(
          `Still needed before submitting: ${missing.map((c) => labels.get(c) ?? c).join(', ')}. Enter them or mark them not measurable.`,
          Object.fromEntries(missing.map((c) => [`measurements.${c}`, 'Required for the preliminary report.'])),
        );
      }
      const facts = await examFactsFor(exam!.id, transaction);
      const result = evaluateEntries(facts, report.templateId, { ...report.get(), nodules: report.nodules as SaveDraftInput['nodules'] }, timeZone, referenceRanges, await latestPriorInTx(report.id, timeZone, transaction), switchedOff);
      const now = new Date();
      await report.update(
        { status: 'preliminary', evaluation: storedEvaluation(result), findingsText: result.findings.join('\n'), abnormalCount: abnormalCount(result), submittedBy: actor.id, submittedAt: now, updatedBy: actor.id, version: report.version + 1 },
        { transaction },
      );
      await exam!.update({ status: 'completed', completedAt: now, version: exam!.version + 1 }, { transaction });
      await audit({ actorUserId: actor.id, action: 'report.preliminary', entityType: 'report', entityId: report.id, detail: { examId: exam!.id, abnormal: report.abnormalCount }, requestId }, transaction);
      await audit({ actorUserId: actor.id, action: 'exam.complete', entityType: 'exam', entityId: exam!.id, detail: { from: 'in-progress', to: 'completed', reportId: report.id }, requestId }, transaction);
      return dtoWithEditor(report, transaction);
    }),
  );
}

/** A report as stored (urgent prompts of switched-off rules hidden until it is signed). */
export async function getReport(id: number): Promise<ReportDto> {
  const report = await Report.findByPk(id);
  if (!report) throw notFound('The report');
  return withCurrentUrgentRules(await dtoWithEditor(report));
}

/** The report of an exam, if it has one (urgent prompts as getReport shows them). */
export async function reportOfExam(examId: number): Promise<ReportDto | null> {
  const report = await Report.findOne({ where: { examId } });
  return report ? withCurrentUrgentRules(await dtoWithEditor(report)) : null;
}

/**
 * A report evaluated before the clinic switched a rule off still holds that rule's prompt: while
 * it is being read it is not shown (nothing stored changes, so switching the rule on again shows
 * it again). A signed report shows the prompts it was signed with.
 */
async function withCurrentUrgentRules(dto: ReportDto): Promise<ReportDto> {
  if (dto.signedAt !== null || !dto.evaluation?.urgentPrompts.length) return dto;
  const off = await disabledUrgentRules();
  if (off.length === 0) return dto;
  return { ...dto, evaluation: { ...dto.evaluation, urgentPrompts: dto.evaluation.urgentPrompts.filter((p) => !off.includes(p.ruleId)) } };
}

/** What the report form shows about the exam and offers as probes. */
export async function reportContext(examId: number): Promise<ReportContext> {
  const { timeZone } = await clinicProfile();
  const exam = (await Exam.findByPk(examId, {
    include: [
      { model: Patient, as: 'patient' },
      { model: ExamType, as: 'examType' },
      { model: Room, as: 'room' },
      { model: User, as: 'sonographer', attributes: ['displayName'] },
      { model: Referrer, as: 'referrer', attributes: ['name'] },
    ],
  })) as (Exam & { patient: Patient; examType: ExamType; room: Room; sonographer: User; referrer: Referrer | null }) | null;
  if (!exam) throw notFound('The exam');
  const scanner = await Scanner.findByPk(exam.scannerId);
  const probes = await Probe.findAll({ where: { scannerId: scanner!.id }, order: [['kind', 'ASC'], ['id', 'ASC']] });
  const examDate = zonedDate(exam.scheduledStart, timeZone);
  return {
    examId: exam.id,
    examVersion: exam.version,
    examStatus: exam.status,
    accessionNumber: exam.accessionNumber,
    examTypeName: exam.examType.name,
    indication: exam.indication,
    referrer: exam.referrer?.name ?? null,
    patient: { name: `${exam.patient.familyName}, ${exam.patient.givenName}`, mrn: exam.patient.mrn, sex: exam.patient.sex, birthDate: exam.patient.birthDate, ageYears: ageOn(exam.patient.birthDate, examDate) },
    examDate,
    when: formatInstant(exam.scheduledStart, timeZone),
    room: exam.room.name,
    sonographer: exam.sonographer.displayName,
    probes: probes.map((p) => ({ id: p.id, kind: p.kind, label: p.modelLabel, frequencyMhz: `${p.minFrequencyMhz}–${p.maxFrequencyMhz} MHz` })),
  };
}

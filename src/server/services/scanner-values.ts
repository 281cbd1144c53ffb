import { QueryTypes } from 'sequelize';
import { db } from '../../db/connection';
import { Report, ScannerValue } from '../../db/models';
import { formatQuantity, getTemplate, type NumberField } from '../../lib/clinical';
import type { ScannerValueDecision, ScannerValueDto } from '../../lib/schemas/scanner-values';
import type { SessionUser } from '../../lib/session-user';
import { formatInstant } from '../../lib/time';
import { conflict, notFound } from '../http/errors';
import { audit } from './audit';
import { clinicProfile } from './settings';

/** Number fields of a template by code. */
function numberFields(templateId: string): Map<string, NumberField> {
  const template = getTemplate(templateId);
  return new Map((template?.sections ?? []).flatMap((s) => s.fields.filter((f): f is NumberField => f.kind === 'number').map((f) => [f.code, f] as const)));
}

/**
 * Values a scanner's structured report offered for this report's exam that nobody has decided
 * on yet, in the template's field order; the form shows them to accept or reject one by one.
 */
export async function offeredValues(reportId: number): Promise<ScannerValueDto[]> {
  const report = await Report.findByPk(reportId, { attributes: ['id', 'examId', 'templateId'] });
  if (!report) throw notFound('The report');
  const [rows, { timeZone }] = await Promise.all([
    ScannerValue.findAll({ where: { examId: report.examId, state: 'offered' }, order: [['id', 'ASC']] }),
    clinicProfile(),
  ]);
  const fields = numberFields(report.templateId);
  const order = [...fields.keys()];
  return rows
    .filter((r) => fields.has(r.fieldCode))
    .sort((a, b) => order.indexOf(a.fieldCode) - order.indexOf(b.fieldCode) || a.id - b.id)
    .map((r) => {
      const field = fields.get(r.fieldCode)!;
      const [scheme, code] = r.concept.split(':');
      return {
        id: r.id,
        fieldCode: r.fieldCode,
        label: field.label,
        unit: field.unit,
        value: r.value,
        valueText: formatQuantity(r.value, field.unit, field.decimals),
        sentAs: `${r.sourceValue} ${r.sourceUnit}, ${r.conceptMeaning} (${scheme} ${code})`,
        state: r.state,
        receivedLabel: formatInstant(r.createdAt, timeZone),
      };
    });
}

/**
 * Accepts or rejects one offered value. The value itself reaches the report through the form
 * (the sonographer's save, marked "from the scanner"); this records the decision, once: a
 * second decision on the same value, or one on a report no longer being recorded, is 409.
 */
export async function decideValue(actor: SessionUser, id: number, input: ScannerValueDecision, requestId: string): Promise<{ id: number; state: 'accepted' | 'rejected' }> {
  const state = input.decision === 'accept' ? 'accepted' : 'rejected';
  return db().transaction(async (transaction) => {
    const [row] = await db().query<{ exam_id: number; field_code: string; state: string; report_status: string | null }>(
      `SELECT v.exam_id, v.field_code, v.state, r.status AS report_status
         FROM scanner_values v LEFT JOIN reports r ON r.exam_id = v.exam_id
        WHERE v.id = ? FOR UPDATE`,
      { replacements: [id], type: QueryTypes.SELECT, transaction },
    );
    if (!row) throw notFound('The offered value');
    if (row.state !== 'offered') throw conflict(`This value was already ${row.state}.`);
    if (row.report_status !== 'draft') throw conflict('The report is no longer being recorded; values from the scanner can no longer be taken into it.');
    await ScannerValue.update({ state, decidedBy: actor.id, decidedAt: new Date() }, { where: { id }, transaction });
    await audit({ actorUserId: actor.id, action: `scanner-value.${input.decision}`, entityType: 'exam', entityId: row.exam_id, detail: { scannerValueId: id, field: row.field_code }, requestId }, transaction);
    return { id, state };
  });
}

import { Op, type Transaction } from 'sequelize';
import { db } from '../../../db/connection';
import { ExamType } from '../../../db/models';
import type { ActiveChange, ActiveChangeResult, ExamTypeFields, ExamTypeRow, Versioned } from '../../../lib/schemas/catalog-admin';
import type { SessionUser } from '../../../lib/session-user';
import { ruleBroken } from '../../http/errors';
import { clinicProfile } from '../settings';
import { clash, lockVersioned, saveChanges, audited, examCounts } from './shared';

/** Exam types: name, template, duration, probe kind, preparation, price and deposit. */

const examTypeRow = (t: ExamType, examCount: number): ExamTypeRow => ({
  id: t.id,
  code: t.code,
  name: t.name,
  templateId: t.templateId,
  durationMinutes: t.durationMinutes,
  probeKind: t.probeKind,
  preparationText: t.preparationText,
  selfPayPriceCents: t.selfPayPriceCents,
  depositCents: t.depositCents,
  currency: t.currency,
  active: t.active,
  version: t.version,
  examCount,
});

export async function listExamTypes(): Promise<ExamTypeRow[]> {
  const [types, counts] = await Promise.all([ExamType.findAll({ order: [['name', 'ASC']] }), examCounts()]);
  return types.map((t) => examTypeRow(t, counts.get(t.id) ?? 0));
}

async function checkExamTypeName(name: string, id: number | null, transaction: Transaction): Promise<void> {
  const other = await ExamType.findOne({ where: { name, ...(id ? { id: { [Op.ne]: id } } : {}) }, transaction });
  if (other) throw clash(`There is already an exam type called ${other.name}${other.active ? '' : ' (deactivated)'}.`, 'name', 'Already the name of another exam type.');
}

/** A stable code from the name, e.g. "Carotid duplex" → "carotid-duplex" (then "-2", "-3" … if taken). */
async function codeFor(name: string, transaction: Transaction): Promise<string> {
  const base = name.normalize('NFKD').replace(/[\u0300-\u036f]/g, '').toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 32) || 'exam';
  const taken = new Set((await ExamType.findAll({ where: { code: { [Op.startsWith]: base } }, attributes: ['code'], transaction })).map((t) => t.code));
  let code = base;
  for (let n = 2; taken.has(code); n++) code = `${base}-${n}`;
  return code;
}

export async function createExamType(actor: SessionUser, input: ExamTypeFields, requestId: string): Promise<ExamTypeRow> {
  return db().transaction(async (transaction) => {
    await checkExamTypeName(input.name, null, transaction);
    const { currency } = await clinicProfile(transaction);
    const type = await ExamType.create({ ...input, code: await codeFor(input.name, transaction), currency }, { transaction });
    await audited('exam-type', 'create', type.id, { code: type.code, selfPayPriceCents: type.selfPayPriceCents, depositCents: type.depositCents }, { actor, requestId }, transaction);
    return examTypeRow(type, 0);
  });
}

/**
 * Edits an exam type. Exams already booked keep their own duration, price and deposit; the
 * template may change only while no exam uses the type, since an exam's report follows it.
 */
export async function updateExamType(actor: SessionUser, id: number, input: Versioned<ExamTypeFields>, requestId: string): Promise<ExamTypeRow> {
  return db().transaction(async (transaction) => {
    const type = await lockVersioned(ExamType, 'exam-type', id, input.version, transaction);
    if (input.name !== type.name) await checkExamTypeName(input.name, id, transaction);
    const examCount = (await examCounts(transaction, id)).get(id) ?? 0;
    if (input.templateId !== type.templateId && examCount > 0) {
      throw ruleBroken(`${examCount} exam${examCount === 1 ? '' : 's'} of this type exist and follow its template. Add a new exam type for the other template and deactivate this one.`, {
        templateId: 'Cannot change while exams use this type.',
      });
    }
    const { version: _version, ...fields } = input;
    await saveChanges(type, 'exam-type', fields, { actor, requestId }, transaction);
    return examTypeRow(type, examCount);
  });
}

/** Deactivated, an exam type is no longer offered or accepted for booking; its exams go on. */
export async function setExamTypeActive(actor: SessionUser, id: number, input: ActiveChange, requestId: string): Promise<ActiveChangeResult<ExamTypeRow>> {
  return db().transaction(async (transaction) => {
    const type = await lockVersioned(ExamType, 'exam-type', id, input.version, transaction);
    if (type.active !== input.active) {
      await type.update({ active: input.active, version: type.version + 1 }, { transaction });
      await audited('exam-type', input.active ? 'reactivate' : 'deactivate', id, {}, { actor, requestId }, transaction);
    }
    return { row: examTypeRow(type, (await examCounts(transaction, id)).get(id) ?? 0) };
  });
}

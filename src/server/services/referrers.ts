import { Op, type Transaction, type WhereOptions } from 'sequelize';
import { db } from '../../db/connection';
import { Referrer } from '../../db/models';
import type { SessionUser } from '../../lib/session-user';
import {
  REFERRER_FIELDS,
  type CreateReferrerInput,
  type ReferrerFields,
  type ReferrerListQuery,
  type ReferrerRow,
  type UpdateReferrerInput,
} from '../../lib/schemas/referrers';
import { HttpError, notFound, stale } from '../http/errors';
import { audit } from './audit';
import { escapeLike } from './patients';

function toRow(r: Referrer): ReferrerRow {
  return { id: r.id, name: r.name, practice: r.practice, email: r.email, phone: r.phone, active: r.active, version: r.version };
}

/**
 * One page of the directory, searched in name, practice and e-mail, optionally only active
 * (or only deactivated) entries. The booking form's picker calls it with `active: true`.
 */
export async function listReferrers(q: ReferrerListQuery): Promise<{ rows: ReferrerRow[]; total: number }> {
  const conditions: WhereOptions<Referrer>[] = [];
  if (q.active !== undefined) conditions.push({ active: q.active });
  // Each word must appear somewhere, so "ward family" finds "Dr Ada Ward, Elm Family Practice".
  for (const word of (q.q ?? '').split(/\s+/).filter(Boolean).slice(0, 4)) {
    const like = `%${escapeLike(word)}%`;
    conditions.push({ [Op.or]: [{ name: { [Op.like]: like } }, { practice: { [Op.like]: like } }, { email: { [Op.like]: like } }] });
  }
  const { rows, count } = await Referrer.findAndCountAll({
    where: conditions.length ? { [Op.and]: conditions } : {},
    order: [[q.sort, q.dir.toUpperCase()], ['id', 'ASC']],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  });
  return { rows: rows.map(toRow), total: count };
}

async function refuseTakenEmail(email: string, exceptId: number | null, transaction: Transaction): Promise<void> {
  const taken = await Referrer.findOne({ where: { email, ...(exceptId ? { id: { [Op.ne]: exceptId } } : {}) }, transaction });
  if (taken) {
    throw new HttpError(409, 'CONFLICT', 'Another directory entry already uses this e-mail address.', {
      email: 'Already used by another referring clinician.',
    });
  }
}

/** Adds a referring clinician (audited). A taken e-mail is a 409 naming the field. */
export async function createReferrer(actor: SessionUser, input: CreateReferrerInput, requestId: string): Promise<ReferrerRow> {
  return db().transaction(async (transaction) => {
    await refuseTakenEmail(input.email, null, transaction);
    const referrer = await Referrer.create({ ...input }, { transaction });
    await audit(
      { actorUserId: actor.id, action: 'referrer.create', entityType: 'referrer', entityId: referrer.id, detail: { fields: REFERRER_FIELDS.filter((k) => input[k] != null) }, requestId },
      transaction,
    );
    return toRow(referrer);
  });
}

/**
 * Changes an entry or (de)activates it; entries are never deleted, because exams and
 * accounts point at them. A stale version is a 409.
 */
export async function updateReferrer(actor: SessionUser, id: number, input: UpdateReferrerInput, requestId: string): Promise<ReferrerRow> {
  const { version, active, ...fields } = input;
  return db().transaction(async (transaction) => {
    const referrer = await Referrer.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!referrer) throw notFound('The referring clinician');
    if (referrer.version !== version) throw stale('directory entry');
    const changed: Array<keyof ReferrerFields> = REFERRER_FIELDS.filter((k) => fields[k] !== undefined && fields[k] !== referrer[k]);
    const activeChanged = active !== undefined && active !== referrer.active;
    if (changed.length === 0 && !activeChanged) return toRow(referrer);
    if (changed.includes('email')) await refuseTakenEmail(fields.email!, referrer.id, transaction);

    await referrer.update(
      { ...Object.fromEntries(changed.map((k) => [k, fields[k]])), ...(activeChanged ? { active } : {}), version: referrer.version + 1 },
      { transaction },
    );
    await audit(
      {
        actorUserId: actor.id,
        action: 'referrer.update',
        entityType: 'referrer',
        entityId: referrer.id,
        detail: { fields: changed, ...(activeChanged ? { active: { from: !active, to: active } } : {}) },
        requestId,
      },
      transaction,
    );
    return toRow(referrer);
  });
}

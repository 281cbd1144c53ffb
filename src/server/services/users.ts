import { Op, type WhereOptions } from 'sequelize';
import { db } from '../../db/connection';
import { Referrer, User } from '../../db/models';
import type { SessionUser } from '../../lib/session-user';
import type {
  ChangePasswordInput,
  CreateUserInput,
  UpdateUserInput,
  UserListQuery,
  UserRow,
} from '../../lib/schemas/users';
import { HttpError, notFound, ruleBroken, stale } from '../http/errors';
import { hashPassword, verifyPassword } from '../auth/password';
import { audit } from './audit';

function toRow(user: User & { referrer?: Referrer | null }, now: Date): UserRow {
  return {
    id: user.id,
    email: user.email,
    displayName: user.displayName,
    role: user.role,
    active: user.active,
    locked: !!user.lockedUntil && user.lockedUntil > now,
    lastSignInAt: user.lastSignInAt ? user.lastSignInAt.toISOString() : null,
    referrerId: user.referrerId ?? null,
    referrerName: user.referrer?.name ?? null,
    version: user.version,
  };
}

/** One page of accounts, searched, filtered and sorted in SQL. */
export async function listUsers(q: UserListQuery, now = new Date()): Promise<{ rows: UserRow[]; total: number }> {
  const where: WhereOptions<User> = {};
  if (q.role) Object.assign(where, { role: q.role });
  if (q.q) {
    const like = `%${q.q.replace(/[\\%_]/g, (c) => '\\' + c)}%`;
    Object.assign(where, { [Op.or]: [{ displayName: { [Op.like]: like } }, { email: { [Op.like]: like } }] });
  }
  const { rows, count } = await User.findAndCountAll({
    where,
    include: [{ model: Referrer, as: 'referrer', attributes: ['name'] }],
    order: [[q.sort, q.dir.toUpperCase()], ['id', 'ASC']],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  });
  return { rows: rows.map((u) => toRow(u, now)), total: count };
}

async function checkReferrer(referrerId: number | null | undefined, transaction: import('sequelize').Transaction) {
  if (referrerId == null) return;
  const exists = await Referrer.findByPk(referrerId, { transaction });
  if (!exists) throw new HttpError(400, 'VALIDATION', 'Some values need correcting.', { referrerId: 'No such directory entry.' });
}

/** Creates an account (audited). A taken e-mail is a 409 naming the field. */
export async function createUser(actor: SessionUser, input: CreateUserInput, requestId: string): Promise<UserRow> {
  const passwordHash = await hashPassword(input.password);
  return db().transaction(async (transaction) => {
    await checkReferrer(input.referrerId, transaction);
    const taken = await User.findOne({ where: { email: input.email }, transaction });
    if (taken) throw new HttpError(409, 'CONFLICT', 'An account with this e-mail already exists.', { email: 'Already in use.' });
    const user = await User.create(
      {
        email: input.email,
        displayName: input.displayName,
        role: input.role,
        passwordHash,
        referrerId: input.role === 'referrer' ? (input.referrerId ?? null) : null,
      },
      { transaction },
    );
    await audit({ actorUserId: actor.id, action: 'user.create', entityType: 'user', entityId: user.id, detail: { role: user.role }, requestId }, transaction);
    return toRow(user, new Date());
  });
}

/**
 * Changes role, active flag, lock or password of an account, refusing a stale version (409)
 * and refusing to let the manager lock themself out (422).
 */
export async function updateUser(actor: SessionUser, id: number, input: UpdateUserInput, requestId: string): Promise<UserRow> {
  const passwordHash = input.password ? await hashPassword(input.password) : undefined;
  return db().transaction(async (transaction) => {
    const user = await User.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('The account');
    if (user.version !== input.version) throw stale('account');
    if (user.id === actor.id && (input.active === false || (input.role && input.role !== user.role))) {
      throw ruleBroken('You cannot deactivate your own account or change your own role. Ask another manager.');
    }
    const role = input.role ?? user.role;
    const referrerId = input.referrerId !== undefined ? input.referrerId : user.referrerId;
    if (role === 'referrer' && !referrerId) {
      throw new HttpError(400, 'VALIDATION', 'Some values need correcting.', { referrerId: 'A referring clinician account must be linked to a directory entry.' });
    }
    await checkReferrer(input.referrerId, transaction);

    const changes: Record<string, unknown> = {};
    if (input.role && input.role !== user.role) changes.role = { from: user.role, to: input.role };
    if (input.active !== undefined && input.active !== user.active) changes.active = { from: user.active, to: input.active };
    if (input.unlock) changes.unlocked = true;
    if (passwordHash) changes.passwordReset = true;
    if (input.referrerId !== undefined && input.referrerId !== user.referrerId) changes.referrerId = { from: user.referrerId, to: input.referrerId };

    await user.update(
      {
        role,
        active: input.active ?? user.active,
        referrerId: role === 'referrer' ? referrerId : null,
        ...(input.unlock ? { lockedUntil: null, failedSignIns: 0 } : {}),
        ...(passwordHash ? { passwordHash, failedSignIns: 0, lockedUntil: null } : {}),
        version: user.version + 1,
      },
      { transaction },
    );
    await audit({ actorUserId: actor.id, action: 'user.update', entityType: 'user', entityId: user.id, detail: changes, requestId }, transaction);
    const fresh = await User.findByPk(id, { transaction, include: [{ model: Referrer, as: 'referrer', attributes: ['name'] }] });
    return toRow(fresh!, new Date());
  });
}

/** A signed-in user changes their own password after proving the current one. */
export async function changeOwnPassword(actor: SessionUser, input: ChangePasswordInput, requestId: string): Promise<void> {
  const passwordHash = await hashPassword(input.newPassword);
  await db().transaction(async (transaction) => {
    const user = await User.findByPk(actor.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('Your account');
    if (!(await verifyPassword(user.passwordHash, input.currentPassword))) {
      throw new HttpError(400, 'VALIDATION', 'Some values need correcting.', { currentPassword: 'This is not your current password.' });
    }
    await user.update({ passwordHash, version: user.version + 1 }, { transaction });
    await audit({ actorUserId: actor.id, action: 'user.password-change', entityType: 'user', entityId: actor.id, requestId }, transaction);
  });
}

/** The directory entries an account with the referrer role may be linked to. */
export async function referrerChoices(): Promise<Array<{ id: number; name: string; practice: string }>> {
  const rows = await Referrer.findAll({ where: { active: true }, order: [['name', 'ASC']], attributes: ['id', 'name', 'practice'] });
  return rows.map((r) => ({ id: r.id, name: r.name, practice: r.practice }));
}

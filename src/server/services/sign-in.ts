import { db } from '../../db/connection';
import { User } from '../../db/models';
import type { Role } from '../../lib/roles';
import { audit } from './audit';
import { spendVerifyTime, verifyPassword } from '../auth/password';

/** Failed attempts in a row that lock an account, and for how long (issue 2). */
export const MAX_FAILED_SIGN_INS = 5;
export const LOCK_MINUTES = 15;

export type SignInResult =
  | { ok: true; user: { id: number; email: string; displayName: string; role: Role } }
  | { ok: false; reason: 'invalid' | 'locked' | 'deactivated' };

/**
 * Checks an e-mail and password, counting failures on the user row (so a lock survives a
 * restart and holds across several web processes), all in one transaction with the row locked.
 */
export async function checkCredentials(
  email: string,
  password: string,
  now = new Date(),
): Promise<SignInResult> {
  const normalized = email.trim().toLowerCase();
  return db().transaction(async (transaction) => {
    const user = await User.findOne({
      where: { email: normalized },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!user) {
      await spendVerifyTime(password);
      await audit({ actorUserId: null, action: 'auth.sign-in-failed', entityType: 'user', detail: { reason: 'unknown-email' } }, transaction);
      return { ok: false, reason: 'invalid' };
    }
    if (user.lockedUntil && user.lockedUntil > now) {
      await audit({ actorUserId: user.id, action: 'auth.sign-in-refused', entityType: 'user', entityId: user.id, detail: { reason: 'locked' } }, transaction);
      return { ok: false, reason: 'locked' };
    }
    const matches = await verifyPassword(user.passwordHash, password);
    if (!matches) {
      const failures = user.failedSignIns + 1;
      const locks = failures >= MAX_FAILED_SIGN_INS;
      await user.update(
        {
          failedSignIns: locks ? 0 : failures,
          lockedUntil: locks ? new Date(now.getTime() + LOCK_MINUTES * 60_000) : user.lockedUntil,
        },
        { transaction },
      );
      await audit({ actorUserId: user.id, action: locks ? 'auth.locked' : 'auth.sign-in-failed', entityType: 'user', entityId: user.id, detail: { reason: 'wrong-password', failures } }, transaction);
      return { ok: false, reason: locks ? 'locked' : 'invalid' };
    }
    if (!user.active) {
      await audit({ actorUserId: user.id, action: 'auth.sign-in-refused', entityType: 'user', entityId: user.id, detail: { reason: 'deactivated' } }, transaction);
      return { ok: false, reason: 'deactivated' };
    }
    await user.update({ failedSignIns: 0, lockedUntil: null, lastSignInAt: now }, { transaction });
    await audit({ actorUserId: user.id, action: 'auth.sign-in', entityType: 'user', entityId: user.id }, transaction);
    return {
      ok: true,
      user: { id: user.id, email: user.email, displayName: user.displayName, role: user.role },
    };
  });
}

/** Records a sign-out for the audit trail. */
export async function recordSignOut(userId: number): Promise<void> {
  await audit({ actorUserId: userId, action: 'auth.sign-out', entityType: 'user', entityId: userId });
}

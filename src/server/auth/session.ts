import { decode } from '@auth/core/jwt';
import type { AstroCookies } from 'astro';
import { User } from '../../db/models';
import { asRole } from '../../lib/roles';
import type { SessionUser } from '../../lib/session-user';
import { config } from '../config';

// Auth.js names its cookie by whether the site is served over https.
const COOKIE_NAMES = ['__Secure-authjs.session-token', 'authjs.session-token'] as const;

/** The user id in a valid, unexpired session cookie, or undefined. */
export async function sessionUserId(cookies: AstroCookies): Promise<number | undefined> {
  for (const name of COOKIE_NAMES) {
    const token = cookies.get(name)?.value;
    if (!token) continue;
    try {
      const claims = await decode({ token, secret: config().AUTH_SECRET, salt: name });
      const sub = claims?.sub;
      if (typeof sub === 'string' && /^\d{1,10}$/.test(sub)) return Number(sub);
    } catch {
      // A tampered or stale-secret cookie is treated as no session at all.
    }
  }
  return undefined;
}

/**
 * Loads the signed-in user from the users table, so a deactivation or role change applies
 * on the very next request. Whatever claims the token carries are not trusted for the role.
 */
export async function loadSessionUser(userId: number): Promise<SessionUser | undefined> {
  const user = await User.findByPk(userId);
  if (!user || !user.active) return undefined;
  const role = asRole(user.role);
  if (!role) return undefined;
  return {
    id: user.id,
    email: user.email,
    displayName: user.displayName,
    role,
    referrerId: user.referrerId ?? null,
  };
}

import { decode } from '@auth/core/jwt';
import type { AstroCookies } from 'astro';
import { QueryTypes } from 'sequelize';
import { db } from '../../db/connection';
import { asRole } from '../../lib/roles';
import type { SessionUser } from '../../lib/session-user';
import { config } from '../config';

// Auth.js names its cookie by whether the site is served over https.
const COOKIE_NAMES = ['__Secure-authjs.session-token', 'authjs.session-token'] as const;

// Decrypting a session token (key derivation, AES, HMAC) is the same work for the same token
// every few seconds while a screen polls; remember recent results until the token expires.
// Only the signature check is skipped on a hit: the user row is still read on every request.
const decoded = new Map<string, { userId: number; expiresAt: number }>();
const MAX_DECODED = 2_000;

/** The user id in a valid, unexpired session cookie, or undefined. */
export async function sessionUserId(cookies: AstroCookies, now = Date.now()): Promise<number | undefined> {
  for (const name of COOKIE_NAMES) {
    const token = cookies.get(name)?.value;
    if (!token) continue;
    const hit = decoded.get(token);
    if (hit) {
      if (hit.expiresAt > now) return hit.userId;
      decoded.delete(token);
    }
    try {
      const claims = await decode({ token, secret: config().AUTH_SECRET, salt: name });
      const sub = claims?.sub;
      if (typeof sub === 'string' && /^\d{1,10}$/.test(sub)) {
        if (decoded.size >= MAX_DECODED) decoded.clear();
        const expiresAt = typeof claims?.exp === 'number' ? claims.exp * 1000 : now;
        decoded.set(token, { userId: Number(sub), expiresAt });
        return Number(sub);
      }
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
  // Every request runs this, so it is one narrow statement without model machinery.
  const [user] = await db().query<{ id: number; email: string; display_name: string; role: string; active: number; referrer_id: number | null }>(
    'SELECT id, email, display_name, role, active, referrer_id FROM users WHERE id = ?',
    { replacements: [userId], type: QueryTypes.SELECT },
  );
  if (!user || !user.active) return undefined;
  const role = asRole(user.role);
  if (!role) return undefined;
  return { id: user.id, email: user.email, displayName: user.display_name, role, referrerId: user.referrer_id ?? null };
}

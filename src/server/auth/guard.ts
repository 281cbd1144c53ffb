import type { AstroGlobal } from 'astro';
import { roleAllowed, type Role } from '../../lib/roles';
import type { SessionUser } from '../../lib/session-user';

/**
 * The role gate at the top of every protected page. Signed out → redirect to sign-in (and
 * back afterwards); signed in with another role → the 403 page, status 403.
 *
 * @example const gate = await requirePageRole(Astro, ['admin']); if (gate instanceof Response) return gate;
 */
export async function requirePageRole(
  Astro: AstroGlobal,
  roles: readonly Role[] | 'any',
): Promise<SessionUser | Response> {
  const user = Astro.locals.user;
  if (!user) {
    const next = Astro.url.pathname + Astro.url.search;
    return Astro.redirect(`/signin?next=${encodeURIComponent(next)}`, 303);
  }
  if (roles !== 'any' && !roleAllowed(user.role, roles)) {
    return Astro.rewrite('/forbidden');
  }
  return user;
}

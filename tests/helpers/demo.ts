import accounts from '../../seeders/demo-accounts.json';
import type { Role } from '../../src/lib/roles';

export const DEMO_PASSWORD = accounts.password;

/** The first demo account of each role. */
export const DEMO_LOGIN: Record<Role, string> = Object.fromEntries(
  [...accounts.users].reverse().map((u) => [u.role, u.email]),
) as Record<Role, string>;

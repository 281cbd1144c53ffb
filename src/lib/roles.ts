/** The five roles of Crestline (DESIGN.md). Isomorphic: islands and server share it. */
export const ROLES = ['admin', 'frontdesk', 'sonographer', 'radiologist', 'referrer'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Clinic manager',
  frontdesk: 'Front desk',
  sonographer: 'Sonographer',
  radiologist: 'Reading physician',
  referrer: 'Referring clinician',
};

/** Narrows an unknown value (a token claim, a form field) to a Role, or undefined. */
export function asRole(value: unknown): Role | undefined {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value)
    ? (value as Role)
    : undefined;
}

/** True when `role` is one of `allowed`; 'public' routes allow everyone. */
export function roleAllowed(role: Role | undefined, allowed: readonly Role[] | 'public'): boolean {
  if (allowed === 'public') return true;
  return role !== undefined && allowed.includes(role);
}

import { ROLES, type Role } from '../../lib/roles';

/** Every signed-in role, for endpoints open to all staff and referrers. */
export const ALL_SIGNED_IN: readonly Role[] = ROLES;
/** The clinic's own staff (everyone but referring clinicians). */
export const STAFF: readonly Role[] = ['admin', 'frontdesk', 'sonographer', 'radiologist'];

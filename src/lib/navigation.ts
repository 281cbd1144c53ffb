import type { Role } from './roles';

export interface NavItem {
  href: string;
  label: string;
  roles: readonly Role[];
}

/**
 * The navigation rail. The server still guards each page; this only hides what a role
 * cannot open. Later features add their entries here.
 */
export const NAV_ITEMS: readonly NavItem[] = [
  { href: '/', label: 'Today', roles: ['admin', 'frontdesk', 'sonographer', 'radiologist', 'referrer'] },
  { href: '/worklist', label: 'Worklist', roles: ['admin', 'frontdesk', 'sonographer', 'radiologist'] },
  { href: '/schedule', label: 'Schedule', roles: ['admin', 'frontdesk', 'sonographer', 'radiologist'] },
  { href: '/holding', label: 'Unmatched images', roles: ['admin', 'frontdesk', 'sonographer'] },
  { href: '/reading', label: 'Reading queue', roles: ['admin', 'radiologist'] },
  { href: '/patients', label: 'Patients', roles: ['admin', 'frontdesk', 'sonographer', 'radiologist'] },
  { href: '/referrers', label: 'Referring clinicians', roles: ['admin', 'frontdesk'] },
  { href: '/admin/dashboard', label: 'Clinic dashboard', roles: ['admin'] },
  { href: '/admin/users', label: 'Staff & access', roles: ['admin'] },
  { href: '/admin/catalog', label: 'Catalog', roles: ['admin'] },
  { href: '/admin/settings', label: 'Clinic settings', roles: ['admin'] },
  { href: '/admin/audit', label: 'Audit trail', roles: ['admin'] },
  { href: '/admin/reference-ranges', label: 'Reference ranges', roles: ['admin', 'radiologist', 'sonographer'] },
  { href: '/account', label: 'My account', roles: ['admin', 'frontdesk', 'sonographer', 'radiologist', 'referrer'] },
];

/** The entries a role sees, in order. */
export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => item.roles.includes(role));
}

import { describe, expect, it } from 'vitest';
import { asRole, roleAllowed, ROLES } from '../../src/lib/roles';
import { navFor } from '../../src/lib/navigation';

describe('roleAllowed', () => {
  it('lets in only the listed roles', () => {
    expect(roleAllowed('admin', ['admin'])).toBe(true);
    expect(roleAllowed('frontdesk', ['admin'])).toBe(false);
    expect(roleAllowed(undefined, ['admin'])).toBe(false);
  });
  it("lets everyone into 'public' routes", () => {
    expect(roleAllowed(undefined, 'public')).toBe(true);
  });
});

describe('asRole', () => {
  it('accepts the five roles of DESIGN.md and nothing else', () => {
    expect([...ROLES].sort()).toEqual(['admin', 'frontdesk', 'radiologist', 'referrer', 'sonographer']);
    for (const r of ROLES) expect(asRole(r)).toBe(r);
    for (const bad of ['superuser', 'Admin', '', null, 3, { role: 'admin' }]) expect(asRole(bad)).toBeUndefined();
  });
});

describe('navFor', () => {
  it('shows staff administration to the clinic manager only', () => {
    for (const r of ROLES) {
      const hrefs = navFor(r).map((i) => i.href);
      expect(hrefs.includes('/admin/users')).toBe(r === 'admin');
      expect(hrefs[0]).toBe('/');
    }
  });
});

import { describe, expect, it } from 'vitest';
import { safeNextPath, signInSchema } from '../../src/lib/schemas/auth';
import { changePasswordSchema, createUserSchema, updateUserSchema } from '../../src/lib/schemas/users';
import { fieldErrors } from '../../src/lib/field-errors';
import { clinicProfileSchema } from '../../src/lib/schemas/clinic';

describe('createUserSchema', () => {
  const base = { email: ' New.Person@Clinic.TEST ', displayName: 'New Person', role: 'frontdesk', password: 'twelve chars!' };
  it('normalises the e-mail', () => {
    expect(createUserSchema.parse(base).email).toBe('new.person@clinic.test');
  });
  it('wants 12+ character passwords', () => {
    const r = createUserSchema.safeParse({ ...base, password: 'elevenchars' });
    expect(r.success).toBe(false);
    expect(fieldErrors(r.error!)).toHaveProperty('password');
  });
  it('links a referrer account to a directory entry', () => {
    const r = createUserSchema.safeParse({ ...base, role: 'referrer' });
    expect(r.success).toBe(false);
    expect(fieldErrors(r.error!)).toEqual({ referrerId: expect.stringContaining('directory entry') });
    expect(createUserSchema.safeParse({ ...base, role: 'referrer', referrerId: '4' }).success).toBe(true);
  });
  it('refuses a role that does not exist', () => {
    expect(createUserSchema.safeParse({ ...base, role: 'superuser' }).success).toBe(false);
  });
});

describe('updateUserSchema', () => {
  it('needs the version seen and at least one change', () => {
    expect(updateUserSchema.safeParse({ active: false }).success).toBe(false);
    expect(updateUserSchema.safeParse({ version: 2 }).success).toBe(false);
    expect(updateUserSchema.safeParse({ version: 2, active: false }).success).toBe(true);
  });
});

describe('changePasswordSchema', () => {
  it('wants the two new passwords equal and different from the old one', () => {
    const same = changePasswordSchema.safeParse({ currentPassword: 'old password 1', newPassword: 'new password 12', confirmPassword: 'new password 13' });
    expect(fieldErrors(same.error!)).toHaveProperty('confirmPassword');
    const reused = changePasswordSchema.safeParse({ currentPassword: 'old password 1', newPassword: 'old password 1', confirmPassword: 'old password 1' });
    expect(fieldErrors(reused.error!)).toHaveProperty('newPassword');
  });
});

describe('sign-in', () => {
  it('asks for both fields', () => {
    const r = signInSchema.safeParse({ email: '', password: '' });
    expect(Object.keys(fieldErrors(r.error!)).sort()).toEqual(['email', 'password']);
  });
  it('returns only to same-site paths after sign-in', () => {
    expect(safeNextPath('/admin/users?x=1')).toBe('/admin/users?x=1');
    for (const bad of ['https://evil.test/', '//evil.test', '/\\evil.test', 'javascript:alert(1)', null, '']) {
      expect(safeNextPath(bad)).toBe('/');
    }
  });
});

describe('clinicProfileSchema', () => {
  it('accepts IANA time zones only', () => {
    const base = { name: 'X', addressLines: [], phone: '', email: 'a@b.test', currency: 'USD' };
    expect(clinicProfileSchema.safeParse({ ...base, timeZone: 'America/Chicago' }).success).toBe(true);
    expect(clinicProfileSchema.safeParse({ ...base, timeZone: 'Mars/Olympus' }).success).toBe(false);
  });
});

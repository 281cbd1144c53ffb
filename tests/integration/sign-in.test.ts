import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, User } from '../../src/db/models';
import { hashPassword } from '../../src/server/auth/password';
import { checkCredentials, LOCK_MINUTES, MAX_FAILED_SIGN_INS } from '../../src/server/services/sign-in';
import { closeTestDb, testDb } from '../helpers/db';
import { call, signIn } from '../helpers/http';

const PASSWORD = 'correct horse battery';
let seq = 0;

/** A fresh account for one test, so lockouts never touch the demo accounts. */
async function freshUser(overrides: Partial<{ active: boolean; role: 'frontdesk' | 'admin' }> = {}) {
  seq += 1;
  return User.create({
    email: `lock-${Date.now()}-${seq}@tests.test`,
    displayName: `Lock test ${seq}`,
    role: overrides.role ?? 'frontdesk',
    passwordHash: await hashPassword(PASSWORD),
    active: overrides.active ?? true,
    referrerId: null,
  });
}

beforeAll(() => {
  testDb();
});
afterAll(closeTestDb);

describe('checkCredentials (lockout recorded in the database)', () => {
  it(`locks after ${MAX_FAILED_SIGN_INS} wrong passwords, for ${LOCK_MINUTES} minutes`, async () => {
    const user = await freshUser();
    const t0 = new Date('2026-12-02T10:00:00Z');
    for (let i = 1; i < MAX_FAILED_SIGN_INS; i++) {
      expect(await checkCredentials(user.email, 'wrong', t0)).toEqual({ ok: false, reason: 'invalid' });
    }
    expect(await checkCredentials(user.email, 'wrong', t0)).toEqual({ ok: false, reason: 'locked' });

    // The right password does not open a locked account…
    const during = new Date(t0.getTime() + (LOCK_MINUTES * 60 - 1) * 1000);
    expect(await checkCredentials(user.email, PASSWORD, during)).toEqual({ ok: false, reason: 'locked' });
    // …and the lock is on the row, not in this process's memory.
    await user.reload();
    expect(user.lockedUntil!.getTime()).toBe(t0.getTime() + LOCK_MINUTES * 60_000);

    const after = new Date(t0.getTime() + LOCK_MINUTES * 60_000 + 1000);
    const ok = await checkCredentials(user.email, PASSWORD, after);
    expect(ok.ok).toBe(true);
    await user.reload();
    expect(user.failedSignIns).toBe(0);
    expect(user.lockedUntil).toBeNull();
  });

  it('resets the failure count after a successful sign-in', async () => {
    const user = await freshUser();
    const now = new Date();
    for (let i = 0; i < MAX_FAILED_SIGN_INS - 1; i++) await checkCredentials(user.email, 'wrong', now);
    expect((await checkCredentials(user.email, PASSWORD, now)).ok).toBe(true);
    for (let i = 0; i < MAX_FAILED_SIGN_INS - 1; i++) {
      expect(await checkCredentials(user.email, 'wrong', now)).toEqual({ ok: false, reason: 'invalid' });
    }
  });

  it('treats e-mail case and spaces as the same address', async () => {
    const user = await freshUser();
    expect((await checkCredentials(`  ${user.email.toUpperCase()} `, PASSWORD)).ok).toBe(true);
  });

  it('refuses a deactivated account even with the right password', async () => {
    const user = await freshUser({ active: false });
    expect(await checkCredentials(user.email, PASSWORD)).toEqual({ ok: false, reason: 'deactivated' });
  });

  it('answers an unknown e-mail like a wrong password and audits it', async () => {
    const before = await AuditEvent.count({ where: { action: 'auth.sign-in-failed' } });
    expect(await checkCredentials('nobody-here@tests.test', PASSWORD)).toEqual({ ok: false, reason: 'invalid' });
    expect(await AuditEvent.count({ where: { action: 'auth.sign-in-failed' } })).toBe(before + 1);
  });
});

describe('sign-in over HTTP (Auth.js credentials)', () => {
  it('gives a session cookie that is httpOnly and SameSite', async () => {
    const user = await freshUser();
    const { baseUrl } = await import('../helpers/env').then((m) => m.testEnv());
    const csrf = await fetch(`${baseUrl}/api/auth/csrf`);
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const cookie = csrf.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const res = await fetch(`${baseUrl}/api/auth/callback/credentials`, {
      method: 'POST',
      redirect: 'manual',
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', Cookie: cookie, Origin: baseUrl },
      body: new URLSearchParams({ email: user.email, password: PASSWORD, csrfToken }),
    });
    expect(res.status).toBe(302);
    const session = res.headers.getSetCookie().find((c) => c.startsWith('authjs.session-token='));
    expect(session).toBeDefined();
    expect(session).toMatch(/HttpOnly/i);
    expect(session).toMatch(/SameSite=Lax/i);
  });

  it('says "invalid" for a wrong password and for an unknown e-mail alike', async () => {
    const user = await freshUser();
    expect(await signIn(user.email, 'not it')).toEqual({ cookie: undefined, code: 'invalid' });
    expect(await signIn('who-is-this@tests.test', 'not it')).toEqual({ cookie: undefined, code: 'invalid' });
  });

  it('says "locked" once the account is locked, and "deactivated" for a deactivated user', async () => {
    const user = await freshUser();
    for (let i = 0; i < MAX_FAILED_SIGN_INS; i++) await signIn(user.email, 'not it');
    expect((await signIn(user.email, PASSWORD)).code).toBe('locked');
    const gone = await freshUser({ active: false });
    expect((await signIn(gone.email, PASSWORD)).code).toBe('deactivated');
  });

  it('records sign-in and sign-out in the audit trail', async () => {
    const user = await freshUser();
    const { cookie } = await signIn(user.email, PASSWORD);
    expect(cookie).toBeDefined();
    const out = await call('POST', '/signout', { cookie });
    expect(out.status).toBe(303);
    const actions = (await AuditEvent.findAll({ where: { actorUserId: user.id }, order: [['id', 'ASC']] })).map((e) => e.action);
    expect(actions).toEqual(['auth.sign-in', 'auth.sign-out']);
  });

  it('applies deactivation and role changes on the very next request', async () => {
    const user = await freshUser({ role: 'admin' });
    const { cookie } = await signIn(user.email, PASSWORD);
    expect((await call('GET', '/api/users', { cookie })).status).toBe(200);

    await user.update({ role: 'frontdesk' });
    expect((await call('GET', '/api/users', { cookie })).status).toBe(403);

    await user.update({ active: false });
    expect((await call('GET', '/api/me', { cookie })).status).toBe(401);
  });
});

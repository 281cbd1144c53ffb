import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, User } from '../../src/db/models';
import { closeTestDb, testDb } from '../helpers/db';
import { DEMO_LOGIN } from '../helpers/demo';
import { call, sessionFor, signIn } from '../helpers/http';

beforeAll(() => {
  testDb();
});
afterAll(closeTestDb);

const stamp = Date.now();
const newUser = (n: number, extra: Record<string, unknown> = {}) => ({
  email: `staff-${stamp}-${n}@tests.test`,
  displayName: `Staff Member ${n}`,
  role: 'sonographer',
  password: 'a long first password',
  ...extra,
});

describe('staff accounts API (admin)', () => {
  it('creates an account that can sign in, and audits it', async () => {
    const admin = await sessionFor('admin');
    const res = await call('POST', '/api/users', { cookie: admin, json: newUser(1) });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email: newUser(1).email, role: 'sonographer', active: true, version: 0 });
    expect(res.body.user).not.toHaveProperty('passwordHash');
    const stored = await User.findByPk(res.body.user.id);
    expect(stored!.passwordHash).toMatch(/^\$argon2id\$/);
    expect((await signIn(newUser(1).email, 'a long first password')).cookie).toBeDefined();
    expect(await AuditEvent.count({ where: { action: 'user.create', entityId: String(res.body.user.id) } })).toBe(1);
  });

  it('answers a taken e-mail with 409 naming the field', async () => {
    const res = await call('POST', '/api/users', { cookie: await sessionFor('admin'), json: newUser(2, { email: DEMO_LOGIN.frontdesk }) });
    expect(res.status).toBe(409);
    expect(res.body.error.fields).toHaveProperty('email');
  });

  it('requires a directory entry for a referring clinician account', async () => {
    const res = await call('POST', '/api/users', { cookie: await sessionFor('admin'), json: newUser(3, { role: 'referrer' }) });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('referrerId');
  });

  it('lists accounts paged, sorted and searched on the server', async () => {
    const admin = await sessionFor('admin');
    const page = await call('GET', '/api/users?pageSize=2&page=1&sort=email&dir=asc', { cookie: admin });
    expect(page.status).toBe(200);
    expect(page.body.rows).toHaveLength(2);
    expect(page.body.total).toBeGreaterThan(2);
    expect(page.body.rows[0].email < page.body.rows[1].email).toBe(true);
    const found = await call('GET', `/api/users?q=${encodeURIComponent('sonographer3@')}`, { cookie: admin });
    expect(found.body.rows.map((r: { email: string }) => r.email)).toEqual(['sonographer3@fernhollow.test']);
    const bad = await call('GET', '/api/users?pageSize=1000', { cookie: admin });
    expect(bad.status).toBe(400);
  });

  it('changes a role, refuses a stale version with 409, and audits the change', async () => {
    const admin = await sessionFor('admin');
    const created = (await call('POST', '/api/users', { cookie: admin, json: newUser(4) })).body.user;
    const first = await call('PATCH', `/api/users/${created.id}`, { cookie: admin, json: { version: created.version, role: 'radiologist' } });
    expect(first.status).toBe(200);
    expect(first.body.user).toMatchObject({ role: 'radiologist', version: created.version + 1 });
    const stale = await call('PATCH', `/api/users/${created.id}`, { cookie: admin, json: { version: created.version, active: false } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('STALE');
    expect((await User.findByPk(created.id))!.active).toBe(true);
    const events = await AuditEvent.findAll({ where: { action: 'user.update', entityId: String(created.id) } });
    expect(events).toHaveLength(1);
    expect(events[0]!.detail).toMatchObject({ role: { from: 'sonographer', to: 'radiologist' } });
  });

  it('refuses to let a manager deactivate themself (422)', async () => {
    const admin = await sessionFor('admin');
    const me = (await call('GET', '/api/me', { cookie: admin })).body.user;
    const row = await User.findByPk(me.id);
    const res = await call('PATCH', `/api/users/${me.id}`, { cookie: admin, json: { version: row!.version, active: false } });
    expect(res.status).toBe(422);
    expect((await User.findByPk(me.id))!.active).toBe(true);
  });

  it('unlocks a locked account', async () => {
    const admin = await sessionFor('admin');
    const created = (await call('POST', '/api/users', { cookie: admin, json: newUser(5) })).body.user;
    for (let i = 0; i < 5; i++) await signIn(created.email, 'wrong password!');
    expect((await signIn(created.email, 'a long first password')).code).toBe('locked');
    const row = await User.findByPk(created.id);
    const res = await call('PATCH', `/api/users/${created.id}`, { cookie: admin, json: { version: row!.version, unlock: true } });
    expect(res.status).toBe(200);
    expect((await signIn(created.email, 'a long first password')).cookie).toBeDefined();
  });

  it('404 for an account that does not exist, 400 for a malformed id', async () => {
    const admin = await sessionFor('admin');
    expect((await call('PATCH', '/api/users/987654', { cookie: admin, json: { version: 0, active: false } })).status).toBe(404);
    expect((await call('PATCH', '/api/users/abc', { cookie: admin, json: { version: 0, active: false } })).status).toBe(400);
  });
});

describe('own password change', () => {
  it('needs the current password and then works', async () => {
    const admin = await sessionFor('admin');
    const created = (await call('POST', '/api/users', { cookie: admin, json: newUser(6) })).body.user;
    const { cookie } = await signIn(created.email, 'a long first password');
    const wrong = await call('POST', '/api/account/password', {
      cookie,
      json: { currentPassword: 'nope', newPassword: 'my new long password', confirmPassword: 'my new long password' },
    });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields).toHaveProperty('currentPassword');
    const ok = await call('POST', '/api/account/password', {
      cookie,
      json: { currentPassword: 'a long first password', newPassword: 'my new long password', confirmPassword: 'my new long password' },
    });
    expect(ok.status).toBe(200);
    expect((await signIn(created.email, 'my new long password')).cookie).toBeDefined();
    expect((await signIn(created.email, 'a long first password')).code).toBe('invalid');
  });
});

import { encode } from '@auth/core/jwt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { User } from '../../src/db/models';
import { closeTestDb, testDb } from '../helpers/db';
import { testEnv } from '../helpers/env';
import { call, sessionFor } from '../helpers/http';
import { DEMO_LOGIN } from '../helpers/demo';

beforeAll(() => {
  testDb();
});
afterAll(closeTestDb);

const COOKIE = 'authjs.session-token';
async function forgedCookie(claims: Record<string, unknown>, secret = testEnv().authSecret): Promise<string> {
  const token = await encode({ token: claims, secret, salt: COOKIE, maxAge: 3600 });
  return `${COOKIE}=${token}`;
}

describe('API conventions', () => {
  it('health reports the database as up', async () => {
    const res = await call('GET', '/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', database: 'up' });
  });

  it('answers malformed JSON with 400 BAD_JSON and changes nothing', async () => {
    const before = await User.count({ where: {} });
    const res = await call('POST', '/api/users', { cookie: await sessionFor('admin'), rawBody: '{"email": "half' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('BAD_JSON');
    expect(await User.count()).toBe(before);
  });

  it('answers a body that fails the schema with 400 and a message per field', async () => {
    const res = await call('POST', '/api/users', {
      cookie: await sessionFor('admin'),
      json: { email: 'not-an-email', displayName: 'X', role: 'wizard', password: 'short' },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('VALIDATION');
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['displayName', 'email', 'password', 'role']);
  });

  it('refuses a body that is not JSON with 415', async () => {
    const res = await call('POST', '/api/users', { cookie: await sessionFor('admin'), rawBody: 'email=a', headers: { 'Content-Type': 'text/plain' } });
    expect(res.status).toBe(415);
  });

  it('answers an unknown route under /api with 404, not a page', async () => {
    const res = await call('GET', '/api/no-such-thing', { cookie: await sessionFor('admin') });
    expect(res.status).toBe(404);
  });

  it('ignores a role claim in the token: the role comes from the user row', async () => {
    const desk = await User.findOne({ where: { email: DEMO_LOGIN.frontdesk } });
    const cookie = await forgedCookie({ sub: String(desk!.id), role: 'admin' });
    expect((await call('GET', '/api/me', { cookie })).body.user.role).toBe('frontdesk');
    expect((await call('GET', '/api/users', { cookie })).status).toBe(403);
  });

  it('treats an unknown role claim, an unknown user or a foreign signature as signed out', async () => {
    expect((await call('GET', '/api/me', { cookie: await forgedCookie({ sub: '99999999', role: 'superuser' }) })).status).toBe(401);
    expect((await call('GET', '/api/me', { cookie: await forgedCookie({ role: 'admin' }) })).status).toBe(401);
    const admin = await User.findOne({ where: { email: DEMO_LOGIN.admin } });
    const foreign = await forgedCookie({ sub: String(admin!.id) }, 'another-secret-another-secret-another-secret');
    expect((await call('GET', '/api/me', { cookie: foreign })).status).toBe(401);
    expect((await call('GET', '/api/me', { cookie: `${COOKIE}=garbage.garbage.garbage` })).status).toBe(401);
  });

  it('sends security headers and never caches answers', async () => {
    const res = await call('GET', '/api/me', { cookie: await sessionFor('sonographer') });
    expect(res.headers.get('cache-control')).toBe('no-store');
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('x-request-id')).toMatch(/[0-9a-f-]{36}/);
  });
});

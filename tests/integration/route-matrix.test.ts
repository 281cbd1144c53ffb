import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROLES, type Role } from '../../src/lib/roles';
import { call, sessionFor } from '../helpers/http';
import { apiFiles, METHODS, pageFiles, pageRoles, ROOT, urlFor } from '../helpers/routes';

// Every endpoint file is found on disk, so a new endpoint is covered the day it is added.
const endpoints = await Promise.all(
  apiFiles().map(async (file) => {
    const mod = (await import(file)) as Record<string, unknown>;
    const methods = METHODS.filter((m) => typeof mod[m] === 'function').map((m) => ({
      method: m,
      roles: (mod[m] as { roles?: readonly Role[] | 'public' }).roles,
    }));
    return { file: path.relative(ROOT, file), url: urlFor(file), methods };
  }),
);

describe('every API endpoint states its roles', () => {
  it('finds the endpoints', () => {
    expect(endpoints.length).toBeGreaterThanOrEqual(4);
  });
  for (const e of endpoints) {
    for (const m of e.methods) {
      it(`${m.method} ${e.url} (${e.file}) is built with endpoint() and lists its roles`, () => {
        expect(m.roles === 'public' || (Array.isArray(m.roles) && m.roles.length > 0)).toBe(true);
      });
    }
  }
});

describe('the server enforces those roles', () => {
  for (const e of endpoints) {
    for (const m of e.methods) {
      if (m.roles === 'public' || !m.roles) continue;
      const allowed = m.roles;
      it(`${m.method} ${e.url}: 401 without a session`, async () => {
        const res = await call(m.method, e.url, m.method === 'GET' ? {} : { json: {} });
        expect(res.status).toBe(401);
        expect(res.body.error.code).toBe('UNAUTHENTICATED');
      });
      for (const role of ROLES) {
        const ok = allowed.includes(role);
        it(`${m.method} ${e.url}: ${ok ? 'lets in' : '403 for'} ${role}`, async () => {
          const res = await call(m.method, e.url, { cookie: await sessionFor(role), ...(m.method === 'GET' ? {} : { json: {} }) });
          if (ok) expect([401, 403]).not.toContain(res.status);
          else {
            expect(res.status).toBe(403);
            expect(res.body.error.code).toBe('FORBIDDEN');
          }
        });
      }
    }
  }
});

const PUBLIC_PAGES = new Set(['/signin', '/404', '/500', '/forbidden']);
// Pages of things a user owns (a referrer's reports and report links): an allowed role gets
// 404 for id 1 unless it happens to be theirs; tests/integration/delivery.test.ts covers them.
const OWNED_PAGES = new Set(['/r/1', '/reports/1']);

describe('every page states its roles, and the server enforces them', () => {
  for (const file of pageFiles()) {
    const url = urlFor(file);
    if (PUBLIC_PAGES.has(url)) continue;
    const roles = pageRoles(file);
    it(`${url} has a role gate`, () => {
      expect(roles).toBeDefined();
    });
    it(`${url} sends a signed-out visitor to sign in`, async () => {
      const res = await call('GET', url);
      expect(res.status).toBe(303);
      expect(res.headers.get('location')).toMatch(/\/signin\?next=/);
    });
    for (const role of ROLES) {
      const allowed = roles === 'any' || (roles ?? []).includes(role);
      it(`${url}: ${allowed ? 'shows' : 'refuses (403)'} ${role}`, async () => {
        const res = await call('GET', url, { cookie: await sessionFor(role) });
        if (allowed && OWNED_PAGES.has(url)) expect([200, 404]).toContain(res.status);
        else expect(res.status).toBe(allowed ? 200 : 403);
      });
    }
  }
});

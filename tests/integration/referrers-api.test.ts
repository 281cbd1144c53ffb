import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Referrer } from '../../src/db/models';
import { closeTestDb, testDb } from '../helpers/db';
import { call, sessionFor } from '../helpers/http';

beforeAll(() => {
  testDb();
});
afterAll(closeTestDb);

const stamp = Date.now();
const entry = (n: number, extra: Record<string, unknown> = {}) => ({
  name: `Dr Test Referrer ${stamp}-${n}`,
  practice: `Cobalt Lane Practice ${stamp}`,
  email: `referrer-${stamp}-${n}@tests.test`,
  phone: '+1 555 0177 001',
  ...extra,
});

describe('referring clinician directory', () => {
  it('adds an entry and audits it', async () => {
    const res = await call('POST', '/api/referrers', { cookie: await sessionFor('frontdesk'), json: entry(1, { email: ` Referrer-${stamp}-1@Tests.TEST ` }) });
    expect(res.status).toBe(201);
    expect(res.body.referrer).toMatchObject({ ...entry(1), active: true, version: 0 });
    const events = await AuditEvent.findAll({ where: { action: 'referrer.create', entityId: String(res.body.referrer.id) } });
    expect(events.map((e) => e.detail)).toEqual([{ fields: ['name', 'practice', 'email', 'phone'] }]);
  });

  it('answers an e-mail already in the directory with 409 naming the field, in any case', async () => {
    const desk = await sessionFor('frontdesk');
    await call('POST', '/api/referrers', { cookie: desk, json: entry(2) });
    const before = await Referrer.count();
    const res = await call('POST', '/api/referrers', { cookie: desk, json: entry(3, { email: entry(2).email.toUpperCase() }) });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('CONFLICT');
    expect(res.body.error.fields).toHaveProperty('email');
    expect(await Referrer.count()).toBe(before);
  });

  it('refuses to change an e-mail into one another entry uses', async () => {
    const desk = await sessionFor('frontdesk');
    const a = (await call('POST', '/api/referrers', { cookie: desk, json: entry(4) })).body.referrer;
    const b = (await call('POST', '/api/referrers', { cookie: desk, json: entry(5) })).body.referrer;
    const res = await call('PATCH', `/api/referrers/${b.id}`, { cookie: desk, json: { version: b.version, email: a.email } });
    expect(res.status).toBe(409);
    expect(res.body.error.fields).toHaveProperty('email');
    expect((await Referrer.findByPk(b.id))!.email).toBe(b.email);
    // Its own e-mail, unchanged, is not a clash.
    expect((await call('PATCH', `/api/referrers/${b.id}`, { cookie: desk, json: { version: b.version, email: b.email, phone: '' } })).status).toBe(200);
  });

  it('edits with the version seen, refuses a stale one and keeps the row', async () => {
    const desk = await sessionFor('admin');
    const r = (await call('POST', '/api/referrers', { cookie: desk, json: entry(6) })).body.referrer;
    const ok = await call('PATCH', `/api/referrers/${r.id}`, { cookie: desk, json: { version: r.version, practice: 'Birch Court Medical Group' } });
    expect(ok.status).toBe(200);
    expect(ok.body.referrer).toMatchObject({ practice: 'Birch Court Medical Group', version: r.version + 1 });
    const stale = await call('PATCH', `/api/referrers/${r.id}`, { cookie: desk, json: { version: r.version, name: 'Dr Someone Else' } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('STALE');
    expect(stale.body.error.message).toMatch(/^Someone else changed/);
    expect((await Referrer.findByPk(r.id))!.name).toBe(r.name);
    const events = await AuditEvent.findAll({ where: { action: 'referrer.update', entityId: String(r.id) } });
    expect(events.map((e) => e.detail)).toEqual([{ fields: ['practice'] }]);
  });

  it('deactivates instead of deleting, and the picker leaves deactivated entries out', async () => {
    const desk = await sessionFor('frontdesk');
    const r = (await call('POST', '/api/referrers', { cookie: desk, json: entry(7) })).body.referrer;
    const off = await call('PATCH', `/api/referrers/${r.id}`, { cookie: desk, json: { version: r.version, active: false } });
    expect(off.body.referrer).toMatchObject({ active: false, version: r.version + 1 });
    expect((await call('DELETE', `/api/referrers/${r.id}`, { cookie: desk })).status).not.toBe(200);
    expect(await Referrer.findByPk(r.id)).not.toBeNull();

    const q = encodeURIComponent(entry(7).name);
    expect((await call('GET', `/api/referrers?active=true&q=${q}`, { cookie: desk })).body.total).toBe(0);
    expect((await call('GET', `/api/referrers?active=false&q=${q}`, { cookie: desk })).body.rows.map((x: { id: number }) => x.id)).toEqual([r.id]);
    expect((await call('GET', `/api/referrers?q=${q}`, { cookie: desk })).body.total).toBe(1);
    const event = await AuditEvent.findOne({ where: { action: 'referrer.update', entityId: String(r.id) } });
    expect(event!.detail).toEqual({ fields: [], active: { from: true, to: false } });
  });

  it('searches name, practice and e-mail, pages, and answers in the picker shape', async () => {
    const desk = await sessionFor('frontdesk');
    for (const n of [8, 9, 10]) await call('POST', '/api/referrers', { cookie: desk, json: entry(n) });
    const byPractice = await call('GET', `/api/referrers?active=true&q=${encodeURIComponent(`Cobalt Lane Practice ${stamp}`)}&pageSize=2&sort=email`, { cookie: desk });
    expect(byPractice.status).toBe(200);
    expect(byPractice.body.total).toBeGreaterThanOrEqual(6);
    expect(byPractice.body.rows).toHaveLength(2);
    expect(Object.keys(byPractice.body.rows[0]).sort()).toEqual(['active', 'email', 'id', 'name', 'phone', 'practice', 'version']);
    // Sorted by the database's collation: descending is ascending reversed, and paging follows it.
    const all = async (dir: string) =>
      (await call('GET', `/api/referrers?q=${encodeURIComponent(`Cobalt Lane Practice ${stamp}`)}&pageSize=100&sort=email&dir=${dir}`, { cookie: desk })).body.rows.map(
        (x: { email: string }) => x.email,
      );
    const asc = await all('asc');
    expect(await all('desc')).toEqual([...asc].reverse());
    expect(asc.slice(0, 2)).toEqual(byPractice.body.rows.map((x: { email: string }) => x.email));
    const byEmail = await call('GET', `/api/referrers?q=${encodeURIComponent(`referrer-${stamp}-9@`)}`, { cookie: desk });
    expect(byEmail.body.rows.map((x: { email: string }) => x.email)).toEqual([entry(9).email]);
    // Words may come from different columns.
    const mixed = await call('GET', `/api/referrers?q=${encodeURIComponent(`${stamp}-10 cobalt`)}`, { cookie: desk });
    expect(mixed.body.rows.map((x: { email: string }) => x.email)).toEqual([entry(10).email]);
    expect((await call('GET', '/api/referrers?q=%25', { cookie: desk })).body.total).toBe(0);
    expect((await call('GET', '/api/referrers?active=yes', { cookie: desk })).status).toBe(400);
    // An empty q, as the picker sends before anything is typed, lists everyone active.
    expect((await call('GET', '/api/referrers?active=true&q=', { cookie: desk })).body.total).toBe(await Referrer.count({ where: { active: true } }));
  });

  it('validates input with a message per field', async () => {
    const res = await call('POST', '/api/referrers', { cookie: await sessionFor('frontdesk'), json: { name: '', practice: 'P', email: 'nope', phone: 'ring' } });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['email', 'name', 'phone', 'practice']);
  });

  it('clinical staff read the directory but cannot change it; a referring clinician cannot read it', async () => {
    const some = (await Referrer.findOne())!;
    for (const role of ['sonographer', 'radiologist'] as const) {
      const cookie = await sessionFor(role);
      expect((await call('GET', '/api/referrers?active=true', { cookie })).status).toBe(200);
      expect((await call('POST', '/api/referrers', { cookie, json: entry(50) })).status).toBe(403);
      expect((await call('PATCH', `/api/referrers/${some.id}`, { cookie, json: { version: some.version, active: false } })).status).toBe(403);
      expect((await call('GET', '/referrers', { cookie })).status).toBe(403);
    }
    expect((await call('GET', '/api/referrers', { cookie: await sessionFor('referrer') })).status).toBe(403);
    expect((await Referrer.findByPk(some.id))!.active).toBe(true);
  });
});

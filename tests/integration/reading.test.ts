import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op } from 'sequelize';
import { AuditEvent, Report, User } from '../../src/db/models';
import { hashPassword } from '../../src/server/auth/password';
import { signedContent } from '../../src/server/services/reading';
import { closeTestDb, testDb } from '../helpers/db';
import { call, sessionFor, signIn } from '../helpers/http';

// The demo clinic seeds preliminary reports (scanned exams waiting for a reading physician);
// each test takes its own, in id order. Integration files run one at a time.
let queue: Report[] = [];
const next = () => queue.shift()!;
const SECOND_READER = { email: 'second-reader@tests.test', password: 'a second reader password' };
let reader: string;
let secondReader: string;

beforeAll(async () => {
  testDb();
  queue = await Report.findAll({ where: { status: 'preliminary', claimedBy: null }, order: [['id', 'ASC']], limit: 12 });
  expect(queue.length).toBeGreaterThanOrEqual(8);
  reader = await sessionFor('radiologist');
  if (!(await User.findOne({ where: { email: SECOND_READER.email } }))) {
    await User.create({ email: SECOND_READER.email, displayName: 'Dr Second Reader', role: 'radiologist', passwordHash: await hashPassword(SECOND_READER.password), active: true } as never);
  }
  secondReader = (await signIn(SECOND_READER.email, SECOND_READER.password)).cookie!;
});
afterAll(closeTestDb);

const PASSWORD = 'crestline-demo';
const put = (id: number, cookie: string, json: unknown) => call('PUT', `/api/reports/${id}/reading`, { cookie, json });
const sign = (id: number, cookie: string, json: unknown) => call('POST', `/api/reports/${id}/sign`, { cookie, json });

describe('claiming from the reading queue', () => {
  it('opening claims the report; another physician sees who reads it and takes over only when asked', async () => {
    const r = next();
    const first = await call('POST', `/api/reports/${r.id}/claim`, { cookie: reader, json: {} });
    expect(first.status).toBe(200);
    expect(first.body.report.claimedBy.name).toMatch(/\S/);
    const other = await call('POST', `/api/reports/${r.id}/claim`, { cookie: secondReader, json: {} });
    expect(other.body.report.claimedBy.id).toBe(first.body.report.claimedBy.id);
    const taken = await call('POST', `/api/reports/${r.id}/claim`, { cookie: secondReader, json: { takeOver: true } });
    expect(taken.body.report.claimedBy.name).toBe('Dr Second Reader');
    const events = await AuditEvent.findAll({ where: { entityType: 'report', entityId: String(r.id), action: { [Op.in]: ['report.claim', 'report.take-over'] } } });
    expect(events.map((e) => e.action).sort()).toEqual(['report.claim', 'report.take-over']);
  });
});

describe('the physician’s text is sanitized on the server', () => {
  it('strips script tags, event handlers, links and javascript: URLs, keeping headings, lists and bold', async () => {
    const r = next();
    const res = await put(r.id, reader, {
      version: r.version,
      findingsHtml:
        '<h2 onclick="steal()">Thyroid</h2><p>Normal size.<script>fetch("/x")</script></p><ul><li><b>Right</b> lobe <a href="javascript:alert(1)">here</a></li></ul><img src=x onerror="alert(1)"><p style="color:red">Plain</p>',
      impressionHtml: '<p>No suspicious nodule.</p><iframe src="https://example.test"></iframe>',
    });
    expect(res.status).toBe(200);
    const stored = (await Report.findByPk(r.id))!;
    expect(stored.findingsHtml).toBe('<h2>Thyroid</h2><p>Normal size.</p><ul><li><strong>Right</strong> lobe here</li></ul><p>Plain</p>');
    expect(stored.impressionHtml).toBe('<p>No suspicious nodule.</p>');
    for (const bad of ['script', 'onclick', 'onerror', 'javascript:', '<a', 'style=', 'iframe', '<img']) expect(stored.findingsHtml! + stored.impressionHtml!).not.toContain(bad);
    expect(res.body.report.version).toBe(r.version + 1);
  });

  it('refuses a stale save with the current report, and text that is too long', async () => {
    const r = next();
    expect((await put(r.id, reader, { version: r.version, findingsHtml: '<p>A</p>', impressionHtml: '<p>B</p>' })).status).toBe(200);
    const stale = await put(r.id, reader, { version: r.version, findingsHtml: '<p>C</p>', impressionHtml: '<p>D</p>' });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('STALE');
    expect(stale.body.error.current.impressionHtml).toBe('<p>B</p>');
    const long = await put(r.id, reader, { version: r.version + 1, findingsHtml: 'x'.repeat(40_001), impressionHtml: '' });
    expect(long.status).toBe(400);
    expect(long.body.error.fields.findingsHtml).toMatch(/too long/);
  });
});

describe('signing', () => {
  it('asks for the password again, needs an impression, then stores signer, time and the hash of what was signed', async () => {
    const r = next();
    const wrong = await sign(r.id, reader, { version: r.version, password: 'not my password' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields.password).toBeTruthy();
    const noImpression = await sign(r.id, reader, { version: r.version, password: PASSWORD });
    expect(noImpression.status).toBe(400);
    expect(noImpression.body.error.fields.impressionHtml).toMatch(/impression/i);
    expect((await Report.findByPk(r.id))!.status).toBe('preliminary');

    const saved = await put(r.id, reader, { version: r.version, findingsHtml: '', impressionHtml: '<p>Normal examination.</p>' });
    const ok = await sign(r.id, reader, { version: saved.body.report.version, password: PASSWORD });
    expect(ok.status).toBe(200);
    expect(ok.body.report.status).toBe('final');
    const row = (await Report.findByPk(r.id))!;
    expect(row.signedBy).not.toBeNull();
    expect(row.signedAt).toBeInstanceOf(Date);
    // An empty findings box means "keep the generated findings": they are fixed at signing.
    expect(row.findingsHtml).toContain('<p>');
    const signer = (await User.findByPk(row.signedBy!))!;
    const expected = createHash('sha256')
      .update(signedContent({ report: row, findingsHtml: row.findingsHtml!, impressionHtml: row.impressionHtml!, signer: { id: signer.id, name: signer.displayName }, signedAt: row.signedAt! }))
      .digest('hex');
    expect(row.signedHash).toBe(expected);
    const audit = await AuditEvent.findOne({ where: { action: 'report.sign', entityId: String(r.id) } });
    expect(audit!.detail).toMatchObject({ sha256: expected });
    expect((await AuditEvent.count({ where: { action: 'report.sign-refused', entityId: String(r.id) } }))).toBe(1);
  });

  it('two physicians signing the same report at once: exactly one succeeds, the other gets 409', async () => {
    const r = next();
    const saved = await put(r.id, reader, { version: r.version, findingsHtml: '<p>Findings.</p>', impressionHtml: '<p>Impression.</p>' });
    const v = saved.body.report.version;
    const [a, b] = await Promise.all([
      sign(r.id, reader, { version: v, password: PASSWORD }),
      sign(r.id, secondReader, { version: v, password: SECOND_READER.password }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    expect((await AuditEvent.count({ where: { action: 'report.sign', entityId: String(r.id) } }))).toBe(1);
  });
});

describe('a signed report can never be edited', () => {
  let signed: Report;
  beforeAll(async () => {
    const r = next();
    const saved = await put(r.id, reader, { version: r.version, findingsHtml: '<p>Signed findings.</p>', impressionHtml: '<p>Signed impression.</p>' });
    expect((await sign(r.id, reader, { version: saved.body.report.version, password: PASSWORD })).status).toBe(200);
    signed = (await Report.findByPk(r.id))!;
  });

  it('the API refuses (409), whatever the version', async () => {
    const res = await put(signed.id, reader, { version: signed.version, findingsHtml: '<p>Changed.</p>', impressionHtml: '<p>Changed.</p>' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('SIGNED');
    const again = await sign(signed.id, reader, { version: signed.version, password: PASSWORD });
    expect(again.status).toBe(409);
    const draft = await call('PUT', `/api/reports/${signed.id}/draft`, { cookie: await sessionFor('sonographer'), json: { version: signed.version, measurements: {}, nodules: [], heightCm: null, weightKg: null, probeId: null } });
    expect(draft.status).toBe(409);
    expect((await Report.findByPk(signed.id))!.impressionHtml).toBe('<p>Signed impression.</p>');
  });

  it('the database refuses too: content, signature, a step back to preliminary, and deleting', async () => {
    const sql = testDb();
    for (const statement of [
      `UPDATE reports SET impression_html = '<p>Tampered.</p>' WHERE id = ${signed.id}`,
      `UPDATE reports SET measurements = '{}' WHERE id = ${signed.id}`,
      `UPDATE reports SET signed_hash = REPEAT('0', 64) WHERE id = ${signed.id}`,
      `UPDATE reports SET signed_at = NULL WHERE id = ${signed.id}`,
      `UPDATE reports SET status = 'preliminary' WHERE id = ${signed.id}`,
      `DELETE FROM reports WHERE id = ${signed.id}`,
    ]) {
      await expect(sql.query(statement), statement).rejects.toThrow(/signed report cannot be/);
    }
    // What an addendum will do is still allowed: the status moves on, the version counts.
    await sql.query(`UPDATE reports SET status = 'amended', version = version + 1 WHERE id = ${signed.id}`);
    const row = (await Report.findByPk(signed.id))!;
    expect(row.status).toBe('amended');
    expect(row.impressionHtml).toBe('<p>Signed impression.</p>');
    expect(row.signedHash).toBe(signed.signedHash);
  });
});

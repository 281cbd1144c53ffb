import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op, QueryTypes } from 'sequelize';
import { AuditEvent, OutboxMessage, Referrer, Report, ReportLink, User } from '../../src/db/models';
import { hashPassword } from '../../src/server/auth/password';
import { deliverDueMail } from '../../src/server/jobs/outbox';
import { createTransport } from '../../src/server/mail/transport';
import { closeTestDb, testDb } from '../helpers/db';
import { call, sessionFor, signIn } from '../helpers/http';

// Preliminary demo reports referred by the demo referrer's practice, from the middle of the list
// (tests/integration/reading.test.ts takes the first ones, the PDF test the last ones).
let mine: number[] = [];
let demoReferrer: User;
let otherReferrerCookie: string;
const maildev = () => process.env.MAILDEV_URL!;
const smtp = () => createTransport({ host: '127.0.0.1', port: Number(process.env.SMTP_PORT), secure: false });
interface Caught { subject: string; to: Array<{ address: string }>; html: string; text: string }

beforeAll(async () => {
  testDb();
  demoReferrer = (await User.findOne({ where: { role: 'referrer', email: 'referrer@fernhollow.test' } }))!;
  const rows = await testDb().query<{ id: number }>(
    `SELECT r.id FROM reports r JOIN exams e ON e.id = r.exam_id WHERE r.status = 'preliminary' AND e.referrer_id = ? ORDER BY r.id`,
    { replacements: [demoReferrer.referrerId], type: QueryTypes.SELECT },
  );
  mine = rows.slice(Math.floor(rows.length / 2) - 1).map((r) => r.id);
  expect(mine.length).toBeGreaterThanOrEqual(3);
  // A second referring clinician with an account of their own.
  const other = (await Referrer.findOne({ where: { id: { [Op.ne]: demoReferrer.referrerId! } }, order: [['id', 'ASC']] }))!;
  const email = 'other-referrer@tests.test';
  if (!(await User.findOne({ where: { email } }))) {
    await User.create({ email, displayName: 'Dr Other Practice', role: 'referrer', referrerId: other.id, passwordHash: await hashPassword('another referrer password'), active: true } as never);
  }
  otherReferrerCookie = (await signIn(email, 'another referrer password')).cookie!;
});
afterAll(closeTestDb);

async function signed(reportId: number, impression: string): Promise<void> {
  const reader = await sessionFor('radiologist');
  const r = (await Report.findByPk(reportId))!;
  const saved = await call('PUT', `/api/reports/${reportId}/reading`, { cookie: reader, json: { version: r.version, findingsHtml: '', impressionHtml: `<p>${impression}</p>` } });
  expect(saved.status).toBe(200);
  const res = await call('POST', `/api/reports/${reportId}/sign`, { cookie: reader, json: { version: saved.body.report.version, password: 'crestline-demo' } });
  expect(res.status).toBe(200);
}

/** Sends what the outbox holds and returns the report e-mail for this accession number. */
async function deliveredFor(accession: string): Promise<Caught> {
  await deliverDueMail(smtp(), { workerId: 'test-delivery', batch: 10_000 });
  const inbox = (await (await fetch(`${maildev()}/email`)).json()) as Caught[];
  // The newest one: the catcher may hold an older e-mail for the same accession number.
  const mail = inbox.findLast((m) => m.subject.includes(accession));
  expect(mail, `no e-mail for ${accession}`).toBeDefined();
  return mail!;
}

const linkPath = (mail: Caught) => /\/r\/[A-Za-z0-9_-]{40,}/.exec(mail.text)![0];

describe('delivery of the final report to the referring clinician', () => {
  let path: string;
  let reportId: number;
  const impression = 'Marker impression: mild hepatic steatosis';

  beforeAll(async () => {
    reportId = mine[0]!;
    await signed(reportId, impression);
    const msg = (await OutboxMessage.findOne({ where: { kind: 'report-ready' }, order: [['id', 'DESC']] }))!;
    const accession = /reference (\S+?)[).]/.exec(msg.textBody)![1]!;
    const mail = await deliveredFor(accession);
    path = linkPath(mail);
    expect(mail.to[0]!.address).toBe((await Referrer.findByPk(demoReferrer.referrerId!))!.email);
    // Ready, and where to read it; never what it says, nor whose it is.
    expect(mail.text + mail.html).not.toContain('steatosis');
    const report = (await Report.findByPk(reportId))!;
    for (const sentence of (report.findingsText ?? '').split('\n').filter(Boolean)) expect(mail.text).not.toContain(sentence);
  });

  it('stores only the hash of the link token, with an expiry from the clinic setting', async () => {
    const token = path.split('/').pop()!;
    const link = (await ReportLink.findOne({ where: { reportId } }))!;
    expect(link.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(link.tokenHash).not.toContain(token);
    const days = (link.expiresAt.getTime() - link.createdAt.getTime()) / 86_400_000;
    expect(days).toBeCloseTo(30, 0); // DEFAULT_REPORT_DELIVERY.linkDays
  });

  it('sends a signed-out visitor to sign in first', async () => {
    const res = await call('GET', path);
    expect([302, 303]).toContain(res.status);
    expect(res.headers.get('location')).toMatch(/\/signin/);
  });

  it('opens the report for its referrer, and counts and audits each opening', async () => {
    const referrer = await sessionFor('referrer');
    const first = await call('GET', path, { cookie: referrer });
    expect(first.status).toBe(303);
    expect(first.headers.get('location')).toBe(`/reports/${reportId}`);
    const page = await call('GET', `/reports/${reportId}`, { cookie: referrer });
    expect(page.status).toBe(200);
    expect(page.body).toContain(impression);
    await call('GET', path, { cookie: referrer });
    const link = (await ReportLink.findOne({ where: { reportId } }))!;
    expect(link.openCount).toBe(2);
    expect(link.firstOpenedAt).not.toBeNull();
    expect(await AuditEvent.count({ where: { action: 'report.link-open', entityId: String(reportId) } })).toBe(2);
    expect(await AuditEvent.count({ where: { action: 'report.view', entityId: String(reportId), actorUserId: demoReferrer.id } })).toBeGreaterThanOrEqual(1);
  });

  it('is 404 for another referrer, by link and by address, and 404 for a report not yet signed', async () => {
    expect((await call('GET', path, { cookie: otherReferrerCookie })).status).toBe(404);
    expect((await call('GET', `/reports/${reportId}`, { cookie: otherReferrerCookie })).status).toBe(404);
    expect((await call('GET', `/reports/${mine[1]}`, { cookie: await sessionFor('referrer') })).status).toBe(404);
    expect((await call('GET', '/r/not-a-real-token-but-long-enough', { cookie: await sessionFor('referrer') })).status).toBe(404);
    // The PDF follows the same rule: theirs only, and only once signed.
    expect((await call('GET', `/api/reports/${reportId}/pdf`, { cookie: await sessionFor('referrer') })).status).toBe(200);
    expect((await call('GET', `/api/reports/${reportId}/pdf`, { cookie: otherReferrerCookie })).status).toBe(404);
    expect((await call('GET', `/api/reports/${mine[1]}/pdf`, { cookie: await sessionFor('referrer') })).status).toBe(404);
  });

  it('stops working when its time is past', async () => {
    await testDb().query(`UPDATE report_links SET expires_at = NOW() - INTERVAL 1 MINUTE WHERE report_id = ${reportId}`);
    const res = await call('GET', path, { cookie: await sessionFor('referrer') });
    expect(res.status).toBe(410);
    expect(res.body).toContain('This link has expired');
    expect(await AuditEvent.count({ where: { action: 'report.link-expired', entityId: String(reportId) } })).toBe(1);
  });
});

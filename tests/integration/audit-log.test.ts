import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { User } from '../../src/db/models';
import { listAuditEvents } from '../../src/server/services/audit-log';
import { closeTestDb, testDb } from '../helpers/db';
import { call, sessionFor } from '../helpers/http';

// Makes its own events, whatever ran before: the physician takes over a waiting report of one
// patient (from the end of the list, clear of the reports other test files sign).
let mrn: string;
let reportId: number;
let reader: User;

beforeAll(async () => {
  testDb();
  const [row] = await testDb().query<{ id: number; mrn: string }>(
    `SELECT r.id, p.mrn FROM reports r JOIN exams e ON e.id = r.exam_id JOIN patients p ON p.id = e.patient_id
      WHERE r.status = 'preliminary' ORDER BY r.id DESC LIMIT 1 OFFSET 6`,
    { type: QueryTypes.SELECT },
  );
  mrn = row!.mrn;
  reportId = row!.id;
  reader = (await User.findOne({ where: { email: 'reader@fernhollow.test' } }))!;
  expect((await call('POST', `/api/reports/${reportId}/claim`, { cookie: await sessionFor('radiologist'), json: { takeOver: true } })).status).toBe(200);
});
afterAll(closeTestDb);

describe('the audit trail, filtered', () => {
  it('by patient: events about their record, exams and reports, and nothing about anyone else', async () => {
    const { rows, patientFound } = await listAuditEvents({ page: 1, pageSize: 500, mrn });
    expect(patientFound).toBe(true);
    expect(rows.some((r) => r.entity === `report ${reportId}` && /^report\.(claim|take-over)$/.test(r.action))).toBe(true);
    const [ids] = await testDb().query(
      `SELECT p.id AS patient, GROUP_CONCAT(DISTINCT e.id) AS exams, GROUP_CONCAT(DISTINCT r.id) AS reports
         FROM patients p LEFT JOIN exams e ON e.patient_id = p.id LEFT JOIN reports r ON r.exam_id = e.id WHERE p.mrn = '${mrn}' GROUP BY p.id`,
    );
    const mine = ids as Array<{ patient: number; exams: string | null; reports: string | null }>;
    const allowed = new Set([`patient ${mine[0]!.patient}`, ...(mine[0]!.exams ?? '').split(',').map((id) => `exam ${id}`), ...(mine[0]!.reports ?? '').split(',').map((id) => `report ${id}`)]);
    for (const r of rows) expect(allowed.has(r.entity), r.entity).toBe(true);
  });

  it('by who, what and when together', async () => {
    const now = new Date();
    const { rows, total } = await listAuditEvents({ page: 1, pageSize: 50, actorId: reader.id, action: 'report', from: new Date(now.getTime() - 3_600_000), to: new Date(now.getTime() + 60_000) });
    expect(total).toBeGreaterThanOrEqual(1);
    for (const r of rows) {
      expect(r.actor).toBe(reader.displayName);
      expect(r.action.startsWith('report')).toBe(true);
    }
    const none = await listAuditEvents({ page: 1, pageSize: 50, actorId: reader.id, from: new Date(now.getTime() + 3_600_000) });
    expect(none.total).toBe(0);
  });

  it('records every view of a report, by page and by API, with who viewed it', async () => {
    const before = (await listAuditEvents({ page: 1, pageSize: 500, mrn, action: 'report.view' })).total;
    const [{ exam_id: examId }] = await testDb().query<{ exam_id: number }>(`SELECT exam_id FROM reports WHERE id = ${reportId}`, { type: QueryTypes.SELECT });
    expect((await call('GET', `/exams/${examId}/report`, { cookie: await sessionFor('radiologist') })).status).toBe(200);
    expect((await call('GET', `/api/reports/${reportId}`, { cookie: await sessionFor('admin') })).status).toBe(200);
    const after = await listAuditEvents({ page: 1, pageSize: 500, mrn, action: 'report.view' });
    expect(after.total).toBe(before + 2);
    expect(after.rows.slice(0, 2).map((r) => r.actor).sort()).toEqual([reader.displayName, (await User.findOne({ where: { email: 'manager@fernhollow.test' } }))!.displayName].sort());
  });

  it('says so when no patient has the MRN', async () => {
    expect(await listAuditEvents({ page: 1, pageSize: 50, mrn: 'NOPE-000' })).toEqual({ rows: [], total: 0, patientFound: false });
  });

  it('the page takes the same filters from its address', async () => {
    const res = await call('GET', `/admin/audit?mrn=${mrn}&action=report`, { cookie: await sessionFor('admin') });
    expect(res.status).toBe(200);
    expect(res.body).toContain(`report ${reportId}`);
    const unknown = await call('GET', '/admin/audit?mrn=NOPE-000', { cookie: await sessionFor('admin') });
    expect(unknown.body).toContain('No patient has the MRN NOPE-000.');
  });
});

import { createHash } from 'node:crypto';
import { PDFParse } from 'pdf-parse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { db } from '../../src/db/connection';
import { AuditEvent, OutboxMessage, Patient, Report, ReportLink, Setting, User } from '../../src/db/models';
import { queueDelivery } from '../../src/server/services/report-delivery';
import { at, book, bookingBody, catalog, testDay } from '../helpers/booking';
import { noduleGrowth, type NoduleAssessment, type NoduleInput } from '../../src/lib/clinical';
import { zonedDate, zonedClock } from '../../src/lib/time';
import { deliverDueMail } from '../../src/server/jobs/outbox';
import { createTransport } from '../../src/server/mail/transport';
import { signedContent } from '../../src/server/services/reading';
import { addendumContent } from '../../src/server/services/report-additions';
import type { StoredEvaluation } from '../../src/lib/schemas/reports';
import { CLINIC } from '../../seeders/demo-clinic-data';
import { closeTestDb, testDb } from '../helpers/db';
import { testEnv } from '../helpers/env';
import { call, sessionFor } from '../helpers/http';

// Addenda, urgent communications, the physician's corrections, priors in the engine, and the
// PDF attached to the referrer's e-mail. Each test takes its own seeded preliminary report,
// from the end of the id order with a stride (the reading tests take the first ones).
const PASSWORD = 'crestline-demo';
let reader: string;
let sonographer: string;

beforeAll(async () => {
  testDb();
  reader = await sessionFor('radiologist');
  sonographer = await sessionFor('sonographer');
});
afterAll(closeTestDb);

/** Preliminary reports nobody is reading, matching an extra SQL condition, newest first. */
async function preliminary(where = '1 = 1', params: unknown[] = []): Promise<Report[]> {
  const rows = await testDb().query<{ id: number }>(
    `SELECT r.id FROM reports r JOIN exams e ON e.id = r.exam_id WHERE r.status = 'preliminary' AND r.claimed_by IS NULL AND ${where} ORDER BY r.id DESC`,
    { replacements: params, type: QueryTypes.SELECT },
  );
  return Report.findAll({ where: { id: rows.map((r) => r.id) }, order: [['id', 'DESC']] });
}
const taken = new Set<number>();
async function take(where?: string, params?: unknown[]): Promise<Report> {
  const r = (await preliminary(where, params)).find((x) => !taken.has(x.id));
  expect(r, `no free preliminary report for ${where}`).toBeDefined();
  taken.add(r!.id);
  return r!;
}

async function sign(r: Report, impression = 'Signed for the additions tests.'): Promise<Report> {
  const saved = await call('PUT', `/api/reports/${r.id}/reading`, { cookie: reader, json: { version: r.version, findingsHtml: '', impressionHtml: `<p>${impression}</p>` } });
  expect(saved.status).toBe(200);
  const res = await call('POST', `/api/reports/${r.id}/sign`, { cookie: reader, json: { version: saved.body.report.version, password: PASSWORD } });
  expect(res.status).toBe(200);
  return (await Report.findByPk(r.id))!;
}
/** A fresh draft report: a thyroid exam booked on a test day of this file's own (40), checked in and started. */
let draftHour = 8;
async function draftReport(): Promise<Report> {
  const c = await catalog();
  const patient = (await Patient.findOne({ order: [['id', 'ASC']] }))!;
  const res = await book(bookingBody(c, { patientId: patient.id, start: at(testDay(40), draftHour++, 0), payer: 'insured', type: 'thyroid' }));
  expect(res.status).toBe(201);
  expect((await call('POST', `/api/exams/${res.body.exam.id}/status`, { cookie: await sessionFor('frontdesk'), json: { version: 0, to: 'arrived' } })).status).toBe(200);
  const started = await call('POST', `/api/exams/${res.body.exam.id}/start`, { cookie: sonographer, json: { version: 1 } });
  expect(started.status).toBe(200);
  return (await Report.findByPk(started.body.reportId))!;
}

const addendum = (id: number, json: unknown, cookie = reader) => call('POST', `/api/reports/${id}/addenda`, { cookie, json });

/** "Now" in the clinic as a datetime field gives it, shifted by `minutes`. */
const clinicNow = (minutes = 0) => {
  const d = new Date(Date.now() + minutes * 60_000);
  return `${zonedDate(d, CLINIC.timeZone)}T${zonedClock(d, CLINIC.timeZone)}`;
};

describe('addenda', () => {
  it('are signed with the password, chained to the report’s signature, move the report to amended and tell the referrer again', async () => {
    const r = await sign(await take('e.referrer_id IS NOT NULL'));
    expect((await addendum(r.id, { version: r.version, bodyHtml: '<p>Late note.</p>', password: 'not it' })).body.error.fields.password).toMatch(/not your password/);
    expect((await addendum(r.id, { version: r.version, bodyHtml: '<p> </p><script>x()</script>', password: PASSWORD })).body.error.fields.bodyHtml).toMatch(/Write the addendum/);
    const mailsBefore = await OutboxMessage.count({ where: { kind: 'report-ready' } });

    const first = await addendum(r.id, { version: r.version, bodyHtml: '<p>Compared with the outside study: <b>no change</b>.</p><img src=x onerror=alert(1)>', password: PASSWORD });
    expect(first.status).toBe(200);
    const a1 = first.body.report.addenda[0];
    expect(first.body.report.status).toBe('amended');
    expect(a1.bodyHtml).toBe('<p>Compared with the outside study: <strong>no change</strong>.</p>');
    expect(a1.signedBy).toBe('Dr Ansel Okonkwo');
    // The hash covers the text, signer and time, and the signature it follows (the report's own).
    const expected = createHash('sha256')
      .update(addendumContent({ reportId: r.id, follows: r.signedHash!, bodyHtml: a1.bodyHtml, signer: { id: r.signedBy!, name: a1.signedBy }, signedAt: new Date(a1.signedAt) }))
      .digest('hex');
    expect(a1.signedHash).toBe(expected);
    // What was signed before is untouched.
    const after = (await Report.findByPk(r.id))!;
    expect([after.impressionHtml, after.signedHash, after.signedAt?.toISOString()]).toEqual([r.impressionHtml, r.signedHash, r.signedAt?.toISOString()]);

    expect(await OutboxMessage.count({ where: { kind: 'report-ready' } })).toBe(mailsBefore + 1);
    const mail = (await OutboxMessage.findOne({ where: { kind: 'report-ready' }, order: [['id', 'DESC']] }))!;
    expect(mail.subject).toMatch(/^Report corrected/);
    expect(mail.textBody).not.toContain('no change');
    expect(await ReportLink.count({ where: { reportId: r.id, reason: 'addendum' } })).toBe(1);
    expect(await AuditEvent.count({ where: { entityType: 'report', entityId: String(r.id), action: 'report.addendum' } })).toBe(1);

    // A second addendum follows the first one's signature.
    const second = await addendum(r.id, { version: first.body.report.version, bodyHtml: '<p>Second note.</p>', password: PASSWORD });
    expect(second.status).toBe(200);
    const a2 = second.body.report.addenda[1];
    expect(a2.signedHash).toBe(
      createHash('sha256').update(addendumContent({ reportId: r.id, follows: a1.signedHash, bodyHtml: '<p>Second note.</p>', signer: { id: r.signedBy!, name: a2.signedBy }, signedAt: new Date(a2.signedAt) })).digest('hex'),
    );
  });

  it('two written against the same version: one is signed, the other gets 409; the database keeps them as written', async () => {
    const r = await sign(await take());
    const [a, b] = await Promise.all([
      addendum(r.id, { version: r.version, bodyHtml: '<p>First physician.</p>', password: PASSWORD }),
      addendum(r.id, { version: r.version, bodyHtml: '<p>Second physician.</p>', password: PASSWORD }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const stored = await testDb().query<{ id: number }>('SELECT id FROM report_addenda WHERE report_id = ?', { replacements: [r.id], type: QueryTypes.SELECT });
    expect(stored).toHaveLength(1);
    for (const statement of [`UPDATE report_addenda SET body_html = '<p>Changed.</p>' WHERE id = ${stored[0]!.id}`, `DELETE FROM report_addenda WHERE id = ${stored[0]!.id}`]) {
      await expect(testDb().query(statement), statement).rejects.toThrow(/part of a report/);
    }
  });

  it('are refused on a report not yet signed (409) and for anyone but a reading physician (403)', async () => {
    const r = await take();
    const res = await addendum(r.id, { version: r.version, bodyHtml: '<p>Too early.</p>', password: PASSWORD });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/not signed yet/);
    expect((await addendum(r.id, { version: r.version, bodyHtml: '<p>x</p>', password: PASSWORD }, sonographer)).status).toBe(403);
  });
});

describe('urgent findings communicated directly', () => {
  const record = (id: number, json: Record<string, unknown>) => call('POST', `/api/reports/${id}/communications`, { cookie: reader, json });
  const call1 = { finding: 'Abdominal aortic aneurysm 5.6 cm', recipientName: 'Dr Wren Castell', recipientRole: 'referring physician', method: 'telephone', readBack: true };

  it('are recorded with who, how, when and read-back; the signature covers them; the PDF carries the statement', async () => {
    const r = await take();
    const when = clinicNow(-5);
    const res = await record(r.id, { ...call1, communicatedAt: when });
    expect(res.status).toBe(200);
    const c = res.body.report.communications[0];
    expect(c).toMatchObject({ finding: call1.finding, recipientName: 'Dr Wren Castell', method: 'telephone', readBack: true, recordedBy: 'Dr Ansel Okonkwo' });
    expect(`${zonedDate(new Date(c.communicatedAt), CLINIC.timeZone)}T${zonedClock(new Date(c.communicatedAt), CLINIC.timeZone)}`).toBe(when);
    // The audit trail says a call was made, not what was said.
    const event = (await AuditEvent.findOne({ where: { entityType: 'report', entityId: String(r.id), action: 'report.communication' } }))!;
    expect(JSON.stringify(event.detail)).not.toContain('aneurysm');

    const signed = await sign((await Report.findByPk(r.id))!, 'AAA at the repair threshold.');
    const dto = (await call('GET', `/api/reports/${r.id}`, { cookie: reader })).body.report;
    const hash = createHash('sha256')
      .update(signedContent({ report: signed, findingsHtml: signed.findingsHtml!, impressionHtml: signed.impressionHtml!, communications: dto.communications, signer: { id: signed.signedBy!, name: dto.signedBy }, signedAt: signed.signedAt! }))
      .digest('hex');
    expect(signed.signedHash).toBe(hash);

    const text = await pdfText(r.id);
    expect(text).toContain('Direct communication of urgent findings');
    expect(text).toContain('Told to Dr Wren Castell (referring physician) by telephone');
    expect(text).toContain('the finding was read back');
  });

  it('need a time that has happened, a method and a finding; not on a draft; and are never changed afterwards', async () => {
    const r = await take();
    const future = await record(r.id, { ...call1, communicatedAt: clinicNow(90) });
    expect(future.status).toBe(400);
    expect(future.body.error.fields.communicatedAt).toMatch(/still to come/);
    const bad = await record(r.id, { ...call1, method: 'carrier pigeon', finding: '', communicatedAt: 'soon' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['communicatedAt', 'finding', 'method']);
    const draft = await draftReport();
    expect((await record(draft.id, { ...call1, communicatedAt: clinicNow(-1) })).status).toBe(409);

    const ok = await record(r.id, { ...call1, communicatedAt: clinicNow(-1) });
    const id = ok.body.report.communications[0].id;
    for (const statement of [`UPDATE report_communications SET read_back = 0 WHERE id = ${id}`, `DELETE FROM report_communications WHERE id = ${id}`]) {
      await expect(testDb().query(statement), statement).rejects.toThrow(/part of a report/);
    }
  });
});

async function pdfText(reportId: number): Promise<string> {
  const res = await fetch(`${testEnv().baseUrl}/api/reports/${reportId}/pdf`, { headers: { Cookie: reader } });
  expect(res.status).toBe(200);
  const parser = new PDFParse({ data: new Uint8Array(await res.arrayBuffer()) });
  try {
    return (await parser.getText()).text.replace(/\s+/g, ' ');
  } finally {
    await parser.destroy();
  }
}

describe('the reading physician corrects a measurement', () => {
  it('the engine runs again on the corrected entries; the audit names the fields changed; the sonographer cannot edit any more', async () => {
    const r = await take(`r.template_id = 'abdomen' AND JSON_EXTRACT(r.measurements, '$.aortaDiameterCm') < 3`);
    const body = { version: r.version, measurements: { ...r.measurements, aortaDiameterCm: 5.8 }, nodules: r.nodules, heightCm: r.heightCm, weightKg: r.weightKg, probeId: r.probeId };
    expect((await call('PUT', `/api/reports/${r.id}/draft`, { cookie: sonographer, json: body })).status).toBe(409);
    const res = await call('PUT', `/api/reports/${r.id}/draft`, { cookie: reader, json: body });
    expect(res.status).toBe(200);
    expect(res.body.report.status).toBe('preliminary');
    const stored = (await Report.findByPk(r.id))!;
    const evaluation = stored.evaluation as StoredEvaluation;
    const flag = evaluation.flags.find((f) => f.valueCode === 'aortaDiameterCm')!;
    // 5.8 cm is an aneurysm (≥ 3.0 cm, common practice; CLINICAL.md §2) and at the repair threshold for men and women alike (SVS/ESVS, SRC~).
    expect(flag.status).toBe('high');
    expect(evaluation.urgentPrompts.map((p) => p.ruleId)).toContain('aaa-repair-threshold');
    expect(stored.findingsText).toMatch(/5\.8 cm/);
    const event = (await AuditEvent.findOne({ where: { entityType: 'report', entityId: String(r.id), action: 'report.correct' } }))!;
    expect((event.detail as { changed: string[] }).changed).toEqual(['aortaDiameterCm']);
  });

  it('a draft stays the sonographer’s: the physician’s save is refused', async () => {
    const draft = await draftReport();
    const res = await call('PUT', `/api/reports/${draft.id}/draft`, { cookie: reader, json: { version: draft.version, measurements: draft.measurements, nodules: draft.nodules, heightCm: null, weightKg: null, probeId: null } });
    expect(res.status).toBe(409);
  });
});

describe('priors', () => {
  it('the engine judges nodule growth against the latest signed prior of the same patient, as the TI-RADS rule says', async () => {
    const rows = await testDb().query<{ id: number; prior_id: number }>(
      `SELECT r.id, (SELECT r2.id FROM exams e2 JOIN reports r2 ON r2.exam_id = e2.id WHERE e2.patient_id = e.patient_id AND r2.template_id = 'thyroid'
                     AND r2.status IN ('final', 'amended') AND e2.scheduled_start < e.scheduled_start ORDER BY e2.scheduled_start DESC LIMIT 1) AS prior_id
         FROM reports r JOIN exams e ON e.id = r.exam_id
        WHERE r.template_id = 'thyroid' AND r.status = 'preliminary' AND r.claimed_by IS NULL AND JSON_LENGTH(r.nodules) > 0 ORDER BY r.id DESC`,
      { type: QueryTypes.SELECT },
    );
    const pick = rows.find((x) => x.prior_id !== null && !taken.has(x.id));
    expect(pick, 'the demo seed gives some thyroid patients signed priors with nodules').toBeDefined();
    taken.add(pick!.id);
    const [r, prior] = [(await Report.findByPk(pick!.id))!, (await Report.findByPk(pick!.prior_id))!];
    // A correction re-runs the engine, now with the prior.
    const res = await call('PUT', `/api/reports/${r.id}/draft`, { cookie: reader, json: { version: r.version, measurements: r.measurements, nodules: r.nodules, heightCm: r.heightCm, weightKg: r.weightKg, probeId: r.probeId } });
    expect(res.status).toBe(200);
    const stored = (await Report.findByPk(r.id))!;
    for (const a of (stored.evaluation as StoredEvaluation).assessments.nodules as NoduleAssessment[]) {
      const now = (r.nodules as NoduleInput[]).find((n) => n.id === a.id)!;
      const before = (prior.nodules as NoduleInput[]).find((n) => n.id === a.id);
      if (!before) continue;
      expect(a.prior, a.id).not.toBeNull();
      expect(a.prior!.growth).toEqual(noduleGrowth(before, now));
    }
  });

  it('the reading page compares with the prior exams', async () => {
    const [row] = await testDb().query<{ exam_id: number }>(
      `SELECT e.id AS exam_id FROM reports r JOIN exams e ON e.id = r.exam_id WHERE r.status = 'preliminary' AND r.template_id = 'abdomen' AND EXISTS (
         SELECT 1 FROM exams e2 JOIN reports r2 ON r2.exam_id = e2.id WHERE e2.patient_id = e.patient_id AND r2.template_id = 'abdomen' AND r2.status = 'final' AND e2.scheduled_start < e.scheduled_start)
        ORDER BY r.id LIMIT 1`,
      { type: QueryTypes.SELECT },
    );
    const page = await call('GET', `/exams/${row!.exam_id}/report`, { cookie: reader });
    expect(page.status).toBe(200);
    expect(page.body).toContain('Comparison with prior exams');
    expect(page.body).toMatch(/data-testid="compare-aortaDiameterCm"/);
  });
});

describe('the PDF with the referrer’s e-mail', () => {
  it('goes attached when the clinic allows it (rendered when sent), and not otherwise', async () => {
    // Signed with the demo clinic's setting: no attachment.
    const r = await sign(await take('e.referrer_id IS NOT NULL'));
    const plain = (await OutboxMessage.findOne({ where: { kind: 'report-ready', examId: r.examId } }))!;
    expect(plain.attachReportId).toBeNull();
    // The clinic allows the PDF: the delivery queued now carries the report to attach.
    // (Queued here, in this process: the app server caches settings for half a minute.)
    const previous = await Setting.findByPk('reports.delivery');
    await Setting.upsert({ key: 'reports.delivery', value: { linkDays: 30, attachPdf: true } });
    try {
      const reader = (await User.findOne({ where: { email: 'reader@fernhollow.test' } }))!;
      await db().transaction((t) => queueDelivery({ reportId: r.id, reason: 'final', actorUserId: reader.id, requestId: 'test-attach' }, t));
    } finally {
      if (previous) await Setting.upsert({ key: 'reports.delivery', value: previous.value });
      else await Setting.destroy({ where: { key: 'reports.delivery' } });
    }
    const msg = (await OutboxMessage.findOne({ where: { kind: 'report-ready', attachReportId: r.id } }))!;
    expect(msg).not.toBeNull();
    const accession = /reference (\S+?)[).]/.exec(msg.textBody)![1]!;
    await deliverDueMail(createTransport({ host: '127.0.0.1', port: Number(process.env.SMTP_PORT), secure: false }), { workerId: 'test-attach', batch: 10_000 });
    const inbox = (await (await fetch(`${process.env.MAILDEV_URL}/email`)).json()) as Array<{ subject: string; attachments?: Array<{ contentType: string; fileName: string }> }>;
    const mails = inbox.filter((m) => m.subject.includes(accession));
    expect(mails.map((m) => (m.attachments ?? []).map((x) => [x.contentType, x.fileName])).sort((x, y) => x.length - y.length)).toEqual([[], [['application/pdf', `report-${accession}.pdf`]]]);
  });
});

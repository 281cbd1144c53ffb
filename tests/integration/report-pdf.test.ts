import { PDFParse } from 'pdf-parse';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Report, User } from '../../src/db/models';
import { CAUTION_TEXT } from '../../src/lib/caution';
import { REFERENCE_RANGES } from '../../src/lib/clinical';
import type { StoredEvaluation } from '../../src/lib/schemas/reports';
import { DEMO_LOGIN, DEMO_PASSWORD } from '../helpers/demo';
import { closeTestDb, testDb } from '../helpers/db';
import { testEnv } from '../helpers/env';
import { call, sessionFor } from '../helpers/http';

// Preliminary demo reports from the END of the list (tests/integration/reading.test.ts takes the
// first ones), leaving out the demo referrer's practice (tests/integration/delivery.test.ts signs
// from the middle of its list to the end).
interface Waiting {
  id: number;
  version: number;
  accession_number: string;
  family_name: string;
  given_name: string;
}
let waiting: Waiting[] = [];
/** Left unsigned for the 409 case; the others are candidates for signing. */
let unsigned: Waiting;
let reader: string;

beforeAll(async () => {
  testDb();
  const referrer = await User.findOne({ where: { email: DEMO_LOGIN.referrer } });
  waiting = await testDb().query<Waiting>(
    `SELECT r.id, r.version, e.accession_number, p.family_name, p.given_name
       FROM reports r JOIN exams e ON e.id = r.exam_id JOIN patients p ON p.id = e.patient_id
      WHERE r.status = 'preliminary' AND r.claimed_by IS NULL AND NOT (e.referrer_id <=> ?)
      ORDER BY r.id DESC LIMIT 6`,
    { replacements: [referrer?.referrerId ?? null], type: QueryTypes.SELECT },
  );
  expect(waiting.length).toBeGreaterThanOrEqual(2);
  unsigned = waiting.pop()!;
  reader = await sessionFor('radiologist');
});
afterAll(closeTestDb);

/** The PDF endpoint's raw answer (the shared `call` helper reads bodies as text). */
async function getPdf(reportId: number, cookie: string): Promise<{ status: number; headers: Headers; bytes: Buffer }> {
  const res = await fetch(`${testEnv().baseUrl}/api/reports/${reportId}/pdf`, { headers: { Cookie: cookie, Origin: testEnv().baseUrl }, redirect: 'manual' });
  return { status: res.status, headers: res.headers, bytes: Buffer.from(await res.arrayBuffer()) };
}

/** The PDF's text layer, whitespace collapsed (lines wrap wherever the layout breaks them). */
async function textOf(bytes: Buffer): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(bytes) });
  try {
    return (await parser.getText()).text.replace(/\s+/g, ' ');
  } finally {
    await parser.destroy();
  }
}

const flat = (text: string) => text.replace(/\s+/g, ' ').trim();

describe('the final report as a PDF', () => {
  it('a signed report: patient, impression, signer, fingerprint, accession, a flag’s source and the caution as real text', async () => {
    // The first waiting report whose stored evaluation has a reference check with a source.
    const sourced = async (w: Waiting) => ((await Report.findByPk(w.id))!.evaluation as StoredEvaluation | null)?.flags.find((f) => f.referenceId !== null);
    let report: Waiting | undefined;
    for (const w of waiting) {
      if (await sourced(w)) {
        report = w;
        break;
      }
    }
    if (!report) throw new Error('No waiting demo report has a reference check with a source.');
    const flag = (await sourced(report))!;

    const impression = `Left ventricle normal in size; no pericardial effusion (PDF check ${report.id}).`;
    const saved = await call('PUT', `/api/reports/${report.id}/reading`, {
      cookie: reader,
      json: { version: report.version, findingsHtml: '<h2>Summary</h2><ul><li><p>Measured values as tabulated.</p></li></ul>', impressionHtml: `<p>${impression}</p>` },
    });
    expect(saved.status).toBe(200);
    const signed = await call('POST', `/api/reports/${report.id}/sign`, { cookie: reader, json: { version: saved.body.report.version, password: DEMO_PASSWORD } });
    expect(signed.status).toBe(200);
    const row = (await Report.findByPk(report.id))!;
    const signer = (await User.findByPk(row.signedBy!))!;

    const res = await getPdf(report.id, reader);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/pdf');
    expect(res.headers.get('content-disposition')).toContain(`inline; filename="report-${report.accession_number}.pdf"`);
    expect(res.headers.get('cache-control')).toBe('private, no-store');
    expect(res.bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');

    const text = await textOf(res.bytes);
    expect(text).toContain(`${report.family_name}, ${report.given_name}`);
    expect(text).toContain(impression);
    expect(text).toContain(`Electronically signed by ${signer.displayName}`);
    expect(text).toContain(row.signedHash!);
    expect(text).toContain(report.accession_number);
    // The source of the flag's reference row (src/lib/clinical/reference/*-rows.ts; stored flags name the row by id).
    const source = REFERENCE_RANGES.find((r) => r.id === flag.referenceId)!.source;
    expect(text).toContain(flat(source));
    expect(text).toContain(CAUTION_TEXT);
    expect(text).toMatch(/Page 1 of \d+/);
  });

  it('a report not yet signed has no PDF (409), and an unknown report is 404', async () => {
    expect((await Report.findByPk(unsigned.id))!.signedAt).toBeNull();
    const res = await call('GET', `/api/reports/${unsigned.id}/pdf`, { cookie: reader });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('CONFLICT');
    expect(res.body.error.message).toMatch(/signs it/);
    expect(res.headers.get('content-type')).toContain('application/json');
    expect((await call('GET', '/api/reports/99999999/pdf', { cookie: reader })).status).toBe(404);
  });

  it('is refused to a sonographer (403)', async () => {
    const res = await call('GET', `/api/reports/${unsigned.id}/pdf`, { cookie: await sessionFor('sonographer') });
    expect(res.status).toBe(403);
  });
});

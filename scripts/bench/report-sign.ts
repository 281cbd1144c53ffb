/**
 * Signing under load: 8 reading physicians' sessions signing preliminary reports back to back.
 * Each sign checks the password again (argon2id), writes the signature in one transaction and
 * queues the referrer's e-mail and link, as in the app. Every request signs a different report,
 * so none is refused.
 */
import type { BenchFigure } from '../bench.ts';
import { benchEnv, closedLoop, send, signIn, SECONDS, WARM_UP_SECONDS } from './env.ts';

const CONNECTIONS = 8;
const REPORTS = 3000;

export async function reportSignBench(): Promise<BenchFigure[]> {
  const e = await benchEnv();
  // Preliminary reports for past bench exams, copied from a demo report (its measurements and
  // evaluation), each with an impression so it may be signed.
  e.sql(`USE crestline_bench;
    INSERT INTO reports (exam_id, template_id, template_version, reference_set_version, status, measurements, nodules, height_cm, weight_kg,
      probe_id, probe_kind, evaluation, findings_text, impression_html, abnormal_count, created_by, updated_by, submitted_by, submitted_at, version, created_at, updated_at)
    SELECT x.id, t.template_id, t.template_version, t.reference_set_version, 'preliminary', t.measurements, t.nodules, t.height_cm, t.weight_kg,
      t.probe_id, t.probe_kind, t.evaluation, t.findings_text, '<p>Bench impression: no acute abnormality.</p>', t.abnormal_count, t.created_by, t.updated_by, t.submitted_by, NOW(), 2, NOW(), NOW()
    FROM (SELECT id FROM exams WHERE accession_number LIKE 'B%' AND id NOT IN (SELECT exam_id FROM reports) ORDER BY id LIMIT ${REPORTS}) x
    JOIN (SELECT * FROM reports WHERE status = 'preliminary' AND template_id = 'echo' ORDER BY id LIMIT 1) t`);
  const ids = e
    .sql(`SELECT id FROM crestline_bench.reports WHERE impression_html LIKE '<p>Bench impression%' AND status = 'preliminary' ORDER BY id`)
    .split('\n')
    .filter(Boolean)
    .map(Number);
  const cookie = await signIn(e.url, 'reader@fernhollow.test');
  let next = 0;
  console.log(`  (${CONNECTIONS} connections, ${SECONDS} s after ${WARM_UP_SECONDS} s of warm-up, ${ids.length} reports to sign, argon2id password check on each)`);
  const result = await closedLoop(CONNECTIONS, async () => {
    const id = ids[next++];
    if (id === undefined) return false;
    const res = await send(`${e.url}/api/reports/${id}/sign`, { method: 'POST', cookie, body: JSON.stringify({ version: 2, password: 'crestline-demo' }) });
    return res.status === 200;
  });
  if (result.errors) console.log(`  (non-2xx or errors: ${result.errors})`);
  if (next >= ids.length) console.log('  (ran out of reports: raise REPORTS)');
  return [
    { label: 'signs', value: result.rps, unit: 'req/s', target: Infinity },
    { label: 'sign p95', value: result.p95, unit: 'ms', target: 100 },
  ];
}

/**
 * The report autosave under load: 16 sonographers' forms saving a full echo set at once
 * (16 clients in a closed loop, each on its own draft and keeping its version up to date, so
 * every save is a real re-evaluation and write, never a 409; autocannon cannot carry a value
 * from one answer into the next request of the same connection).
 */
import type { BenchFigure } from '../bench.ts';
import { fullEchoInput } from '../../tests/unit/clinical/helpers.ts';
import { addDays, zonedTimeToUtc } from '../../src/lib/time.ts';
import { benchEnv, closedLoop, send, signIn, SECONDS, WARM_UP_SECONDS, type BenchEnv } from './env.ts';

const CONNECTIONS = 16;

async function call(base: string, cookie: string, method: string, path: string, body?: unknown) {
  const res = await fetch(base + path, { method, headers: { cookie, origin: base, 'content-type': 'application/json' }, body: body === undefined ? undefined : JSON.stringify(body) });
  const json = (await res.json()) as Record<string, any>;
  if (!res.ok) throw new Error(`bench: ${method} ${path} → ${res.status} ${JSON.stringify(json.error ?? json)}`);
  return json;
}

/** Books, checks in and starts `n` echo exams in the cardiac room on weekdays a year ahead. */
export async function draftEchoReports(e: BenchEnv, n: number, daysAhead = 365): Promise<number[]> {
  const desk = await signIn(e.url, 'desk@fernhollow.test');
  const sono = await signIn(e.url, 'sonographer3@fernhollow.test');
  const [roomId, scannerId, sonographerId, examTypeId, timeZone] = e
    .sql(
      `SELECT r.id, s.id, (SELECT id FROM crestline_bench.users WHERE email = 'sonographer3@fernhollow.test'),
              (SELECT id FROM crestline_bench.exam_types WHERE code = 'echo-tte'),
              JSON_UNQUOTE(JSON_EXTRACT((SELECT value FROM crestline_bench.settings WHERE \`key\` = 'clinic'), '$.timeZone'))
         FROM crestline_bench.rooms r JOIN crestline_bench.scanners s ON s.room_id = r.id WHERE r.name LIKE '%cardiac%'`,
    )
    .split('\t');
  const ids: number[] = [];
  let day = addDays(new Date().toISOString().slice(0, 10), daysAhead);
  while (ids.length < n) {
    day = addDays(day, 1);
    if ([0, 6].includes(new Date(`${day}T12:00:00Z`).getUTCDay())) continue;
    for (let hour = 8; hour < 17 && ids.length < n; hour++) {
      const start = zonedTimeToUtc(day, hour, 0, timeZone!).toISOString();
      const booked = await call(e.url, desk, 'POST', '/api/exams', {
        patientId: 1 + (ids.length % 40), examTypeId: Number(examTypeId), referrerId: null, indication: 'Benchmark exam',
        priority: 'routine', payer: 'insured', roomId: Number(roomId), scannerId: Number(scannerId), sonographerId: Number(sonographerId), start,
      });
      await call(e.url, desk, 'POST', `/api/exams/${booked.exam.id}/status`, { version: 0, to: 'arrived' });
      ids.push((await call(e.url, sono, 'POST', `/api/exams/${booked.exam.id}/start`, { version: 1 })).reportId);
    }
  }
  return ids;
}

export async function reportSaveBench(): Promise<BenchFigure[]> {
  const e = await benchEnv();
  const reports = await draftEchoReports(e, CONNECTIONS);
  const cookie = await signIn(e.url, 'sonographer3@fernhollow.test');
  const set = fullEchoInput('female');
  const body = { measurements: set.measurements, nodules: [], heightCm: 165, weightKg: 62, probeId: null };
  // Each client owns one draft and carries its version from answer to answer, as the form does;
  // every save changes a value (LVIDd 5.0 ↔ 5.1 cm), so each one is a real re-evaluation and write.
  const versions = reports.map(() => 0);
  console.log(`  (${CONNECTIONS} connections, ${SECONDS} s after ${WARM_UP_SECONDS} s of warm-up, each saving its own echo draft)`);
  const saveNext = async (client: number) => {
    const res = await send(`${e.url}/api/reports/${reports[client]}/draft`, {
      method: 'PUT',
      cookie,
      body: JSON.stringify({ ...body, measurements: { ...body.measurements, lviddCm: versions[client]! % 2 ? 5.1 : 5.0 }, version: versions[client] }),
    });
    if (res.status !== 200) return false;
    versions[client] = (JSON.parse(res.body) as { report: { version: number } }).report.version;
    return true;
  };
  const result = await closedLoop(CONNECTIONS, saveNext);
  // The same 16 forms at the fastest pace a person produces saves (one a second each: the form
  // saves 0.8 s after typing stops); no target, it shows what a sonographer waits in practice.
  const paced = await closedLoop(CONNECTIONS, saveNext, 1000);
  if (result.errors + paced.errors) console.log(`  (non-2xx or errors: ${result.errors + paced.errors})`);
  return [
    { label: 'saves', value: result.rps, unit: 'req/s', target: Infinity },
    { label: 'save p95', value: result.p95, unit: 'ms', target: 50 },
    { label: 'save p95, 1 save/s each', value: paced.p95, unit: 'ms', target: Infinity },
  ];
}

/**
 * Worklist under load: autocannon at 32 connections against the worklist endpoint (one day,
 * one room, 100,000 past exams in the database) and, in the same run, against a trivial
 * endpoint of the same server behind the same sign-in (GET /api/ping). Figures: throughput
 * of each, their ratio, and the worklist's p95; then the same worklist with its answer cache
 * off, for comparison.
 */
import type { BenchFigure } from '../bench.ts';
import { benchEnv, load, signIn, startServer, SECONDS } from './env.ts';

const CONNECTIONS = 32;

export async function worklistBench(): Promise<BenchFigure[]> {
  const e = await benchEnv();
  const cookie = await signIn(e.url, 'desk@fernhollow.test');
  const day = e.sql('SELECT DATE(DATE_SUB(UTC_DATE(), INTERVAL 100 DAY))');
  const roomId = e.sql('SELECT MIN(id) FROM crestline_bench.rooms');
  const query = `/api/worklist?day=${day}&roomId=${roomId}`;
  const probe = (await (await fetch(e.url + query, { headers: { cookie } })).json()) as { total: number };
  console.log(`  (worklist for ${day}, room ${roomId}: ${probe.total} exams; ${CONNECTIONS} connections, ${SECONDS} s each)`);

  const run = (base: string, path: string, c: string) => load({ url: base + path, cookie: c, connections: CONNECTIONS });
  await run(e.url, '/api/ping', cookie); // warm-up of both paths
  await run(e.url, query, cookie);
  const trivial = await run(e.url, '/api/ping', cookie);
  const worklist = await run(e.url, query, cookie);

  // The same app with the worklist's short-lived answer cache switched off: what every
  // request costs when it goes to the database (shown for comparison, no target).
  const raw = await startServer({ env: { ...e.env, WORKLIST_CACHE_MS: '0' }, dir: e.dir, outDir: e.outDir, name: 'app-nocache' });
  const rawCookie = await signIn(raw.url, 'desk@fernhollow.test');
  await run(raw.url, query, rawCookie);
  const uncached = await run(raw.url, query, rawCookie);
  await raw.stop();
  if (trivial.errors || worklist.errors || uncached.errors) console.log(`  (non-2xx or errors: trivial ${trivial.errors}, worklist ${worklist.errors}, uncached ${uncached.errors})`);
  return [
    { label: 'trivial endpoint', value: trivial.rps, unit: 'req/s', target: Infinity },
    { label: 'worklist endpoint', value: worklist.rps, unit: 'req/s', target: Infinity },
    { label: 'worklist / trivial', value: worklist.rps / trivial.rps, unit: 'ratio', target: Infinity, atLeast: 0.5 },
    { label: 'worklist p95', value: worklist.p95, unit: 'ms', target: 50 },
    { label: 'uncached worklist', value: uncached.rps, unit: 'req/s', target: Infinity },
    { label: 'uncached / trivial', value: uncached.rps / trivial.rps, unit: 'ratio', target: Infinity },
    { label: 'uncached p95', value: uncached.p95, unit: 'ms', target: Infinity },
  ];
}

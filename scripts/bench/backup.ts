/**
 * `npm run backup` against the bench database (the demo clinic plus 100,000 past exams), three
 * times: the median database part (mariadb-dump, gzip), the median whole script (also the
 * stored files, whatever earlier `dicom` runs left under .data/bench/files, and the manifest),
 * and the sizes. A restore of the last backup into a second, empty database follows, since a
 * backup is worth what its restore takes. The issue sets no targets.
 */
import { spawn } from 'node:child_process';
import { mkdtemp, readFile, readdir, rm } from 'node:fs/promises';
import path from 'node:path';
import type { BenchFigure } from '../bench.ts';
import { benchEnv, root } from './env.ts';

const RESTORE_DB = 'crestline_bench_restore';
const RUNS = 3;

interface Manifest {
  database: { sizeBytes: number; seconds: number; tables: Record<string, number> };
  files: { totalBytes: number; count: number };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

function script(name: 'backup' | 'restore', args: string[], env: Record<string, string>): Promise<number> {
  return new Promise((resolve, reject) => {
    const started = performance.now();
    const child = spawn(process.execPath, [path.join(root, 'scripts', `${name}.mjs`), ...args], { cwd: root, env: { ...process.env, ...env }, stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d) => (stderr += d));
    child.once('error', reject);
    child.once('close', (code) => (code === 0 ? resolve((performance.now() - started) / 1000) : reject(new Error(`bench: npm run ${name} failed: ${stderr.trim()}`))));
  });
}

export async function backupBench(): Promise<BenchFigure[]> {
  const e = await benchEnv();
  const dataDir = path.join(e.dir, 'files');
  const out = await mkdtemp(path.join(e.dir, 'backups-'));
  try {
    const whole: number[] = [];
    const database: number[] = [];
    let backup = '';
    let manifest: Manifest | undefined;
    for (let i = 0; i < RUNS; i += 1) {
      whole.push(await script('backup', ['--out', path.join(out, String(i))], { ...e.env, DATA_DIR: dataDir }));
      backup = path.join(out, String(i), (await readdir(path.join(out, String(i))))[0]!);
      manifest = JSON.parse(await readFile(path.join(backup, 'manifest.json'), 'utf8')) as Manifest;
      database.push(manifest.database.seconds);
      // Only the last copy is restored; the others would only fill the disk.
      if (i < RUNS - 1) await rm(path.join(out, String(i)), { recursive: true, force: true });
    }
    if (!manifest || (manifest.database.tables.exams ?? 0) < 100_000) throw new Error('bench: the backup holds fewer than 100,000 exams');

    const user = new URL(e.env.DATABASE_URL!).username;
    e.sql(`DROP DATABASE IF EXISTS ${RESTORE_DB}; CREATE DATABASE ${RESTORE_DB} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci; GRANT ALL PRIVILEGES ON ${RESTORE_DB}.* TO '${user}'@'127.0.0.1'`);
    const restoreSeconds = await script('restore', [backup], {
      ...e.env,
      DATABASE_URL: e.env.DATABASE_URL!.replace(/\/crestline_bench$/, `/${RESTORE_DB}`),
      DATA_DIR: path.join(out, 'restored'),
    });
    return [
      { label: 'backup, database', value: median(database), unit: 's', target: Infinity },
      { label: 'database.sql.gz', value: manifest.database.sizeBytes / 1e6, unit: 'MB', target: Infinity },
      { label: 'backup, whole', value: median(whole), unit: 's', target: Infinity },
      { label: 'stored files', value: manifest.files.totalBytes / 1e6, unit: 'MB', target: Infinity },
      { label: 'restore and verify', value: restoreSeconds, unit: 's', target: Infinity },
    ];
  } finally {
    e.sql(`DROP DATABASE IF EXISTS ${RESTORE_DB}`);
    await rm(out, { recursive: true, force: true });
  }
}

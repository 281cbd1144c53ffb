import { spawn } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import { cp, mkdir, mkdtemp, open, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fileStore, LocalDiskStore } from '../../src/server/storage';
import { closeTestDb, testDb } from '../helpers/db';
import { testEnv } from '../helpers/env';

// The real scripts against the real test database: back it up, restore it into a second,
// empty database beside it (the test user may create crestline_test_*) and an empty folder,
// and compare every table and every file.
const SOURCE = 'crestline_test';
const RESTORED = 'crestline_test_restored';
const UNTOUCHED = 'crestline_test_untouched';
const root = fileURLToPath(new URL('../..', import.meta.url));

interface Manifest {
  createdAt: string;
  crestlineVersion: string;
  database: { file: string; sha256: string; sizeBytes: number; tables: Record<string, number> };
  files: { archive: string; sha256: string; count: number; entries: Array<{ path: string; sizeBytes: number; sha256: string }> };
}

let tmp: string;
let storeRoot: string;
let backupFolder: string;
let manifest: Manifest;
const ourKeys: string[] = [];

const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');
const urlFor = (database: string) => testEnv().databaseUrl.replace(/\/crestline_test$/, `/${database}`);
const select = <T extends object>(sql: string, replacements: unknown[] = []) => testDb().query<T>(sql, { replacements, type: QueryTypes.SELECT });

/** Runs scripts/<name>.mjs against a database and data folder; stdout and stderr together. */
function run(name: 'backup' | 'restore', args: string[], o: { database: string; dataDir: string }): Promise<{ code: number | null; out: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [path.join(root, 'scripts', `${name}.mjs`), ...args], {
      cwd: root,
      env: { ...process.env, DATABASE_URL: urlFor(o.database), DATA_DIR: o.dataDir },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let out = '';
    child.stdout.on('data', (d) => (out += d));
    child.stderr.on('data', (d) => (out += d));
    child.once('error', reject);
    child.once('close', (code) => resolve({ code, out }));
  });
}

/** Every base table's row count and a checksum of its rows, in primary-key order. */
async function fingerprint(schema: string): Promise<Record<string, { rows: number; checksum: string }>> {
  const columns = await select<{ t: string; c: string }>(
    'SELECT table_name AS t, column_name AS c FROM information_schema.columns WHERE table_schema = ? ORDER BY table_name, ordinal_position',
    [schema],
  );
  const keys = await select<{ t: string; c: string }>(
    "SELECT table_name AS t, column_name AS c FROM information_schema.statistics WHERE table_schema = ? AND index_name = 'PRIMARY' ORDER BY table_name, seq_in_index",
    [schema],
  );
  const q = (s: string) => '`' + s.replace(/`/g, '``') + '`';
  const result: Record<string, { rows: number; checksum: string }> = {};
  for (const table of [...new Set(columns.map((c) => c.t))]) {
    // HEX of the value's bytes (NULL spelled out) so '' and NULL, or 1.5 and 1.50, stay apart.
    const row = columns.filter((c) => c.t === table).map((c) => `IFNULL(HEX(CAST(${q(c.c)} AS BINARY)), 'NULL')`).join(', ');
    const order = keys.filter((k) => k.t === table).map((k) => q(k.c)).join(', ') || 'h';
    const hashes = await select<{ h: string }>(`SELECT MD5(CONCAT_WS('|', ${row})) AS h FROM ${q(schema)}.${q(table)} ORDER BY ${order}`);
    result[table] = { rows: hashes.length, checksum: sha(Buffer.from(hashes.map((r) => r.h).join('\n'))) };
  }
  return result;
}

const definitions = async (schema: string, tables: string[]) =>
  Promise.all(tables.map(async (t) => ((await select<Record<string, string>>(`SHOW CREATE TABLE \`${schema}\`.\`${t}\``))[0]!['Create Table'])));

const triggers = (schema: string) =>
  select('SELECT trigger_name, action_timing, event_manipulation, event_object_table, action_statement FROM information_schema.triggers WHERE trigger_schema = ? ORDER BY trigger_name', [schema]);

async function filesUnder(dir: string): Promise<string[]> {
  const entries = await readdir(dir, { recursive: true, withFileTypes: true }).catch(() => []);
  return entries.filter((e) => e.isFile()).map((e) => path.relative(dir, path.join(e.parentPath, e.name)).split(path.sep).join('/')).sort();
}

async function flipByte(file: string): Promise<void> {
  const handle = await open(file, 'r+');
  try {
    const { size } = await handle.stat();
    const at = Math.floor(size / 2);
    const b = Buffer.alloc(1);
    await handle.read(b, 0, 1, at);
    b[0] = b[0]! ^ 0xff;
    await handle.write(b, 0, 1, at);
  } finally {
    await handle.close();
  }
}

beforeAll(async () => {
  testEnv();
  tmp = await mkdtemp(path.join(os.tmpdir(), 'crestline-backup-test-'));
  for (const name of [RESTORED, UNTOUCHED]) await testDb().query(`DROP DATABASE IF EXISTS ${name}`);
  await testDb().query(`CREATE DATABASE ${RESTORED} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  // Stored files of our own beside whatever other tests stored, and a half-written one that
  // the store would never name (a crash during a write leaves such a file).
  const store = fileStore() as LocalDiskStore;
  storeRoot = store.root;
  const batch = randomBytes(6).toString('hex');
  for (const [i, size] of [0, 1, 70_000, 3_000_000].entries()) {
    const key = `backup-test/${batch}/${'x'.repeat(90)}/file-${i}.bin`;
    await store.put(key, randomBytes(size));
    ourKeys.push(key);
  }
  await writeFile(path.join(storeRoot, 'backup-test', batch, '.tmp-halfwritten'), 'partial');
});

afterAll(async () => {
  for (const name of [RESTORED, UNTOUCHED]) await testDb().query(`DROP DATABASE IF EXISTS ${name}`);
  await rm(path.join(storeRoot, 'backup-test'), { recursive: true, force: true });
  if (tmp) await rm(tmp, { recursive: true, force: true });
  await closeTestDb();
});

describe('npm run backup', () => {
  it('writes the dump, the files and a manifest into a new dated folder, and no password', { timeout: 120_000 }, async () => {
    const r = await run('backup', ['--out', path.join(tmp, 'backups')], { database: SOURCE, dataDir: process.env.DATA_DIR ?? '.data' });
    expect(r.code, r.out).toBe(0);
    expect(r.out).not.toContain(decodeURIComponent(new URL(testEnv().databaseUrl).password));

    const [name, ...others] = await readdir(path.join(tmp, 'backups'));
    expect(others).toEqual([]);
    expect(name).toMatch(/^\d{4}-\d{2}-\d{2}_\d{6}$/);
    backupFolder = path.join(tmp, 'backups', name!);
    expect((await readdir(backupFolder)).sort()).toEqual(['database.sql.gz', 'files.tar', 'manifest.json']);
    manifest = JSON.parse(await readFile(path.join(backupFolder, 'manifest.json'), 'utf8')) as Manifest;
    expect(manifest.crestlineVersion).toBe(JSON.parse(await readFile(path.join(root, 'package.json'), 'utf8')).version);
    expect(sha(await readFile(path.join(backupFolder, 'database.sql.gz')))).toBe(manifest.database.sha256);
    expect(sha(await readFile(path.join(backupFolder, 'files.tar')))).toBe(manifest.files.sha256);
  });

  it('counts every table\'s rows and lists every stored file with its sha256', async () => {
    const source = await fingerprint(SOURCE);
    expect(Object.keys(manifest.database.tables).sort()).toEqual(Object.keys(source).sort());
    for (const [table, { rows }] of Object.entries(source)) expect(manifest.database.tables[table], table).toBe(rows);

    const stored = (await filesUnder(storeRoot)).filter((p) => !p.split('/').some((s) => s.startsWith('.')));
    expect(manifest.files.entries.map((e) => e.path)).toEqual(stored);
    expect(manifest.files.entries.some((e) => e.path.includes('.tmp-'))).toBe(false);
    for (const key of ourKeys) {
      const entry = manifest.files.entries.find((e) => e.path === key);
      expect(entry?.sha256, key).toBe(sha(await readFile(path.join(storeRoot, key))));
    }
  });
});

describe('npm run restore', () => {
  const restoredData = () => path.join(tmp, 'restored-data');

  it('loads an empty database and files folder; every table and file matches the source', { timeout: 120_000 }, async () => {
    const r = await run('restore', [backupFolder], { database: RESTORED, dataDir: restoredData() });
    expect(r.code, r.out).toBe(0);
    expect(r.out).toMatch(/every row count the same/);

    const [source, restored] = [await fingerprint(SOURCE), await fingerprint(RESTORED)];
    expect(Object.keys(restored).sort()).toEqual(Object.keys(source).sort());
    for (const table of Object.keys(source)) expect(restored[table], table).toEqual(source[table]);
    const tables = Object.keys(source).sort();
    expect(await definitions(RESTORED, tables)).toEqual(await definitions(SOURCE, tables));

    const restoredFiles = path.join(restoredData(), 'files');
    expect(await filesUnder(restoredFiles)).toEqual(manifest.files.entries.map((e) => e.path));
    for (const e of manifest.files.entries) expect(sha(await readFile(path.join(restoredFiles, e.path))), e.path).toBe(e.sha256);
  });

  it('brings back the triggers that keep signed reports, addenda and communications unchanged', async () => {
    const [source, restored] = [await triggers(SOURCE), await triggers(RESTORED)];
    expect(source.length).toBeGreaterThanOrEqual(6);
    expect(restored).toEqual(source);
    const [signed] = await select<{ id: number }>(`SELECT id FROM ${RESTORED}.reports WHERE signed_at IS NOT NULL LIMIT 1`);
    expect(signed, 'the demo clinic has signed reports').toBeDefined();
    await expect(testDb().query(`UPDATE ${RESTORED}.reports SET impression_html = '<p>changed</p>' WHERE id = ${signed!.id}`)).rejects.toThrow(/signed report cannot be changed/);
    await expect(testDb().query(`DELETE FROM ${RESTORED}.reports WHERE id = ${signed!.id}`)).rejects.toThrow(/signed report cannot be deleted/);
  });

  it('refuses a target that is not empty unless told, and with --force replaces it', { timeout: 120_000 }, async () => {
    const before = await fingerprint(RESTORED);
    const refused = await run('restore', [backupFolder], { database: RESTORED, dataDir: restoredData() });
    expect(refused.code).not.toBe(0);
    expect(refused.out).toMatch(/the target is not empty: .* has \d+ tables and .* holds \d+ files\. .*--force/);
    expect(await fingerprint(RESTORED)).toEqual(before);

    // A table the backup does not have must not survive a forced restore.
    await testDb().query(`CREATE TABLE ${RESTORED}.not_in_backup (id INT PRIMARY KEY)`);
    const forced = await run('restore', [backupFolder, '--force'], { database: RESTORED, dataDir: restoredData() });
    expect(forced.code, forced.out).toBe(0);
    expect(await fingerprint(RESTORED)).toEqual(await fingerprint(SOURCE));
    const aside = (await readdir(restoredData())).filter((n) => n.startsWith('files.replaced-'));
    expect(aside).toHaveLength(1);
  });

  for (const part of ['files.tar', 'database.sql.gz'] as const) {
    it(`refuses a backup whose ${part} was changed, before touching the target`, { timeout: 60_000 }, async () => {
      const copy = path.join(tmp, `tampered-${part}`);
      await cp(backupFolder, copy, { recursive: true });
      await flipByte(path.join(copy, part));
      const dataDir = path.join(tmp, `untouched-${part}`);
      await mkdir(dataDir);
      const r = await run('restore', [copy], { database: UNTOUCHED, dataDir });
      expect(r.code).not.toBe(0);
      expect(r.out).toContain(`${part} in ${copy} does not match its manifest`);
      expect(await select('SELECT schema_name FROM information_schema.schemata WHERE schema_name = ?', [UNTOUCHED])).toEqual([]);
      expect(await readdir(dataDir)).toEqual([]);
    });
  }
});

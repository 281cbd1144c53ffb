#!/usr/bin/env node
// `npm run restore -- <backup folder> [--force]`: loads a backup made by `npm run backup` into
// an empty database and files folder, then checks every table's row count and every file's
// sha256 against the backup's manifest. A target that holds anything is refused unless --force.
// With .env (no DATABASE_URL), the private database is started for the restore and stopped
// after, so a new server needs no `npm start` (which would seed the demo clinic) beforehand.
import { spawn, spawnSync } from 'node:child_process';
import { createReadStream, existsSync, mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import { fileURLToPath } from 'node:url';
import { createGunzip } from 'node:zlib';
import { FORMAT, MANIFEST, crestlineVersion, describeDb, explainDbError, hashFile, ident, listFiles, mb, optionFile, requireTools, resolveTarget, sql, stamp } from './lib/backup.mjs';
import { bold, fail, runMain, say, warn } from './lib/say.mjs';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const USAGE = 'Usage: npm run restore -- <backup folder> [--force]';
const undo = [];

async function cleanup() {
  while (undo.length) await undo.pop()();
}

function parseArgs(argv) {
  const folders = argv.filter((a) => !a.startsWith('--'));
  const unknown = argv.filter((a) => a.startsWith('--') && a !== '--force');
  if (unknown.length) fail(`unknown option ${unknown[0]}. ${USAGE}`);
  if (folders.length !== 1) fail(`name one backup folder (e.g. .data/backups/2026-12-03_020000). ${USAGE}`);
  return { folder: path.resolve(folders[0]), force: argv.includes('--force') };
}

const isSha = (s) => typeof s === 'string' && /^[0-9a-f]{64}$/.test(s);
const safePath = (p) => typeof p === 'string' && p.length > 0 && !p.startsWith('/') && p.split('/').every((s) => s !== '' && s !== '.' && s !== '..');

/** The manifest, checked for shape: a folder that is not a whole backup is refused here. */
function readManifest(folder) {
  const file = path.join(folder, MANIFEST);
  if (!existsSync(folder)) fail(`there is no folder ${folder}.`);
  if (!existsSync(file)) fail(`${folder} is not a Crestline backup: it has no ${MANIFEST}.`);
  let m;
  try {
    m = JSON.parse(readFileSync(file, 'utf8'));
  } catch {
    fail(`${file} is not valid JSON: the backup is damaged. Use another backup.`);
  }
  const ok =
    m?.format === FORMAT &&
    typeof m.database?.file === 'string' && isSha(m.database.sha256) && m.database.tables && typeof m.database.tables === 'object' &&
    typeof m.files?.archive === 'string' && isSha(m.files.sha256) && Array.isArray(m.files.entries) &&
    m.files.entries.every((e) => safePath(e?.path) && isSha(e.sha256) && Number.isInteger(e.sizeBytes)) &&
    Object.values(m.database.tables).every((n) => Number.isInteger(n)) &&
    [m.database.file, m.files.archive].every((f) => !f.includes('/'));
  if (!ok) fail(`${file} is not a manifest this version of Crestline understands (format ${m?.format ?? 'unknown'}). Use another backup.`);
  return m;
}

/** Both halves must be exactly what the manifest says before anything in the target is touched. */
async function checkBackup(folder, m) {
  for (const { file, sha256, sizeBytes } of [
    { file: m.database.file, sha256: m.database.sha256, sizeBytes: m.database.sizeBytes },
    { file: m.files.archive, sha256: m.files.sha256, sizeBytes: m.files.sizeBytes },
  ]) {
    const full = path.join(folder, file);
    if (!existsSync(full)) fail(`${file} is missing from ${folder}; nothing was restored. Use another backup.`);
    const actual = await hashFile(full);
    if (actual.sha256 !== sha256 || (sizeBytes !== undefined && actual.sizeBytes !== sizeBytes)) {
      fail(`${file} in ${folder} does not match its manifest (sha256 differs): the backup is damaged or was changed. Nothing was restored; use another backup.`);
    }
  }
}

function alive(pid) {
  try {
    process.kill(pid, 0);
    return pid !== process.pid;
  } catch {
    return false;
  }
}

/** .env mode: start the private database of `npm start` for the restore (and stop it after). */
async function startPrivateDatabase({ env, dataDir }) {
  const { DEBIAN_PACKAGES, ensureDebianPackages } = await import('./lib/system.mjs');
  const { mariadbPaths, provision, startMariaDb, stopStale } = await import('./lib/mariadb.mjs');
  const { stopAll } = await import('./lib/children.mjs');
  const { portFree } = await import('./lib/net.mjs');
  // npm start's own lock: while it runs, the app is using the data; while we run, it must not start.
  const lock = path.join(dataDir, 'start.pid');
  const pid = existsSync(lock) ? Number(readFileSync(lock, 'utf8')) : 0;
  if (pid && alive(pid)) fail(`Crestline is running (npm start, pid ${pid}). Stop it with Ctrl-C first: the restore starts the database by itself and stops it when done.`);
  mkdirSync(dataDir, { recursive: true });
  writeFileSync(lock, String(process.pid));
  undo.push(() => rmSync(lock, { force: true }));

  ensureDebianPackages(DEBIAN_PACKAGES);
  const db = mariadbPaths(path.join(dataDir, 'db'));
  await stopStale(db);
  if (!(await portFree(Number(env.DB_PORT)))) fail(`port ${env.DB_PORT} (the database) is in use by another program; set DB_PORT in .env to a free port.`);
  say(`starting the database on 127.0.0.1:${env.DB_PORT} for the restore…`);
  undo.push(() => stopAll());
  await startMariaDb(db, { port: Number(env.DB_PORT) });
  provision(db, { database: env.DB_NAME, user: env.DB_USER, password: env.DB_PASSWORD });
}

/** What the target holds now: its tables (and views) and its files. */
async function targetContents(conn, options, filesDir) {
  const db = conn.database;
  const [[exists] = []] = sql(conn, options, `SELECT COUNT(*) FROM information_schema.schemata WHERE schema_name = '${db}'`, { database: '' });
  if (exists === '0') {
    const r = spawnSync('mariadb', [`--defaults-file=${options}`, '-e', `CREATE DATABASE ${ident(db)} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`], { encoding: 'utf8' });
    if (r.status !== 0) fail(`the ${describeDb(conn)} does not exist and user ${conn.user} may not create it: create it empty first (as the database administrator).`);
    say(`created the empty ${describeDb(conn)}`);
  }
  const tables = sql(conn, options, `SELECT table_name, table_type FROM information_schema.tables WHERE table_schema = '${db}'`, { database: '' });
  return { tables: tables.map(([name, type]) => ({ name, view: type === 'VIEW' })), files: await listFiles(filesDir) };
}

async function replaceTarget(conn, options, filesDir, { tables, files }) {
  if (tables.length) {
    const views = tables.filter((t) => t.view).map((t) => ident(t.name));
    const rest = tables.filter((t) => !t.view).map((t) => ident(t.name));
    const statements = ['SET FOREIGN_KEY_CHECKS = 0'];
    if (views.length) statements.push(`DROP VIEW IF EXISTS ${views.join(', ')}`);
    if (rest.length) statements.push(`DROP TABLE IF EXISTS ${rest.join(', ')}`);
    sql(conn, options, statements.join('; '), { doing: 'emptying the database' });
    say(`--force: dropped the ${tables.length} tables of the ${describeDb(conn)}`);
  }
  if (files.length) {
    const aside = `${filesDir}.replaced-${stamp()}`;
    renameSync(filesDir, aside);
    say(`--force: moved the ${files.length} files that were in ${filesDir} aside to ${aside} (delete it once this restore is checked)`);
  }
}

async function loadDump(conn, options, file) {
  const child = spawn('mariadb', [`--defaults-file=${options}`, '--batch', conn.database], { stdio: ['pipe', 'ignore', 'pipe'] });
  let stderr = '';
  child.stderr.on('data', (d) => (stderr = (stderr + d).slice(-8192)));
  const exited = new Promise((resolve) => child.once('close', (code) => resolve(code)));
  let broken;
  await pipeline(createReadStream(file), createGunzip(), child.stdin).catch((e) => (broken = e));
  const code = await exited;
  const partly = 'The database now holds part of the backup: fix the cause, then restore again with --force.';
  if (code !== 0) fail(`${explainDbError(stderr, conn, 'loading the database dump')} ${partly}`);
  if (broken) fail(`reading ${file} failed: ${broken.message}. ${partly}`);
}

function unpack(archive, filesDir) {
  mkdirSync(filesDir, { recursive: true, mode: 0o750 });
  const r = spawnSync('tar', ['-xf', archive, '-C', filesDir, '--no-same-owner'], { encoding: 'utf8' });
  if (r.status !== 0) fail(`unpacking ${archive} failed: ${(r.stderr || '').trim().split('\n').pop()}`);
}

/** Every table's row count and every file's sha256 against the manifest; returns what differs. */
async function verify(conn, options, filesDir, m) {
  const problems = [];
  const names = Object.keys(m.database.tables);
  const present = new Set(sql(conn, options, `SELECT table_name FROM information_schema.tables WHERE table_schema = '${conn.database}'`).map(([n]) => n));
  const missing = names.filter((n) => !present.has(n));
  for (const n of missing) problems.push(`table ${n} is missing`);
  const counted = names.filter((n) => present.has(n));
  if (counted.length) {
    const rows = sql(conn, options, counted.map((n, i) => `SELECT ${i}, COUNT(*) FROM ${ident(n)}`).join(' UNION ALL '), { doing: 'counting rows' });
    for (const [i, count] of rows) {
      const name = counted[Number(i)];
      if (Number(count) !== m.database.tables[name]) problems.push(`table ${name} has ${count} rows, the backup ${m.database.tables[name]}`);
    }
  }
  const listed = new Set(m.files.entries.map((e) => e.path));
  for (const e of m.files.entries) {
    const full = path.join(filesDir, ...e.path.split('/'));
    if (!existsSync(full)) problems.push(`file ${e.path} is missing`);
    else if ((await hashFile(full)).sha256 !== e.sha256) problems.push(`file ${e.path} differs from the backup (sha256)`);
  }
  for (const extra of (await listFiles(filesDir)).filter((p) => !listed.has(p))) problems.push(`file ${extra} is not in the manifest`);
  return problems;
}

async function main() {
  const args = parseArgs(process.argv.slice(2));
  requireTools('mariadb', 'tar');
  const m = readManifest(args.folder);
  say(`checking the backup in ${args.folder} (made ${m.createdAt}, Crestline ${m.crestlineVersion})…`);
  await checkBackup(args.folder, m);

  const target = await resolveTarget(root, { writeEnv: true });
  const { conn, filesDir } = target;
  if (target.from === '.env') await startPrivateDatabase(target);
  const options = optionFile(conn);
  undo.push(options.remove);

  const contents = await targetContents(conn, options.file, filesDir);
  if (contents.tables.length || contents.files.length) {
    const what = [contents.tables.length && `the ${describeDb(conn)} has ${contents.tables.length} tables`, contents.files.length && `${filesDir} holds ${contents.files.length} files`].filter(Boolean).join(' and ');
    if (!args.force) fail(`the target is not empty: ${what}. Restore into an empty database and files folder, or add --force to replace what is there (back it up first).`);
    await replaceTarget(conn, options.file, filesDir, contents);
  }

  const started = Date.now();
  say(`loading ${m.database.file} into the ${describeDb(conn)} (from ${target.from})…`);
  await loadDump(conn, options.file, path.join(args.folder, m.database.file));
  say(`unpacking ${m.files.entries.length} files into ${filesDir}…`);
  unpack(path.join(args.folder, m.files.archive), filesDir);

  const problems = await verify(conn, options.file, filesDir, m);
  if (problems.length) {
    const more = problems.length > 5 ? ` and ${problems.length - 5} more` : '';
    fail(`the restore finished but does not match the backup: ${problems.slice(0, 5).join('; ')}${more}. Do not use this copy; restore again from another backup.`);
  }
  const rows = Object.values(m.database.tables).reduce((s, n) => s + n, 0);
  const bytes = m.files.entries.reduce((s, e) => s + e.sizeBytes, 0);
  say(`${bold('restored')} the backup of ${m.createdAt} in ${((Date.now() - started) / 1000).toFixed(1)} s; everything matches its manifest:`);
  say(`  database: ${Object.keys(m.database.tables).length} tables, ${rows} rows, every row count the same`);
  say(`  files:    ${m.files.entries.length} files, ${mb(bytes)}, every sha256 the same`);
  if (m.crestlineVersion !== crestlineVersion(root)) warn(`the backup was made by Crestline ${m.crestlineVersion}; this is ${crestlineVersion(root)}.`);
  if (target.from === '.env') say('next: npm start (it applies any newer migrations and starts everything).');
  await cleanup();
}

for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => void cleanup().then(() => process.exit(130)));
await runMain(main, cleanup);

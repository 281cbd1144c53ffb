#!/usr/bin/env node
// `npm run backup [-- --out DIR]`: a consistent dump of the database and an archive of the
// stored files, with a manifest of sha256 sums, in a new dated folder (DATA_DIR/backups/
// unless --out). The database must be running. Node built-ins only, like the start script.
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { closeSync, createWriteStream, existsSync, fsyncSync, mkdirSync, openSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { Transform } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { fileURLToPath } from 'node:url';
import { createGzip } from 'node:zlib';
import { ARCHIVE, DUMP, FORMAT, MANIFEST, crestlineVersion, describeDb, explainDbError, listFiles, mb, optionFile, requireTools, resolveTarget, sql, stamp } from './lib/backup.mjs';
import { bold, fail, runMain, say } from './lib/say.mjs';
import { writeTar } from './lib/tar.mjs';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const undo = [];

async function cleanup() {
  while (undo.length) undo.pop()();
}

function parseArgs(argv) {
  const out = { out: undefined };
  for (let i = 0; i < argv.length; i += 1) {
    if (argv[i] === '--out' && argv[i + 1]) out.out = argv[++i];
    else if (argv[i].startsWith('--out=')) out.out = argv[i].slice(6);
    else fail(`unknown argument "${argv[i]}". Usage: npm run backup [-- --out DIR]`);
  }
  return out;
}

const INSERT = Buffer.from('INSERT INTO `');
const CREATE = Buffer.from('CREATE TABLE `');
const DEFINER = /DEFINER=`(?:[^`]|``)*`@`(?:[^`]|``)*`\s*/g;

/** The name after `prefix` in a line such as INSERT INTO `exams` …, with `` unescaped. */
function nameAfter(line, prefix) {
  let end = prefix.length;
  while (end < line.length && !(line[end] === 0x60 && line[end + 1] !== 0x60)) end += line[end] === 0x60 ? 2 : 1;
  return { name: line.subarray(prefix.length, end).toString('utf8').replace(/``/g, '`'), next: end + 1 };
}

/**
 * Passes mariadb-dump's output through, counting each table's rows as they go by: the counts in
 * the manifest are then exactly the dump's (a live clinic keeps writing while COUNT(*) and the
 * dump would each see their own moment). It also drops the DEFINER of triggers and routines, so
 * the dump loads as any user with rights on the target database, not only the one who made it.
 */
class DumpScanner extends Transform {
  tables = new Map();
  completed = false;
  #line = [];
  #values = false;
  #table = '';
  #inString = false;
  #escaped = false;
  #depth = 0;

  _transform(chunk, _encoding, done) {
    let pos = 0;
    while (pos < chunk.length) {
      if (this.#values) {
        const end = this.#scanValues(chunk, pos);
        this.push(chunk.subarray(pos, end));
        pos = end;
      } else {
        const nl = chunk.indexOf(10, pos);
        const stop = nl === -1 ? chunk.length : nl + 1;
        this.#line.push(chunk.subarray(pos, stop));
        pos = stop;
        if (nl !== -1) this.#endLine();
      }
    }
    done();
  }

  _flush(done) {
    if (this.#line.length) this.#endLine();
    done(this.#values ? new Error('the dump ended inside an INSERT statement') : undefined);
  }

  #endLine() {
    let line = Buffer.concat(this.#line);
    this.#line = [];
    if (line.subarray(0, INSERT.length).equals(INSERT)) {
      const { name, next } = nameAfter(line, INSERT);
      this.#table = name;
      this.#values = true;
      this.push(line);
      // Older dumps put every row on the INSERT's own line; newer ones one row per line.
      this.#scanValues(line, next);
      return;
    }
    if (line.subarray(0, CREATE.length).equals(CREATE)) {
      const { name } = nameAfter(line, CREATE);
      if (!this.tables.has(name)) this.tables.set(name, 0);
    } else if (line.length < 4096 && (line[0] === 0x2f || line[0] === 0x43) && line.includes('DEFINER=`')) {
      line = Buffer.from(line.toString('utf8').replace(DEFINER, ''), 'utf8');
    }
    if (line.length > 1) this.completed = line.subarray(0, 17).toString('latin1') === '-- Dump completed';
    this.push(line);
  }

  /** Counts row tuples: a "(" outside any string at depth 0. Returns where the statement ends. */
  #scanValues(buf, from) {
    for (let i = from; i < buf.length; i += 1) {
      const b = buf[i];
      if (this.#inString) {
        if (this.#escaped) this.#escaped = false;
        else if (b === 0x5c) this.#escaped = true;
        else if (b === 0x27) this.#inString = false;
      } else if (b === 0x27) this.#inString = true;
      else if (b === 0x28) {
        if (this.#depth++ === 0) this.tables.set(this.#table, (this.tables.get(this.#table) ?? 0) + 1);
      } else if (b === 0x29) this.#depth -= 1;
      else if (b === 0x3b && this.#depth === 0) {
        this.#values = false;
        return i + 1;
      }
    }
    return buf.length;
  }
}

/** A pass-through that hashes and measures what it passes. */
function meter() {
  const hash = createHash('sha256');
  const m = { sizeBytes: 0, sha256: () => hash.digest('hex') };
  m.stream = new Transform({
    transform(chunk, _encoding, done) {
      hash.update(chunk);
      m.sizeBytes += chunk.length;
      done(null, chunk);
    },
  });
  return m;
}

function fsyncFile(file) {
  const fd = openSync(file, 'r');
  try {
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

async function dumpDatabase(conn, options, file) {
  const args = [`--defaults-file=${options}`, '--single-transaction', '--routines', '--triggers', '--no-tablespaces', '--hex-blob', '--default-character-set=utf8mb4', conn.database];
  const child = spawn('mariadb-dump', args, { stdio: ['ignore', 'pipe', 'pipe'] });
  let stderr = '';
  child.stderr.on('data', (d) => (stderr = (stderr + d).slice(-8192)));
  const exited = new Promise((resolve) => child.once('close', (code) => resolve(code)));
  undo.push(() => child.exitCode === null && child.kill('SIGTERM'));
  const scanner = new DumpScanner();
  const m = meter();
  let broken;
  await pipeline(child.stdout, scanner, createGzip({ level: 6 }), m.stream, createWriteStream(file, { flags: 'wx', mode: 0o600 })).catch((e) => (broken = e));
  const code = await exited;
  undo.pop();
  if (code !== 0) fail(explainDbError(stderr, conn, 'mariadb-dump'));
  if (broken) fail(`writing ${file} failed: ${broken.message}`);
  if (!scanner.completed) fail('the database dump ended early (no "Dump completed" line); nothing was kept. Try again; if it repeats, see the MariaDB log.');
  fsyncFile(file);
  const tables = Object.fromEntries([...scanner.tables].sort(([a], [b]) => (a < b ? -1 : 1)));
  return { sha256: m.sha256(), sizeBytes: m.sizeBytes, tables };
}

const round = (seconds) => Math.round(seconds * 100) / 100;

const inside = (child, parent) => {
  const rel = path.relative(parent, child);
  return rel === '' || (!rel.startsWith('..') && !path.isAbsolute(rel));
};

async function main() {
  const args = parseArgs(process.argv.slice(2));
  requireTools('mariadb', 'mariadb-dump');
  const target = await resolveTarget(root);
  const { conn, filesDir } = target;
  const options = optionFile(conn);
  undo.push(options.remove);
  const [[server] = []] = sql(conn, options.file, 'SELECT VERSION()', { doing: 'connecting to the database' });

  const outRoot = path.resolve(args.out ?? path.join(target.dataDir, 'backups'));
  if (inside(outRoot, filesDir)) fail(`--out ${outRoot} is inside the stored files folder (${filesDir}); choose a folder outside it.`);
  mkdirSync(outRoot, { recursive: true, mode: 0o700 });
  let name = stamp();
  for (let n = 2; existsSync(path.join(outRoot, name)); n += 1) name = `${stamp()}-${n}`;
  const folder = path.join(outRoot, name);
  // Written under a hidden name and renamed at the end: a folder with the dated name is complete.
  const partial = path.join(outRoot, `.${name}.partial`);
  mkdirSync(partial, { mode: 0o700 });
  undo.push(() => rmSync(partial, { recursive: true, force: true }));

  const started = Date.now();
  const createdAt = new Date(started).toISOString();
  say(`backing up the ${describeDb(conn)} (from ${target.from}) and the stored files in ${filesDir}…`);
  const db = await dumpDatabase(conn, options.file, path.join(partial, DUMP));
  const dumpSeconds = (Date.now() - started) / 1000;
  const files = await writeTar(filesDir, await listFiles(filesDir, { stored: true }), path.join(partial, ARCHIVE));
  const archiveSeconds = (Date.now() - started) / 1000 - dumpSeconds;
  const totalBytes = files.entries.reduce((s, e) => s + e.sizeBytes, 0);
  const manifest = {
    format: FORMAT,
    createdAt,
    crestlineVersion: crestlineVersion(root),
    database: { name: conn.database, server, file: DUMP, sha256: db.sha256, sizeBytes: db.sizeBytes, seconds: round(dumpSeconds), tables: db.tables },
    files: { archive: ARCHIVE, sha256: files.sha256, sizeBytes: files.sizeBytes, seconds: round(archiveSeconds), count: files.entries.length, totalBytes, entries: files.entries },
  };
  writeFileSync(path.join(partial, MANIFEST), JSON.stringify(manifest, null, 2) + '\n', { mode: 0o600 });
  fsyncFile(path.join(partial, MANIFEST));
  renameSync(partial, folder);
  undo.pop();
  await cleanup();

  const rows = Object.values(db.tables).reduce((s, n) => s + n, 0);
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  say(`${bold('backup written')} to ${folder} in ${seconds} s`);
  say(`  database: ${Object.keys(db.tables).length} tables, ${rows} rows → ${DUMP} (${mb(db.sizeBytes)}, dumped in ${dumpSeconds.toFixed(1)} s)`);
  say(`  files:    ${files.entries.length} stored files, ${mb(totalBytes)} → ${ARCHIVE} (archived in ${archiveSeconds.toFixed(1)} s)`);
  say('it holds patient data: copy it off this server to encrypted storage (see README, Backups).');
}

for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => void cleanup().then(() => process.exit(130)));
await runMain(main, cleanup);

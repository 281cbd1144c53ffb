import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import { fail, say } from './say.mjs';
import { stopChild, track } from './children.mjs';

/**
 * A private MariaDB server: own data dir, socket and pid file under `dir`, loopback only.
 * `--no-defaults` keeps it clear of any system instance (STACK.md).
 */
export function mariadbPaths(dir) {
  return {
    dir,
    data: path.join(dir, 'mysql'),
    sock: path.join(dir, 'mysqld.sock'),
    pidFile: path.join(dir, 'mysqld.pid'),
    logDir: path.join(dir, 'log'),
    log: path.join(dir, 'log', 'mariadb.err'),
  };
}

function alive(pid) {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

function readPid(file) {
  try {
    const pid = Number(readFileSync(file, 'utf8').trim());
    return Number.isInteger(pid) && pid > 0 ? pid : undefined;
  } catch {
    return undefined;
  }
}

function lastLines(file, n) {
  try {
    return readFileSync(file, 'utf8').trim().split('\n').slice(-n).join(' | ');
  } catch {
    return '';
  }
}

async function waitFor(check, timeoutMs, stepMs = 100) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (await check()) return true;
    await new Promise((r) => setTimeout(r, stepMs));
  }
  return false;
}

/** Stops a server left running by an earlier run that did not shut down (e.g. killed hard). */
export async function stopStale(p) {
  const pid = readPid(p.pidFile);
  if (!pid || !alive(pid)) return;
  say(`stopping a database server left over from an earlier run (pid ${pid})…`);
  process.kill(pid, 'SIGTERM');
  if (!(await waitFor(() => !alive(pid), 20_000))) fail(`the old database server (pid ${pid}) did not stop; stop it with: kill ${pid}`);
}

/**
 * Starts mariadbd and waits until it answers. Returns { pid, stop() }.
 * `fresh` wipes the data dir first (tests).
 */
export async function startMariaDb(p, { port, fresh = false }) {
  await stopStale(p);
  if (fresh) rmSync(p.dir, { recursive: true, force: true });
  mkdirSync(p.logDir, { recursive: true });
  const user = spawnSync('id', ['-un'], { encoding: 'utf8' }).stdout.trim();

  if (!existsSync(path.join(p.data, 'mysql'))) {
    mkdirSync(p.data, { recursive: true });
    const r = spawnSync(
      'mariadb-install-db',
      ['--no-defaults', `--datadir=${p.data}`, `--user=${user}`, '--auth-root-authentication-method=socket', '--skip-test-db', '--innodb-log-file-size=16M'],
      { encoding: 'utf8' },
    );
    if (r.status !== 0) {
      fail(`could not create the database files in ${p.data} (mariadb-install-db exit ${r.status}): ${(r.stderr || r.stdout).trim().split('\n').slice(-2).join(' ')}`);
    }
  }

  const child = spawn(
    'mariadbd',
    [
      '--no-defaults',
      `--datadir=${p.data}`,
      `--socket=${p.sock}`,
      `--pid-file=${p.pidFile}`,
      `--port=${port}`,
      '--bind-address=127.0.0.1',
      '--skip-name-resolve',
      `--user=${user}`,
      `--log-error=${p.log}`,
      '--innodb-buffer-pool-size=64M',
      '--innodb-log-file-size=16M',
      '--character-set-server=utf8mb4',
      '--collation-server=utf8mb4_unicode_ci',
      '--default-time-zone=+00:00',
    ],
    { stdio: 'ignore', detached: false },
  );
  const tracked = track(child, 20_000);
  let exited = false;
  child.once('exit', () => {
    exited = true;
  });

  const up = await waitFor(() => {
    if (exited) return true;
    const r = spawnSync('mariadb-admin', ['--no-defaults', `--socket=${p.sock}`, '-uroot', 'ping'], { encoding: 'utf8' });
    return r.status === 0;
  }, 30_000, 150);
  if (exited || !up) {
    if (!exited) child.kill('SIGKILL');
    const tail = lastLines(p.log, 2);
    fail(`MariaDB did not start; its log is ${p.log}${tail ? ` — last lines: ${tail}` : ''}`);
  }

  return { pid: child.pid, stop: () => stopChild(tracked) };
}

/** Runs SQL as the database's root user over the socket. */
export function rootSql(p, sql) {
  const r = spawnSync('mariadb', ['--no-defaults', `--socket=${p.sock}`, '-uroot', '--batch', '--skip-column-names', '-e', sql], { encoding: 'utf8' });
  if (r.status !== 0) fail(`database set-up failed: ${(r.stderr || '').trim().split('\n').pop()}`);
  return r.stdout.trim();
}

const quoteIdent = (s) => '`' + String(s).replace(/`/g, '``') + '`';
const quoteString = (s) => "'" + String(s).replace(/\\/g, '\\\\').replace(/'/g, "\\'") + "'";

/**
 * Creates the database and the app's user (reachable over TCP on loopback only) if missing,
 * and (re)sets the user's password from .env. `grantPattern` widens the grant (tests).
 */
export function provision(p, { database, user, password, grantPattern }) {
  const grantOn = grantPattern ? `${quoteIdent(grantPattern)}.*` : `${quoteIdent(database)}.*`;
  rootSql(
    p,
    [
      `CREATE DATABASE IF NOT EXISTS ${quoteIdent(database)} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
      `CREATE USER IF NOT EXISTS ${quoteString(user)}@'127.0.0.1' IDENTIFIED BY ${quoteString(password)}`,
      `ALTER USER ${quoteString(user)}@'127.0.0.1' IDENTIFIED BY ${quoteString(password)}`,
      `GRANT ALL PRIVILEGES ON ${grantOn} TO ${quoteString(user)}@'127.0.0.1'`,
      'FLUSH PRIVILEGES',
    ].join('; '),
  );
}

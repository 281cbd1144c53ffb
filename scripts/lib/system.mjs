import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import path from 'node:path';
import { fail, say } from './say.mjs';

/** Debian packages the stack needs; later features add theirs here. */
export const DEBIAN_PACKAGES = ['mariadb-server', 'mariadb-client'];
/** dcmtk's command-line tools act as the scanner in the integration tests (findscu, storescu, …). */
export const INTEGRATION_DEBIAN_PACKAGES = ['dcmtk'];
/** The browser for the browser tests. */
export const TEST_DEBIAN_PACKAGES = ['chromium'];

function installed(pkg) {
  const r = spawnSync('dpkg-query', ['-W', '-f=${Status}', pkg], { encoding: 'utf8' });
  return r.status === 0 && r.stdout.includes('install ok installed');
}

/** Installs missing Debian packages when root; otherwise stops with the exact command. */
export function ensureDebianPackages(packages) {
  const missing = packages.filter((p) => !installed(p));
  if (missing.length === 0) return;
  const command = `apt-get update && apt-get install -y ${missing.join(' ')}`;
  if (process.getuid?.() !== 0) {
    fail(`missing Debian packages: ${missing.join(', ')}. Run as root: sudo sh -c '${command}'`);
  }
  say(`installing Debian packages: ${missing.join(', ')} (about a minute)…`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  for (const args of [['update', '-qq'], ['install', '-y', '-qq', ...missing]]) {
    const r = spawnSync('apt-get', args, { stdio: ['ignore', 'ignore', 'inherit'], env });
    if (r.status !== 0) fail(`apt-get ${args[0]} failed (exit ${r.status}); try by hand: ${command}`);
  }
}

/** Runs `npm ci` when node_modules is missing or older than package-lock.json. */
export function ensureNodeModules(root) {
  const lock = path.join(root, 'package-lock.json');
  const marker = path.join(root, 'node_modules', '.package-lock.json');
  if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) return;
  say('installing npm packages (npm ci, about a minute)…');
  const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) fail('npm ci failed; see the messages above.');
}

/** Path of a binary, or undefined. */
export function which(bin) {
  try {
    return execFileSync('sh', ['-c', `command -v ${bin}`], { encoding: 'utf8' }).trim() || undefined;
  } catch {
    return undefined;
  }
}

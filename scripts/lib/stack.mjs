import { spawn, spawnSync } from 'node:child_process';
import path from 'node:path';
import { fail, say } from './say.mjs';
import { waitForHttp } from './net.mjs';
import { stopChild, track } from './children.mjs';

/** Runs `node --import tsx scripts/db.ts …` with the given environment; fails on error. */
export function dbTask(root, env, ...args) {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'scripts/db.ts', ...args], {
    cwd: root,
    env: { ...process.env, ...env },
    encoding: 'utf8',
  });
  const out = (r.stdout || '').trim();
  if (r.status !== 0) fail(`${args[0]} failed: ${(r.stderr || out).trim().split('\n').pop()}`);
  if (out) say(out);
}

/**
 * Starts the web server (scripts/serve.mjs) on the build in `outDir` (default dist) and waits
 * for /api/health. Returns { url, child, stop() }.
 */
export async function startWebServer(root, env, { host, port, logFile, logPath, outDir = path.join(root, 'dist') }) {
  const child = spawn(process.execPath, [path.join(root, 'scripts', 'serve.mjs'), outDir], {
    cwd: root,
    env: { ...process.env, ...env, HOST: host, PORT: String(port), NODE_ENV: 'production' },
    stdio: ['ignore', logFile ?? 'inherit', logFile ?? 'inherit'],
  });
  const tracked = track(child);
  let exited = false;
  child.once('exit', () => {
    exited = true;
  });
  const url = `http://${host}:${port}`;
  const state = await waitForHttp(`${url}/api/health`, { timeoutMs: 40_000, alive: () => !exited });
  if (state !== 'up') {
    if (!exited) child.kill('SIGTERM');
    fail(`the web server ${state === 'died' ? 'stopped during start-up' : 'did not answer /api/health within 40 s'}; see ${logPath ?? 'the messages above'}.`);
  }
  return { url, child, stop: () => stopChild(tracked) };
}

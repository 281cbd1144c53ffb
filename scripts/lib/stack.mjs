import { spawn, spawnSync } from 'node:child_process';
import { fail, say } from './say.mjs';
import { waitForHttp } from './net.mjs';

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
 * Starts the built server (dist/server/entry.mjs) and waits for /api/health.
 * Returns { url, child, stop() }.
 */
export async function startWebServer(root, env, { host, port, logFile }) {
  const child = spawn(process.execPath, ['dist/server/entry.mjs'], {
    cwd: root,
    env: { ...process.env, ...env, HOST: host, PORT: String(port), NODE_ENV: 'production' },
    stdio: ['ignore', logFile ?? 'inherit', logFile ?? 'inherit'],
  });
  let exited = false;
  child.once('exit', () => {
    exited = true;
  });
  const url = `http://${host}:${port}`;
  const state = await waitForHttp(`${url}/api/health`, { timeoutMs: 40_000, alive: () => !exited });
  if (state !== 'up') {
    if (!exited) child.kill('SIGTERM');
    fail(state === 'died' ? 'the web server stopped during start-up; see the messages above.' : 'the web server did not answer /api/health within 40 s.');
  }
  return {
    url,
    child,
    stop: () =>
      new Promise((resolve) => {
        if (exited) return resolve();
        child.once('exit', () => resolve());
        child.kill('SIGTERM');
        setTimeout(() => !exited && child.kill('SIGKILL'), 10_000).unref();
      }),
  };
}

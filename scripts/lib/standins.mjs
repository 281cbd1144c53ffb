import { spawn } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { stopChild, track } from './children.mjs';
import { fail } from './say.mjs';
import { waitForHttp, waitForTcp } from './net.mjs';

function spawnTracked(root, command, args, { env = {}, logFile, graceMs } = {}) {
  const child = spawn(command, args, { cwd: root, env: { ...process.env, ...env }, stdio: ['ignore', logFile ?? 'ignore', logFile ?? 'ignore'] });
  const tracked = track(child, graceMs);
  let exited = false;
  child.once('exit', () => (exited = true));
  return { child, tracked, alive: () => !exited, stop: () => stopChild(tracked) };
}

/**
 * The local mail catcher: SMTP and a web inbox, both on loopback (STACK.md: maildev 2.2.1
 * wants --ip, --web-ip, -s, -w and --mail-directory).
 */
export async function startMaildev(root, { smtpPort, webPort, dir, logFile }) {
  mkdirSync(dir, { recursive: true });
  const bin = path.join(root, 'node_modules', 'maildev', 'bin', 'maildev');
  const p = spawnTracked(root, process.execPath, [bin, '--ip', '127.0.0.1', '--web-ip', '127.0.0.1', '-s', String(smtpPort), '-w', String(webPort), '--mail-directory', dir], { logFile });
  const url = `http://127.0.0.1:${webPort}`;
  if ((await waitForHttp(`${url}/email`, { timeoutMs: 20_000, alive: p.alive })) !== 'up') fail(`the mail catcher did not start on ports ${smtpPort}/${webPort}.`);
  return { ...p, url, smtpPort };
}

/** The local payments stand-in that the Stripe SDK talks to instead of Stripe. */
export async function startPaymentsFake(root, { port, webhookUrl, webhookSecret, logFile }) {
  const script = path.join(root, 'scripts', 'stand-ins', 'payments-fake.mjs');
  const p = spawnTracked(root, process.execPath, [script, '--port', String(port), '--webhook', webhookUrl, '--secret', webhookSecret], { logFile });
  const url = `http://127.0.0.1:${port}`;
  // Any answer (even 401 without a key) means it is listening.
  const until = Date.now() + 15_000;
  while (Date.now() < until) {
    if (!p.alive()) break;
    try {
      await fetch(`${url}/v1/payment_intents/none`, { signal: AbortSignal.timeout(1000) });
      return { ...p, url };
    } catch {
      await new Promise((r) => setTimeout(r, 150));
    }
  }
  fail(`the payments stand-in did not start on port ${port}.`);
}

/** The background worker (outbox, reminders, payment confirmations). */
export function startWorker(root, env, { logFile }) {
  return spawnTracked(root, process.execPath, ['--import', 'tsx', 'scripts/worker.ts'], { env, logFile, graceMs: 15_000 });
}

/** The DICOM listener the scanners talk to (worklist, procedure steps, images). */
export async function startDicomListener(root, env, { host, port, logFile }) {
  const p = spawnTracked(root, process.execPath, ['--import', 'tsx', 'scripts/dicom-listener.ts'], { env: { ...env, DICOM_HOST: host, DICOM_PORT: String(port) }, logFile });
  if ((await waitForTcp(host, port, { timeoutMs: 30_000, alive: p.alive })) !== 'up') fail(`the DICOM listener did not start on ${host}:${port}; see its log.`);
  return p;
}

#!/usr/bin/env node
// `npm start`: bring up the whole demo on this machine, and take it down on Ctrl-C.
// Uses only Node's built-ins until `npm ci` has run.
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync, openSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { bold, fail, runMain, say } from './lib/say.mjs';
import { DEBIAN_PACKAGES, ensureDebianPackages, ensureNodeModules } from './lib/system.mjs';
import { stopAll } from './lib/children.mjs';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const started = Date.now();
let lockFile;

async function cleanup() {
  await stopAll().catch(() => {});
  if (lockFile) rmSync(lockFile, { force: true });
}

function takeLock(dir) {
  lockFile = path.join(dir, 'start.pid');
  if (existsSync(lockFile)) {
    const pid = Number(readFileSync(lockFile, 'utf8'));
    let running = false;
    try {
      process.kill(pid, 0);
      running = pid !== process.pid;
    } catch {}
    if (running) {
      lockFile = undefined;
      fail(`Crestline is already running (npm start, pid ${pid}). Use that one, or stop it with Ctrl-C in its terminal (or: kill ${pid}).`);
    }
  }
  writeFileSync(lockFile, String(process.pid));
}

async function main() {
  ensureDebianPackages(DEBIAN_PACKAGES);
  ensureNodeModules(root);
  // Import the rest only now: they may rely on packages npm ci just installed.
  const { ensureEnvFile, readEnvFile, databaseUrl } = await import('./lib/env.mjs');
  const { portFree } = await import('./lib/net.mjs');
  const { mariadbPaths, startMariaDb, provision } = await import('./lib/mariadb.mjs');
  const { buildIfStale } = await import('./lib/build.mjs');
  const { dbTask, startWebServer } = await import('./lib/stack.mjs');
  const { startDicomListener, startMaildev, startPaymentsFake, startWorker } = await import('./lib/standins.mjs');
  const { DEMO_USERS, DEMO_PASSWORD } = await loadDemoUsers();

  const envFile = path.join(root, '.env');
  ensureEnvFile(envFile);
  const env = readEnvFile(envFile);
  const dataDir = path.resolve(root, env.DATA_DIR);
  mkdirSync(dataDir, { recursive: true });
  takeLock(dataDir);

  const port = Number(env.PORT);
  const dbPort = Number(env.DB_PORT);
  const db = mariadbPaths(path.join(dataDir, 'db'));
  const { stopStale } = await import('./lib/mariadb.mjs');
  await stopStale(db);
  if (!(await portFree(port, env.HOST))) fail(`port ${port} is already in use by another program; set PORT in .env to a free port, or stop that program.`);
  if (!(await portFree(dbPort))) fail(`port ${dbPort} (the database) is already in use by another program; set DB_PORT in .env to a free port.`);
  if (!(await portFree(Number(env.DICOM_PORT), env.DICOM_HOST))) fail(`port ${env.DICOM_PORT} (the DICOM listener) is already in use by another program; set DICOM_PORT in .env to a free port.`);
  for (const key of ['MAIL_SMTP_PORT', 'MAIL_WEB_PORT', 'PAYMENTS_FAKE_PORT']) {
    if (!(await portFree(Number(env[key])))) fail(`port ${env[key]} (${key}) is already in use by another program; set ${key} in .env to a free port.`);
  }

  say(`starting the database on 127.0.0.1:${dbPort}…`);
  await startMariaDb(db, { port: dbPort });
  provision(db, { database: env.DB_NAME, user: env.DB_USER, password: env.DB_PASSWORD });

  const paymentsUrl = `http://127.0.0.1:${env.PAYMENTS_FAKE_PORT}`;
  const appEnv = {
    DATABASE_URL: databaseUrl(env),
    AUTH_SECRET: env.AUTH_SECRET,
    DATA_DIR: dataDir,
    LOG_LEVEL: env.LOG_LEVEL || 'info',
    SESSION_MAX_AGE_HOURS: env.SESSION_MAX_AGE_HOURS || '10',
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: env.MAIL_SMTP_PORT,
    // The local payments stand-in; a real key and no STRIPE_API_BASE would talk to Stripe itself.
    STRIPE_SECRET_KEY: 'sk_test_crestline_local',
    STRIPE_API_BASE: paymentsUrl,
    STRIPE_WEBHOOK_SECRET: env.STRIPE_WEBHOOK_SECRET,
    DICOM_AE_TITLE: env.DICOM_AE_TITLE,
  };
  dbTask(root, appEnv, 'migrate');
  dbTask(root, appEnv, 'reference');
  dbTask(root, appEnv, 'seed', '--if-empty');
  buildIfStale(root);

  mkdirSync(path.join(dataDir, 'log'), { recursive: true });
  const appLog = path.join(dataDir, 'log', 'app.log');
  const logTo = (name) => openSync(path.join(dataDir, 'log', name), 'a');
  const mail = await startMaildev(root, { smtpPort: Number(env.MAIL_SMTP_PORT), webPort: Number(env.MAIL_WEB_PORT), dir: path.join(dataDir, 'mail'), logFile: logTo('maildev.log') });
  await startPaymentsFake(root, { port: Number(env.PAYMENTS_FAKE_PORT), webhookUrl: `http://${env.HOST}:${port}/api/payments/webhook`, webhookSecret: env.STRIPE_WEBHOOK_SECRET, logFile: logTo('payments.log') });
  const web = await startWebServer(root, appEnv, { host: env.HOST, port, logFile: openSync(appLog, 'a'), logPath: appLog });
  startWorker(root, appEnv, { logFile: logTo('worker.log') });
  await startDicomListener(root, appEnv, { host: env.DICOM_HOST, port: Number(env.DICOM_PORT), logFile: logTo('dicom.log') });
  web.child.once('exit', (code) => {
    if (shuttingDown) return;
    say(`the web server stopped unexpectedly (exit ${code}); see ${appLog}. Shutting down.`);
    void shutdown(1);
  });

  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  console.log('');
  say(`${bold('Crestline is running')} at ${bold(web.url)}  (ready in ${seconds} s)`);
  say(`demo sign-ins, all with the password ${bold(DEMO_PASSWORD)}:`);
  for (const u of DEMO_USERS) say(`  ${u.role.padEnd(12)} ${u.email}`);
  say(`mail sent by Crestline lands in the inbox at ${bold(mail.url)}`);
  say(`card payments go to the local payments stand-in at ${paymentsUrl} (test cards only)`);
  say(`scanners reach the DICOM listener at ${env.DICOM_HOST}:${env.DICOM_PORT}, AE title ${env.DICOM_AE_TITLE}; demo scanner FHUS01 (Room 1) lists its day with: findscu -W -aet FHUS01 -aec ${env.DICOM_AE_TITLE} -k "(0040,0100)[0].ScheduledStationAETitle=FHUS01" -k PatientName -k AccessionNumber ${env.DICOM_HOST === '0.0.0.0' ? '127.0.0.1' : env.DICOM_HOST} ${env.DICOM_PORT}`);
  say(`logs: ${path.join(dataDir, 'log')}/ (app, worker, dicom, maildev, payments) and ${db.log}`);
  say('press Ctrl-C to stop everything this started.');
}

async function loadDemoUsers() {
  const accounts = JSON.parse(readFileSync(path.join(root, 'seeders', 'demo-accounts.json'), 'utf8'));
  return { DEMO_USERS: accounts.users, DEMO_PASSWORD: accounts.password };
}

let shuttingDown = false;
async function shutdown(code = 0) {
  if (shuttingDown) return;
  shuttingDown = true;
  say('stopping…');
  await cleanup();
  say('stopped.');
  process.exit(code);
}

process.on('SIGINT', () => void shutdown(0));
process.on('SIGTERM', () => void shutdown(0));
process.on('SIGHUP', () => void shutdown(0));

await runMain(main, cleanup);

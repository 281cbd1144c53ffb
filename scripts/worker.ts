/**
 * Crestline's background worker: sends the e-mail outbox, queues day-before reminders, and
 * confirms payments and refunds left waiting by a payment-service outage. Started by
 * `npm start` and `npm test`; a clinic server runs it as its own service. Reads the same
 * environment as the web server.
 */
import { hostname } from 'node:os';
import { closeDb } from '../src/db/connection';
import { log } from '../src/server/log';
import { createTransport } from '../src/server/mail/transport';
import { deliverDueMail } from '../src/server/jobs/outbox';
import { queueReminders } from '../src/server/jobs/reminders';
import { confirmPendingCharges, sendPendingRefunds } from '../src/server/services/payments';
import { paymentsMode } from '../src/server/payments/provider';

const INTERVAL_MS = Number(process.env.WORKER_INTERVAL_MS ?? 3000);
const workerId = `${hostname()}:${process.pid}`;
const transport = createTransport();
let stopping = false;
let lastReminderRun = 0;

async function tick(): Promise<void> {
  const mail = await deliverDueMail(transport, { workerId });
  if (mail.sent || mail.failed) log.info({ ...mail }, 'outbox');
  if (Date.now() - lastReminderRun > 60_000) {
    lastReminderRun = Date.now();
    const reminders = await queueReminders();
    if (reminders) log.info({ reminders }, 'reminders queued');
  }
  if (paymentsMode() !== 'off') {
    await sendPendingRefunds();
    await confirmPendingCharges();
  }
}

async function loop(): Promise<void> {
  log.info({ workerId, intervalMs: INTERVAL_MS }, 'worker started');
  while (!stopping) {
    try {
      await tick();
    } catch (error) {
      // One failed round (database restarting, say) must not stop the worker.
      log.warn({ err: { name: (error as Error).name } }, 'worker round failed; will retry');
    }
    await new Promise((r) => setTimeout(r, INTERVAL_MS));
  }
  transport.close();
  await closeDb();
  log.info('worker stopped');
}

for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => (stopping = true));
void loop().then(() => process.exit(0));

import net from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OutboxMessage, Patient } from '../../src/db/models';
import { deliverDueMail } from '../../src/server/jobs/outbox';
import { queueReminders } from '../../src/server/jobs/reminders';
import { createTransport } from '../../src/server/mail/transport';
import { at, book, bookingBody, catalog, testDay, type Catalog } from '../helpers/booking';
import { closeTestDb, testDb } from '../helpers/db';
import { zonedTimeToUtc, addDays } from '../../src/lib/time';
import { TZ } from '../helpers/booking';

// Other test files leave booking mail pending (no worker runs during integration tests), so
// each delivery here takes every due message, not the default batch of 20 oldest.
const ALL = 10_000;
let c: Catalog;
let patient: Patient;
const maildev = () => process.env.MAILDEV_URL!;
const smtp = () => createTransport({ host: '127.0.0.1', port: Number(process.env.SMTP_PORT), secure: false });

interface Caught { subject: string; to: Array<{ address: string }>; html: string; text: string }
async function inbox(): Promise<Caught[]> {
  return (await (await fetch(`${maildev()}/email`)).json()) as Caught[];
}

function closedPort(): Promise<number> {
  return new Promise((resolve) => {
    const s = net.createServer().listen(0, '127.0.0.1', () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
  });
}

beforeAll(async () => {
  testDb();
  c = await catalog();
  patient = (await Patient.findOne({ where: { email: { [(await import('sequelize')).Op.ne]: null } }, order: [['id', 'ASC']] }))!;
  await fetch(`${maildev()}/email/all`, { method: 'DELETE' });
});
afterAll(closeTestDb);

describe('patient e-mail through the outbox', () => {
  it('sends the preparation instructions of the booked exam type, in HTML and text', async () => {
    const res = await book(bookingBody(c, { patientId: patient.id, start: at(testDay(15), 9, 0), type: 'abdomen-complete' }));
    expect(res.status).toBe(201);
    const queued = await OutboxMessage.findOne({ where: { examId: res.body.exam.id, kind: 'booking' } });
    expect(queued!.status).toBe('pending');
    await deliverDueMail(smtp(), { workerId: 'test-mail', batch: ALL });
    const mail = (await inbox()).find((m) => m.to[0]!.address === patient.email && m.text.includes(res.body.exam.accessionNumber));
    expect(mail).toBeDefined();
    const prep = c.types['abdomen-complete']!.preparationText;
    expect(mail!.text).toContain(prep);
    expect(mail!.html).toContain('Nothing to eat for 8 hours');
    expect(mail!.subject).toMatch(/abdomen, complete/);
    expect((await OutboxMessage.findByPk(queued!.id))!.status).toBe('sent');
  });

  it('keeps the booking and the mail when the mail server is down, and sends it once it is back', async () => {
    const res = await book(bookingBody(c, { patientId: patient.id, start: at(testDay(15), 11, 0), type: 'thyroid' }));
    expect(res.status).toBe(201);
    const down = createTransport({ host: '127.0.0.1', port: await closedPort(), secure: false });
    const first = await deliverDueMail(down, { workerId: 'test-down', batch: ALL });
    expect(first.failed).toBeGreaterThanOrEqual(1);
    const row = (await OutboxMessage.findOne({ where: { examId: res.body.exam.id } }))!;
    expect(row).toMatchObject({ status: 'pending', attempts: 1 });
    // nodemailer's code for a refused connection (the cause, not the address, is kept).
    expect(row.lastError).toMatch(/^E[A-Z]+$/);
    expect(row.nextAttemptAt.getTime()).toBeGreaterThan(Date.now());
    // Not due yet: a worker looking now sends nothing for it.
    await deliverDueMail(smtp(), { workerId: 'test-up', batch: ALL });
    expect((await OutboxMessage.findByPk(row.id))!.status).toBe('pending');
    // Later, with the mail server back, it goes out exactly once.
    await deliverDueMail(smtp(), { workerId: 'test-up', batch: ALL, now: new Date(Date.now() + 120_000) });
    await deliverDueMail(smtp(), { workerId: 'test-up', batch: ALL, now: new Date(Date.now() + 240_000) });
    expect((await OutboxMessage.findByPk(row.id))!.status).toBe('sent');
    const copies = (await inbox()).filter((m) => m.subject.includes('thyroid') && m.text.includes(res.body.exam.accessionNumber));
    expect(copies).toHaveLength(1);
  });

  it('is sent by the worker process on its own, as in production', async () => {
    const { spawn } = await import('node:child_process');
    const { ROOT } = await import('../helpers/routes');
    const res = await book(bookingBody(c, { patientId: patient.id, start: at(testDay(15), 14, 0), type: 'echo-tte', roomIndex: 2 }));
    expect(res.status).toBe(201);
    const worker = spawn(process.execPath, ['--import', 'tsx', 'scripts/worker.ts'], { cwd: ROOT, env: { ...process.env, WORKER_INTERVAL_MS: '300' }, stdio: 'ignore' });
    try {
      const end = Date.now() + 20_000;
      let row = await OutboxMessage.findOne({ where: { examId: res.body.exam.id } });
      while (row?.status !== 'sent' && Date.now() < end) {
        await new Promise((r) => setTimeout(r, 300));
        row = await OutboxMessage.findOne({ where: { examId: res.body.exam.id } });
      }
      expect(row?.status).toBe('sent');
      expect((await inbox()).some((m) => m.text.includes(res.body.exam.accessionNumber))).toBe(true);
    } finally {
      worker.kill('SIGTERM');
    }
  });

  it('queues one reminder the day before, however often the worker looks', async () => {
    const res = await book(bookingBody(c, { patientId: patient.id, start: at(testDay(16), 10, 0), type: 'thyroid' }));
    const eveBefore = zonedTimeToUtc(addDays(testDay(16), -1), 18, 0, TZ);
    expect(await queueReminders(eveBefore)).toBeGreaterThanOrEqual(1);
    await queueReminders(eveBefore);
    expect(await OutboxMessage.count({ where: { examId: res.body.exam.id, kind: 'reminder' } })).toBe(1);
  });
});

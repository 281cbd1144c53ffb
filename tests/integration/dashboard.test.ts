import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Exam, Patient, Payment, Report, Setting, User } from '../../src/db/models';
import { addDays } from '../../src/lib/time';
import { at, book, bookingBody, catalog, testDay, type Catalog } from '../helpers/booking';
import { closeTestDb, testDb } from '../helpers/db';
import { call, sessionFor } from '../helpers/http';

/*
 * The clinic dashboard against a small data set built by hand on a day of its own (D, a weekday
 * no other test books), every figure checked against a value worked out by hand in this file.
 *
 * Nine exams on D (times are clinic wall-clock times on D; "−3 d" = booked three days before arrival):
 *
 *   exam  room  type      start  min  status     booked→arrived  arrived→scanned  scanned→prelim  prelim→signed  signer
 *   E1    1     thyroid   08:00  30   completed  4320 (3 d)      40               5               15             A
 *   E2    1     thyroid   08:30  30   completed  1440 (1 d)      35               10              75             A
 *   E3    1     abdomen   09:00  45   completed  2880 (2 d)      55               5               180            A
 *   E4    1     abdomen   10:00  45   noshow     —
 *   E5    1     thyroid   11:00  30   cancelled  —
 *   E6    2     abdomen   08:00  45   completed  7200 (5 d)      50               20              (not signed)
 *   E7    2     thyroid   09:00  30   booked     —
 *   E8    3     echo      08:00  60   completed  5760 (4 d)      75               15              1530           B
 *   E9    3     echo      09:00  60   arrived    14400 (10 d)    —
 *
 * Booking → signed is the sum of the steps: E1 4380, E2 1560, E3 3120, E8 7380 minutes. Every
 * time was chosen to be exact at the precision the dashboard counts in (whole minutes under 2 h,
 * 6 minutes under 2 days, whole hours beyond), so rounding changes none of them.
 */

const stamp = Date.now();
const D = testDay(205);
let c: Catalog;
let patientIds: number[];
let readerA: User;
let readerB: User;
const ids: Record<string, number> = {};

const minutes = (n: number) => n * 60_000;

interface Plan {
  key: string;
  room: number;
  type: 'thyroid' | 'abdomen-complete' | 'echo-tte';
  hh: number;
  mm: number;
  status: Exam['status'];
  steps?: { booked: number; scan?: number; toPrelim?: number; toSigned?: number; signer?: 'A' | 'B' };
}

const PLAN: Plan[] = [
  { key: 'E1', room: 0, type: 'thyroid', hh: 8, mm: 0, status: 'completed', steps: { booked: 4320, scan: 40, toPrelim: 5, toSigned: 15, signer: 'A' } },
  { key: 'E2', room: 0, type: 'thyroid', hh: 8, mm: 30, status: 'completed', steps: { booked: 1440, scan: 35, toPrelim: 10, toSigned: 75, signer: 'A' } },
  { key: 'E3', room: 0, type: 'abdomen-complete', hh: 9, mm: 0, status: 'completed', steps: { booked: 2880, scan: 55, toPrelim: 5, toSigned: 180, signer: 'A' } },
  { key: 'E4', room: 0, type: 'abdomen-complete', hh: 10, mm: 0, status: 'noshow' },
  { key: 'E5', room: 0, type: 'thyroid', hh: 11, mm: 0, status: 'cancelled' },
  { key: 'E6', room: 1, type: 'abdomen-complete', hh: 8, mm: 0, status: 'completed', steps: { booked: 7200, scan: 50, toPrelim: 20 } },
  { key: 'E7', room: 1, type: 'thyroid', hh: 9, mm: 0, status: 'booked' },
  { key: 'E8', room: 2, type: 'echo-tte', hh: 8, mm: 0, status: 'completed', steps: { booked: 5760, scan: 75, toPrelim: 15, toSigned: 1530, signer: 'B' } },
  { key: 'E9', room: 2, type: 'echo-tte', hh: 9, mm: 0, status: 'arrived', steps: { booked: 14400 } },
];

/** Writes the planned exams, reports and payments directly (their times lie in the past of D). */
async function buildDataSet(): Promise<void> {
  for (const [i, p] of PLAN.entries()) {
    const room = c.rooms[p.room]!;
    const type = c.types[p.type]!;
    const start = new Date(at(D, p.hh, p.mm));
    const arrivedAt = p.steps ? start : null; // arrived at the scheduled start
    const completedAt = p.steps?.scan !== undefined ? new Date(start.getTime() + minutes(p.steps.scan)) : null;
    const exam = await Exam.create({
      accessionNumber: `DB${String(stamp).slice(-9)}${i}`,
      patientId: patientIds[i]!,
      examTypeId: type.id,
      referrerId: null,
      roomId: room.id,
      scannerId: room.scannerId,
      sonographerId: room.sonographerId,
      scheduledStart: start,
      scheduledEnd: new Date(start.getTime() + minutes(type.durationMinutes)),
      durationMinutes: type.durationMinutes,
      status: p.status,
      indication: 'Dashboard test',
      studyInstanceUid: `2.25.77${stamp}${i}`,
      priceCents: 18_000,
      currency: 'USD',
      cancelReason: p.status === 'cancelled' ? 'Test' : null,
      payer: 'self-pay',
      createdBy: null,
      // Booked the planned minutes before arrival (exams never reached: a week before the start).
      createdAt: new Date(start.getTime() - minutes(p.steps?.booked ?? 7 * 1440)),
      arrivedAt,
      startedAt: arrivedAt,
      completedAt,
    });
    ids[p.key] = exam.id;
    if (completedAt && p.steps?.toPrelim !== undefined) {
      const submittedAt = new Date(completedAt.getTime() + minutes(p.steps.toPrelim));
      const signer = p.steps.signer === 'A' ? readerA : p.steps.signer === 'B' ? readerB : null;
      await Report.create({
        examId: exam.id,
        templateId: p.type === 'echo-tte' ? 'echo' : p.type === 'thyroid' ? 'thyroid' : 'abdomen',
        templateVersion: '1',
        referenceSetVersion: 'dashboard-test',
        status: signer ? 'final' : 'preliminary',
        measurements: {},
        nodules: [],
        heightCm: null,
        weightKg: null,
        probeId: null,
        probeKind: null,
        evaluation: null,
        findingsText: null,
        createdBy: room.sonographerId,
        updatedBy: room.sonographerId,
        submittedBy: room.sonographerId,
        submittedAt,
        signedBy: signer?.id ?? null,
        signedAt: signer ? new Date(submittedAt.getTime() + minutes(p.steps.toSigned!)) : null,
        signedHash: signer ? 'f'.repeat(64) : null,
      });
    }
  }
  // Money (USD): succeeded rows on D count; a failed and a pending one do not; one taken at 23:30
  // the evening before (already D in UTC) belongs to the day before; one at 23:30 on D (already the
  // next day in UTC) belongs to D.
  const pay = (key: string, kind: Payment['kind'], cents: number, when: string, status: Payment['status'] = 'succeeded') =>
    Payment.create({ examId: ids[key]!, kind, amountCents: cents, currency: 'USD', status, idempotencyKey: `dash-${stamp}-${key}-${kind}-${when}-${status}`, paymentMethod: null, providerIntentId: null, providerRefundId: null, refundOfId: null, failureCode: null, failureMessage: null, createdBy: null, createdAt: new Date(when) });
  await pay('E1', 'deposit', 5_000, at(D, 7, 0));
  await pay('E1', 'balance', 13_000, at(D, 8, 45));
  await pay('E4', 'deposit', 7_500, at(D, 7, 30));
  await pay('E5', 'deposit', 5_000, at(D, 6, 0));
  await pay('E5', 'refund', 5_000, at(D, 10, 0));
  await pay('E3', 'balance', 18_000, at(D, 10, 0), 'failed');
  await pay('E3', 'balance', 20_000, at(D, 23, 30));
  await pay('E8', 'deposit', 10_000, at(addDays(D, -1), 23, 30));
  await pay('E6', 'balance', 26_000, at(D, 12, 0), 'pending');
}

beforeAll(async () => {
  testDb();
  c = await catalog();
  patientIds = (await Patient.findAll({ order: [['id', 'ASC']], limit: 12 })).map((p) => p.id);
  readerA = (await User.findOne({ where: { role: 'radiologist', email: 'reader@fernhollow.test' } }))!;
  readerB = await User.create({ email: `second-reader-${stamp}@tests.test`, displayName: `Dr Second Reader ${stamp}`, role: 'radiologist', passwordHash: 'not-a-hash', referrerId: null });
  await buildDataSet();
});
afterAll(closeTestDb);

const dashboard = async (from = D, to = D) => call('GET', `/api/dashboard?from=${from}&to=${to}`, { cookie: await sessionFor('admin') });
/** The first row of a table (as the JSON answer has it) whose cells match. */
const row = (rows: Array<Record<string, unknown>>, match: Record<string, unknown>): any => rows.find((r) => Object.entries(match).every(([k, v]) => r[k] === v));

describe('the clinic dashboard for one hand-built day', () => {
  it('the data set is what the comment says (created times as planned, clinic hours as the demo seeds them)', async () => {
    const e1 = (await Exam.findByPk(ids.E1))!;
    expect(e1.scheduledStart.getTime() - e1.createdAt.getTime()).toBe(minutes(4320));
    // Open minutes below assume the demo's hours on D's weekday: 08:00–17:00 (540 minutes), D not closed.
    const hours = (await Setting.findByPk('clinic.hours'))!.value as { weekly: Array<Array<{ open: string; close: string }>>; closedDates: string[] };
    expect(hours.weekly[new Date(`${D}T12:00:00Z`).getUTCDay()]).toEqual([{ open: '08:00', close: '17:00' }]);
    expect(hours.closedDates).not.toContain(D);
  });

  it('counts exams by type and status, with no-show and cancellation rates', async () => {
    const res = await dashboard();
    expect(res.status).toBe(200);
    const rows = res.body.tables.exams.rows;
    // All nine: booked 1 (E7), arrived 1 (E9), completed 5, cancelled 1 (E5), no-show 1 (E4).
    // No-show rate = 1 / (arrived 1 + completed 5 + no-show 1) = 1/7 = 14.3 %; cancellation rate = 1/9 = 11.1 % (by hand).
    expect(row(rows, { examType: 'All exam types' })).toEqual({ examType: 'All exam types', booked: 1, arrived: 1, inProgress: 0, completed: 5, cancelled: 1, noshow: 1, total: 9, noShowRatePercent: 14.3, cancellationRatePercent: 11.1 });
    // Abdomen: E3, E6 completed, E4 no-show → 1/3 = 33.3 %, nothing cancelled (by hand).
    expect(row(rows, { examType: 'Abdomen, complete' })).toMatchObject({ completed: 2, noshow: 1, total: 3, noShowRatePercent: 33.3, cancellationRatePercent: 0 });
    // Thyroid: E1, E2 completed, E5 cancelled, E7 booked → no-shows 0/2 = 0 %, cancelled 1/4 = 25 % (by hand).
    expect(row(rows, { examType: 'Thyroid ultrasound' })).toMatchObject({ booked: 1, completed: 2, cancelled: 1, total: 4, noShowRatePercent: 0, cancellationRatePercent: 25 });
    expect(res.body.cards).toMatchObject({ exams: 9, completed: 5, noShowRatePercent: 14.3, cancellationRatePercent: 11.1 });
  });

  it('gives turnaround medians and 90th percentiles (linear between closest ranks) per step and exam type', async () => {
    const rows = (await dashboard()).body.tables.turnaroundTypes.rows;
    const all = (step: string) => row(rows, { examType: 'All exam types', step });
    // Booking to arrival, six exams: 1440, 2880, 4320, 5760, 7200, 14400. Median at rank 3.5 = (4320 + 5760) / 2 = 5040;
    // p90 at rank 1 + 0.9 × 5 = 5.5 = 7200 + 0.5 × 7200 = 10800 (by hand).
    expect(all('Booking to arrival')).toEqual({ examType: 'All exam types', step: 'Booking to arrival', exams: 6, medianMinutes: 5040, p90Minutes: 10800 });
    // Arrival to end of scan: 35, 40, 50, 55, 75. Median 50; p90 at rank 4.6 = 55 + 0.6 × 20 = 67 (by hand).
    expect(all('Arrival to end of scan')).toMatchObject({ exams: 5, medianMinutes: 50, p90Minutes: 67 });
    // End of scan to preliminary: 5, 5, 10, 15, 20. Median 10; p90 at rank 4.6 = 15 + 0.6 × 5 = 18 (by hand).
    expect(all('End of scan to preliminary report')).toMatchObject({ exams: 5, medianMinutes: 10, p90Minutes: 18 });
    // Preliminary to signed: 15, 75, 180, 1530. Median at rank 2.5 = (75 + 180) / 2 = 127.5; p90 at rank 3.7 = 180 + 0.7 × 1350 = 1125 (by hand).
    expect(all('Preliminary to signed report')).toMatchObject({ exams: 4, medianMinutes: 127.5, p90Minutes: 1125 });
    // Booking to signed: 1560, 3120, 4380, 7380. Median (3120 + 4380) / 2 = 3750; p90 at rank 3.7 = 4380 + 0.7 × 3000 = 6480 (by hand).
    expect(all('Booking to signed report')).toMatchObject({ exams: 4, medianMinutes: 3750, p90Minutes: 6480 });
    // Thyroid only, arrival to end of scan: 35, 40. Median 37.5; p90 at rank 1.9 = 35 + 0.9 × 5 = 39.5 (by hand).
    expect(row(rows, { examType: 'Thyroid ultrasound', step: 'Arrival to end of scan' })).toMatchObject({ exams: 2, medianMinutes: 37.5, p90Minutes: 39.5 });
    // Echo never reached a preliminary report except E8: one value, 15 minutes.
    expect(row(rows, { examType: 'Echocardiogram, transthoracic', step: 'End of scan to preliminary report' })).toMatchObject({ exams: 1, medianMinutes: 15, p90Minutes: 15 });
  });

  it('gives reading turnaround per radiologist', async () => {
    const res = await dashboard();
    const rows = res.body.tables.turnaroundRadiologists.rows;
    // Reader A signed E1, E2, E3: reading 15, 75, 180 → median 75; p90 at rank 2.8 = 75 + 0.8 × 105 = 159.
    // Booking to signed 1560, 3120, 4380 → median 3120; p90 at rank 2.8 = 3120 + 0.8 × 1260 = 4128 (by hand).
    expect(row(rows, { radiologist: readerA.displayName })).toEqual({ radiologist: readerA.displayName, signed: 3, readingMedianMinutes: 75, readingP90Minutes: 159, wholeMedianMinutes: 3120, wholeP90Minutes: 4128 });
    // Reader B signed E8 alone: 1530 and 7380.
    expect(row(rows, { radiologist: readerB.displayName })).toMatchObject({ signed: 1, readingMedianMinutes: 1530, readingP90Minutes: 1530, wholeMedianMinutes: 7380, wholeP90Minutes: 7380 });
    expect(row(rows, { radiologist: 'All radiologists' })).toMatchObject({ signed: 4, readingMedianMinutes: 127.5, readingP90Minutes: 1125 });
    expect(res.body.cards.readingMedianMinutes).toBe(127.5);
  });

  it('gives room utilisation: booked minutes (no-shows in, cancellations out) over open minutes', async () => {
    const res = await dashboard();
    const rows = res.body.tables.rooms.rows;
    // Room 1: E1 30 + E2 30 + E3 45 + E4 45 (no-show) = 150 of 540 → 27.8 % (E5 cancelled, left out) (by hand).
    expect(row(rows, { room: c.rooms[0]!.name })).toEqual({ room: c.rooms[0]!.name, openMinutes: 540, bookedMinutes: 150, utilisationPercent: 27.8 });
    // Room 2: E6 45 + E7 30 = 75 of 540 → 13.9 %; Room 3: E8 60 + E9 60 = 120 of 540 → 22.2 % (by hand).
    expect(row(rows, { room: c.rooms[1]!.name })).toMatchObject({ openMinutes: 540, bookedMinutes: 75, utilisationPercent: 13.9 });
    expect(row(rows, { room: c.rooms[2]!.name })).toMatchObject({ openMinutes: 540, bookedMinutes: 120, utilisationPercent: 22.2 });
    // All rooms: 345 booked over 540 × the rooms in use (the demo's three, unless a test added one).
    const inUse = rows.length - 1;
    const total = row(rows, { room: 'All rooms' });
    expect(total).toMatchObject({ openMinutes: 540 * inUse, bookedMinutes: 345 });
    if (inUse === 3) expect(total.utilisationPercent).toBe(21.3); // 345 / 1620 = 21.296… → 21.3 (by hand)
  });

  it('gives takings by clinic day: deposits, balances and refunds that went through', async () => {
    const res = await dashboard(addDays(D, -1), D);
    const rows = res.body.tables.takings.rows;
    // D: deposits 5000 (E1) + 7500 (E4) + 5000 (E5) = 17500; balances 13000 (E1) + 20000 (E3, 23:30) = 33000;
    // refunds 5000 (E5); net 17500 + 33000 − 5000 = 45500 cents (by hand). The failed and the pending rows do not count.
    expect(row(rows, { day: D })).toEqual({ day: D, currency: 'USD', depositsCents: 17_500, balancesCents: 33_000, refundsCents: 5_000, netCents: 45_500 });
    // The day before: E8's deposit at 23:30 clinic time (already D in UTC) (by hand).
    expect(row(rows, { day: addDays(D, -1) })).toEqual({ day: addDays(D, -1), currency: 'USD', depositsCents: 10_000, balancesCents: 0, refundsCents: 0, netCents: 10_000 });
    expect(res.body.cards).toMatchObject({ currency: 'USD', netCents: 55_500 });
    expect((await dashboard()).body.cards.netCents).toBe(45_500);
  });
});

/** RFC 4180 fields of a CSV text (quoted fields may hold commas, quotes and line breaks). */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let field = '';
  let fields: string[] = [];
  let quoted = false;
  for (let i = 0; i < text.length; i += 1) {
    const ch = text[i]!;
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') (field += '"'), (i += 1);
      else if (ch === '"') quoted = false;
      else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') fields.push(field), (field = '');
    else if (ch === '\r' && text[i + 1] === '\n') fields.push(field), rows.push(fields), (fields = []), (field = ''), (i += 1);
    else field += ch;
  }
  return rows;
}

describe('CSV export', () => {
  const exportCsv = async (table: string, from = D, to = D) => call('GET', `/api/dashboard/export?table=${table}&from=${from}&to=${to}`, { cookie: await sessionFor('admin') });
  const tableKeys = { exams: 'exams', 'turnaround-types': 'turnaroundTypes', 'turnaround-radiologists': 'turnaroundRadiologists', rooms: 'rooms', takings: 'takings' } as const;

  it('answers each table as a CSV file with exactly the rows and columns the dashboard shows', async () => {
    const shown = (await dashboard()).body.tables;
    for (const [name, key] of Object.entries(tableKeys)) {
      const res = await exportCsv(name);
      expect(res.status, name).toBe(200);
      expect(res.headers.get('content-type')).toBe('text/csv; charset=utf-8');
      expect(res.headers.get('content-disposition')).toBe(`attachment; filename="crestline-${name}-${D}-to-${D}.csv"`);
      const text = res.body as string;
      expect(text.charCodeAt(0), 'no byte-order mark').not.toBe(0xfeff);
      const [header, ...lines] = parseCsv(text);
      const table = shown[key];
      expect(header).toEqual(table.columns.map((col: { label: string }) => col.label));
      expect(lines).toHaveLength(table.rows.length);
      lines.forEach((cells, i) => {
        table.columns.forEach((col: { key: string; kind: string }, j: number) => {
          const value = table.rows[i][col.key];
          const cell = cells[j];
          if (value === null) expect(cell).toBe('');
          else if (col.kind === 'text') expect(cell).toBe(value);
          else if (col.kind === 'money') expect(Math.round(Number(cell) * 100)).toBe(value);
          else expect(Number(cell)).toBe(value);
        });
      });
    }
  });

  it('quotes an exam type holding a comma and writes money in major units (lines worked out by hand)', async () => {
    const exams = (await exportCsv('exams')).body as string;
    expect(exams.split('\r\n')).toContain('"Abdomen, complete",0,0,0,2,0,1,3,33.3,0');
    const takings = (await exportCsv('takings')).body as string;
    expect(takings).toBe(`Day,Currency,Deposits,Balances,Refunds,Net takings\r\n${D},USD,175.00,330.00,50.00,455.00\r\n`);
  });
});

describe('who may see it, and what a period may be', () => {
  it('refuses every role but the manager (403)', async () => {
    for (const role of ['frontdesk', 'radiologist', 'sonographer', 'referrer'] as const) {
      const cookie = await sessionFor(role);
      expect((await call('GET', `/api/dashboard?from=${D}&to=${D}`, { cookie })).status, role).toBe(403);
      expect((await call('GET', `/api/dashboard/export?table=rooms&from=${D}&to=${D}`, { cookie })).status, role).toBe(403);
    }
  });

  it('answers a bad period with 400 naming the field', async () => {
    const admin = await sessionFor('admin');
    const bad = async (query: string) => (await call('GET', `/api/dashboard${query}`, { cookie: admin })).body.error;
    expect(await bad(`?from=${D}&to=${addDays(D, -1)}`)).toMatchObject({ code: 'VALIDATION', fields: { to: 'The last day comes before the first.' } });
    expect(await bad(`?from=${D}&to=${addDays(D, 366)}`)).toMatchObject({ code: 'VALIDATION', fields: { to: 'Choose at most 366 days.' } }); // 367 days
    expect((await bad('?from=2026-02-30&to=2026-03-02')).fields).toHaveProperty('from');
    expect((await bad(`?to=${D}`)).fields).toHaveProperty('from');
    expect((await call('GET', `/api/dashboard?from=${D}&to=${addDays(D, 365)}`, { cookie: admin })).status).toBe(200); // 366 days
    const exportBad = await call('GET', `/api/dashboard/export?table=patients&from=${D}&to=${D}`, { cookie: admin });
    expect(exportBad.status).toBe(400);
    expect(exportBad.body.error.fields).toHaveProperty('table');
    expect((await call('GET', `/api/dashboard/export?table=rooms&from=${D}&to=${addDays(D, -3)}`, { cookie: admin })).status).toBe(400);
  });
});

describe('the times the dashboard reads are stamped as the exam moves', () => {
  it('check-in, start and submission set arrived, started and completed', async () => {
    const day = testDay(207);
    const booked = await book(bookingBody(c, { patientId: patientIds[10]!, start: at(day, 9, 0), type: 'thyroid', payer: 'insured' }));
    expect(booked.status).toBe(201);
    const id = booked.body.exam.id as number;
    const before = Date.now() - 1_000;
    expect((await call('POST', `/api/exams/${id}/status`, { cookie: await sessionFor('frontdesk'), json: { version: 0, to: 'arrived' } })).status).toBe(200);
    const sono = await sessionFor('sonographer');
    const started = await call('POST', `/api/exams/${id}/start`, { cookie: sono, json: { version: 1 } });
    expect(started.status).toBe(200);
    const reportId = started.body.reportId as number;
    const measurements = { rightLobeLengthCm: 4.8, rightLobeWidthCm: 1.6, rightLobeDepthCm: 1.5, leftLobeLengthCm: 4.5, leftLobeWidthCm: 1.5, leftLobeDepthCm: 1.4, isthmusThicknessMm: 3, echotexture: 'homogeneous' };
    expect((await call('PUT', `/api/reports/${reportId}/draft`, { cookie: sono, json: { version: 0, measurements, nodules: [], heightCm: null, weightKg: null, probeId: null } })).status).toBe(200);
    expect((await call('POST', `/api/reports/${reportId}/submit`, { cookie: sono, json: { version: 1 } })).status).toBe(200);
    const exam = (await Exam.findByPk(id))!;
    const report = (await Report.findOne({ where: { examId: id } }))!;
    expect(exam.arrivedAt!.getTime()).toBeGreaterThanOrEqual(Math.floor(before / 1000) * 1000);
    expect(exam.startedAt!.getTime()).toBeGreaterThanOrEqual(exam.arrivedAt!.getTime());
    expect(exam.completedAt!.getTime()).toBeGreaterThanOrEqual(exam.startedAt!.getTime());
    // The exam completes when its preliminary report is submitted, in the same transaction (to the second).
    expect(Math.abs(exam.completedAt!.getTime() - report.submittedAt!.getTime())).toBeLessThan(1_000);
  });
});

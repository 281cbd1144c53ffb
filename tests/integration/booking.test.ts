import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Exam, Patient } from '../../src/db/models';
import { ACCESSION_PATTERN } from '../../src/lib/identifiers';
import { nextValue } from '../../src/server/services/sequences';
import { at, book, bookingBody, catalog, testDay, type Catalog } from '../helpers/booking';
import { closeTestDb, testDb } from '../helpers/db';
import { call, sessionFor } from '../helpers/http';

let c: Catalog;
let patientIds: number[];

beforeAll(async () => {
  testDb();
  c = await catalog();
  patientIds = (await Patient.findAll({ order: [['id', 'ASC']], limit: 20 })).map((p) => p.id);
});
afterAll(closeTestDb);

describe('booking without clashes', () => {
  it('books a free slot, with a unique accession number, a study UID and an audit event', async () => {
    const day = testDay(0);
    const res = await book(bookingBody(c, { patientId: patientIds[0]!, start: at(day, 9, 0) }));
    expect(res.status).toBe(201);
    expect(res.body.exam.accessionNumber).toMatch(ACCESSION_PATTERN);
    expect(res.body.exam.paymentState).toBe('deposit-due');
    const exam = await Exam.findByPk(res.body.exam.id);
    expect(exam!.studyInstanceUid).toMatch(/^2\.25\.\d+$/);
    expect(exam!.scheduledEnd.getTime() - exam!.scheduledStart.getTime()).toBe(45 * 60_000);
    expect(await AuditEvent.count({ where: { action: 'exam.book', entityId: String(exam!.id) } })).toBe(1);
  });

  it('lets exactly one of two simultaneous bookings of the same slot through; the other gets 409 naming the clash', async () => {
    const day = testDay(1);
    const body = bookingBody(c, { patientId: patientIds[1]!, start: at(day, 10, 0) });
    const [a, b] = await Promise.all([book(body), book({ ...body, patientId: patientIds[2]! })]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    const loser = a.status === 409 ? a : b;
    expect(loser.body.error.code).toBe('CONFLICT');
    expect(loser.body.error.message).toMatch(new RegExp(`${c.rooms[0]!.name} is already booked 10:00–10:45`));
  });

  it('refuses an overlap on the sonographer or the scanner even in another room', async () => {
    const day = testDay(2);
    expect((await book(bookingBody(c, { patientId: patientIds[3]!, start: at(day, 9, 0), roomIndex: 1 }))).status).toBe(201);
    // Same sonographer as room 1's booking, different room and scanner, overlapping time.
    const clash = { ...bookingBody(c, { patientId: patientIds[4]!, start: at(day, 9, 30), roomIndex: 2 }), sonographerId: c.rooms[1]!.sonographerId };
    const res = await book(clash);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/is already booked 09:00–09:45/);
    // Back to back is fine: 09:45 starts when the first one ends.
    expect((await book({ ...clash, start: at(day, 9, 45) })).status).toBe(201);
  });

  it('refuses a start in the past, outside opening hours, or a scanner that is not in the room (422, nothing written)', async () => {
    const before = await Exam.count();
    const past = await book(bookingBody(c, { patientId: patientIds[5]!, start: new Date(Date.now() - 3_600_000).toISOString() }));
    expect(past.status).toBe(422);
    expect(past.body.error.fields.start).toBeDefined();
    const day = testDay(3);
    const early = await book(bookingBody(c, { patientId: patientIds[5]!, start: at(day, 7, 0) }));
    expect(early.status).toBe(422);
    // 16:30 + 45 min runs past 17:00 closing.
    const late = await book(bookingBody(c, { patientId: patientIds[5]!, start: at(day, 16, 30) }));
    expect(late.status).toBe(422);
    const wrongScanner = await book({ ...bookingBody(c, { patientId: patientIds[5]!, start: at(day, 11, 0) }), scannerId: c.rooms[1]!.scannerId });
    expect(wrongScanner.status).toBe(422);
    expect(wrongScanner.body.error.fields.scannerId).toMatch(/is not in/);
    expect(await Exam.count()).toBe(before);
  });

  it('hands out distinct accession numbers to bookings made at the same moment', async () => {
    const day = testDay(4);
    const bodies = [9, 10, 11, 13, 14].flatMap((h, i) => [0, 1, 2].map((room) => bookingBody(c, { patientId: patientIds[(i * 3 + room) % patientIds.length]!, start: at(day, h, 0), roomIndex: room, type: 'thyroid' })));
    const results = await Promise.all(bodies.map((b) => book(b)));
    expect(results.map((r) => r.status)).toEqual(bodies.map(() => 201));
    const numbers = results.map((r) => r.body.exam.accessionNumber);
    expect(new Set(numbers).size).toBe(numbers.length);
  });

  it('never hands out a counter value twice, even from parallel transactions', async () => {
    const values = await Promise.all(Array.from({ length: 20 }, () => testDb().transaction((t) => nextValue('test-counter', t))));
    expect(new Set(values).size).toBe(20);
  });

  it('suggests only free slots that fit the duration', async () => {
    const day = testDay(5);
    const first = await book(bookingBody(c, { patientId: patientIds[6]!, start: at(day, 8, 0) }));
    expect(first.status).toBe(201);
    const room = c.rooms[0]!;
    const res = await call('GET', `/api/slots?examTypeId=${c.types['abdomen-complete']!.id}&roomId=${room.id}&scannerId=${room.scannerId}&sonographerId=${room.sonographerId}&from=${day}`, { cookie: await sessionFor('frontdesk') });
    expect(res.status).toBe(200);
    const onDay = res.body.slots.filter((s: { day: string }) => s.day === day).map((s: { time: string }) => s.time);
    // 08:00–08:45 is taken; 08:15 and 08:30 would overlap it.
    expect(onDay.slice(0, 3)).toEqual(['08:45', '09:00', '09:15']);
    // The last 45-minute start before 17:00 closing is 16:15.
    expect(onDay).not.toContain('16:30');
  });
});

describe('the exam lifecycle from the desk', () => {
  it('checks in, refuses a second check-in with a stale version, and reschedules only booked exams', async () => {
    const day = testDay(6);
    const created = (await book(bookingBody(c, { patientId: patientIds[7]!, start: at(day, 9, 0) }))).body.exam;
    const desk = await sessionFor('frontdesk');
    const moved = await call('POST', `/api/exams/${created.id}/reschedule`, { cookie: desk, json: { version: 0, start: at(day, 11, 0) } });
    expect(moved.status).toBe(200);
    expect((await Exam.findByPk(created.id))!.scheduledStart.toISOString()).toBe(at(day, 11, 0));
    const stale = await call('POST', `/api/exams/${created.id}/status`, { cookie: desk, json: { version: 0, to: 'arrived' } });
    expect(stale.status).toBe(409);
    const ok = await call('POST', `/api/exams/${created.id}/status`, { cookie: desk, json: { version: 1, to: 'arrived' } });
    expect(ok.status).toBe(200);
    expect(ok.body.exam.status).toBe('arrived');
    const again = await call('POST', `/api/exams/${created.id}/reschedule`, { cookie: desk, json: { version: 2, start: at(day, 13, 0) } });
    expect(again.status).toBe(422);
    const actions = (await AuditEvent.findAll({ where: { entityType: 'exam', entityId: String(created.id) }, order: [['id', 'ASC']] })).map((e) => e.action);
    expect(actions).toEqual(['exam.book', 'exam.reschedule', 'exam.check-in']);
  });

  it('lists a day on the worklist, filtered by room and status, paged on the server', async () => {
    const day = testDay(4);
    const staff = await sessionFor('sonographer');
    const all = await call('GET', `/api/worklist?day=${day}&pageSize=4`, { cookie: staff });
    expect(all.status).toBe(200);
    expect(all.body.total).toBe(15);
    expect(all.body.rows).toHaveLength(4);
    const room = await call('GET', `/api/worklist?day=${day}&roomId=${c.rooms[1]!.id}&sort=time&dir=desc`, { cookie: staff });
    expect(room.body.total).toBe(5);
    expect(room.body.rows.map((r: { time: string }) => r.time)).toEqual(['14:00', '13:00', '11:00', '10:00', '09:00']);
    const none = await call('GET', `/api/worklist?day=${day}&status=completed`, { cookie: staff });
    expect(none.body.total).toBe(0);
  });
});

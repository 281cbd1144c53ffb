import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op } from 'sequelize';
import { AuditEvent, Exam, ExamType, Probe, Room, Scanner } from '../../src/db/models';
import { bookingCatalog } from '../../src/server/services/catalog';
import { at, book, bookingBody, catalog, testDay, type Catalog } from '../helpers/booking';
import { closeTestDb, testDb } from '../helpers/db';
import { call, sessionFor } from '../helpers/http';
import { dcmtk, DICOM, worklistQuery } from '../helpers/scanner';

/**
 * The manager's catalog (exam types, rooms, scanners, probes) over its API, and what a change
 * does to booking and to the scanners' DICOM worklist. Days testDay(230…240) belong here.
 * Everything this file creates is removed at the end, and nothing of the demo catalog is
 * changed, so the files after this one find the demo clinic as seeded.
 */

const API = '/api/admin/catalog';
// Letters only, upper case: usable in names, AE titles and serial numbers alike.
const RUN = randomUUID().replace(/-/g, '').slice(0, 6).replace(/[0-9a-f]/g, (h) => String.fromCharCode(65 + parseInt(h, 16)));
let admin: string;
let desk: string;
let c: Catalog;
let demoAe: string;
const created = { examTypes: [] as number[], rooms: [] as number[], scanners: [] as number[], probes: [] as number[], exams: [] as number[] };

beforeAll(async () => {
  testDb();
  [admin, desk, c] = await Promise.all([sessionFor('admin'), sessionFor('frontdesk'), catalog()]);
  demoAe = (await Scanner.findByPk(c.rooms[0]!.scannerId))!.aeTitle;
});

afterAll(async () => {
  await Exam.destroy({ where: { id: created.exams } });
  await Probe.destroy({ where: { id: created.probes } });
  await Scanner.destroy({ where: { id: created.scanners } });
  await Room.destroy({ where: { id: created.rooms } });
  await ExamType.destroy({ where: { id: created.examTypes } });
  await closeTestDb();
});

const post = async (list: string, json: unknown, cookie = admin) => call('POST', `${API}/${list}`, { cookie, json });
const put = async (list: string, id: number, json: unknown) => call('PUT', `${API}/${list}/${id}`, { cookie: admin, json });
const patch = async (list: string, id: number, json: unknown) => call('PATCH', `${API}/${list}/${id}`, { cookie: admin, json });

async function newExamType(extra: Record<string, unknown> = {}) {
  const res = await post('exam-types', {
    name: `Carotid duplex ${RUN} ${created.examTypes.length}`,
    templateId: 'abdomen',
    durationMinutes: 30,
    probeKind: 'linear',
    preparationText: 'No preparation is needed.',
    selfPayPriceCents: 10_000,
    depositCents: 2_000,
    ...extra,
  });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  created.examTypes.push(res.body.row.id);
  return res.body.row;
}

async function newRoom(name = `Room ${RUN} ${created.rooms.length}`) {
  const res = await post('rooms', { name });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  created.rooms.push(res.body.row.id);
  return res.body.row;
}

/** A room with its own scanner, so no other file's bookings or scanners are touched. */
async function newScanner(aeTitle = `T${RUN}${created.scanners.length}`) {
  const room = await newRoom();
  const res = await post('scanners', { roomId: room.id, name: `Scanner ${RUN} ${created.scanners.length}`, aeTitle });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  created.scanners.push(res.body.row.id);
  return res.body.row;
}

async function newPatient(n: number): Promise<number> {
  const res = await call('POST', '/api/patients', {
    cookie: desk,
    json: { familyName: `Catalog${RUN}`, givenName: `Test${'ABCDEFGH'[n]}`, birthDate: `197${n}-03-0${n + 1}`, sex: 'female', email: '', phone: '+1 555 0142 100', addressLine: '4 Kestrel Row', city: 'Marrow Bay', postalCode: '40311' },
  });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.patient.id;
}

async function bookOk(body: Record<string, unknown>) {
  const res = await book(body);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  created.exams.push(res.body.exam.id);
  return (await Exam.findByPk(res.body.exam.id))!;
}

const audits = (action: string, id: number) => AuditEvent.findAll({ where: { action, entityId: String(id) }, order: [['id', 'ASC']] });

describe('who may change the catalog', () => {
  it('is the manager only: 401 signed out, 403 for every other role', async () => {
    expect((await call('GET', `${API}/scanners`)).status).toBe(401);
    for (const role of ['frontdesk', 'sonographer', 'radiologist', 'referrer'] as const) {
      const res = await post('rooms', { name: `Room ${RUN} by ${role}` }, await sessionFor(role));
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('FORBIDDEN');
    }
    expect(await Room.count({ where: { name: { [Op.startsWith]: `Room ${RUN} by` } } })).toBe(0);
  });

  it('never deletes: DELETE is refused with 405 and the row stays', async () => {
    const type = await newExamType();
    const res = await call('DELETE', `${API}/exam-types/${type.id}`, { cookie: admin });
    expect(res.status).toBe(405);
    expect(res.body.error.message).toMatch(/never deleted.*Deactivate it instead/);
    expect(await ExamType.findByPk(type.id)).not.toBeNull();
  });
});

describe('exam types', () => {
  it('are created and edited with each change audited by field name, prices with old and new cents', async () => {
    const type = await newExamType();
    expect(type).toMatchObject({ active: true, version: 0, currency: 'USD', examCount: 0, selfPayPriceCents: 10_000 });
    expect(type.code).toMatch(/^carotid-duplex-/);
    expect(await audits('catalog.exam-type.create', type.id)).toHaveLength(1);

    const res = await put('exam-types', type.id, { ...type, name: `${type.name} (bilateral)`, preparationText: 'Wear an open-necked top.', selfPayPriceCents: 12_500, version: 0 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.row).toMatchObject({ version: 1, selfPayPriceCents: 12_500, preparationText: 'Wear an open-necked top.' });
    const [event] = await audits('catalog.exam-type.update', type.id);
    expect(event!.detail).toEqual({ changed: ['name', 'preparationText', 'selfPayPriceCents'], selfPayPriceCents: { from: 10_000, to: 12_500 } });
    expect(event!.actorUserId).toBeGreaterThan(0);
  });

  it('refuse a stale edit with 409 and keep the newer change', async () => {
    const type = await newExamType();
    expect((await put('exam-types', type.id, { ...type, durationMinutes: 40, version: 0 })).status).toBe(200);
    const stale = await put('exam-types', type.id, { ...type, durationMinutes: 50, version: 0 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('STALE');
    expect((await ExamType.findByPk(type.id))!.durationMinutes).toBe(40);
    const staleToggle = await patch('exam-types', type.id, { version: 0, active: false });
    expect(staleToggle.status).toBe(409);
    expect((await ExamType.findByPk(type.id))!.active).toBe(true);
  });

  it('answer bad bodies with 400 and a message per field', async () => {
    const res = await post('exam-types', { name: '', templateId: 'kidney', durationMinutes: 3, probeKind: 'sector', preparationText: '', selfPayPriceCents: -1, depositCents: 1.5 });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['depositCents', 'durationMinutes', 'name', 'preparationText', 'probeKind', 'selfPayPriceCents', 'templateId']);
    const tooLong = await post('exam-types', { name: 'X ray', templateId: 'echo', durationMinutes: 241, probeKind: 'phased-array', preparationText: 'None.', selfPayPriceCents: 100, depositCents: 200 });
    expect(tooLong.status).toBe(400);
    expect(tooLong.body.error.fields).toEqual({ durationMinutes: expect.stringMatching(/240/), depositCents: 'The deposit cannot be more than the price.' });
    expect((await put('exam-types', 1, { name: 'No version' })).status).toBe(400);
  });

  it('refuse a second type with the same name (409)', async () => {
    const res = await post('exam-types', { name: c.types.thyroid!.name, templateId: 'thyroid', durationMinutes: 30, probeKind: 'linear', preparationText: 'None.', selfPayPriceCents: 0, depositCents: 0 });
    expect(res.status).toBe(409);
    expect(res.body.error.fields).toHaveProperty('name');
  });

  it('a price change leaves booked exams at the price they were booked at; new bookings take the new price', async () => {
    const type = await newExamType();
    const day = testDay(231);
    const room = c.rooms[0]!;
    const body = (patientId: number, hour: number) => ({ ...bookingBody(c, { patientId, start: at(day, hour), payer: 'self-pay' }), examTypeId: type.id, roomId: room.id, scannerId: room.scannerId });
    const before = await bookOk(body(await newPatient(0), 9));
    expect([before.priceCents, before.depositCents]).toEqual([10_000, 2_000]);

    const res = await put('exam-types', type.id, { ...type, selfPayPriceCents: 14_000, depositCents: 3_500, version: type.version });
    expect(res.status).toBe(200);
    const [event] = await audits('catalog.exam-type.update', type.id);
    expect(event!.detail).toEqual({ changed: ['selfPayPriceCents', 'depositCents'], selfPayPriceCents: { from: 10_000, to: 14_000 }, depositCents: { from: 2_000, to: 3_500 } });

    await before.reload();
    expect([before.priceCents, before.depositCents]).toEqual([10_000, 2_000]);
    const after = await bookOk(body(await newPatient(1), 10));
    expect([after.priceCents, after.depositCents]).toEqual([14_000, 3_500]);
  });

  it('deactivated, a type is neither offered nor accepted for booking; the template is fixed once exams use it', async () => {
    const type = await newExamType();
    const day = testDay(232);
    const patientId = await newPatient(2);
    const body = { ...bookingBody(c, { patientId, start: at(day, 9), payer: 'insured' }), examTypeId: type.id };
    await bookOk(body);

    const template = await put('exam-types', type.id, { ...type, templateId: 'thyroid', version: 0 });
    expect(template.status).toBe(422);
    expect(template.body.error.fields).toHaveProperty('templateId');

    const off = await patch('exam-types', type.id, { version: 0, active: false });
    expect(off.status).toBe(200);
    expect(off.body.row).toMatchObject({ active: false, version: 1, examCount: 1 });
    expect(await audits('catalog.exam-type.deactivate', type.id)).toHaveLength(1);
    expect((await bookingCatalog()).examTypes.map((t) => t.id)).not.toContain(type.id);
    const refused = await book({ ...body, start: at(day, 11) });
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.examTypeId).toMatch(/in use/);

    expect((await patch('exam-types', type.id, { version: 1, active: true })).status).toBe(200);
    expect((await bookingCatalog()).examTypes.map((t) => t.id)).toContain(type.id);
    expect(await audits('catalog.exam-type.reactivate', type.id)).toHaveLength(1);
  });
});

describe('rooms and scanners', () => {
  it('refuse a duplicate AE title with 409 naming the scanner that has it, and a malformed one with 400', async () => {
    const room = await newRoom();
    const taken = await post('scanners', { roomId: room.id, name: `Scanner ${RUN} twin`, aeTitle: ` ${demoAe.toLowerCase()} ` });
    expect(taken.status).toBe(409);
    expect(taken.body.error.message).toBe(`AE title ${demoAe} is already used by Scanner, room 1.`);
    expect(taken.body.error.fields.aeTitle).toMatch(/Scanner, room 1/);

    const bad = await post('scanners', { roomId: room.id, name: '', aeTitle: 'BACK\\SLASH' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['aeTitle', 'name']);
    for (const aeTitle of ['A'.repeat(17), '   ', 'TAB\tBED', 'ÅNGSTRÖM']) {
      const res = await post('scanners', { roomId: room.id, name: 'Scanner', aeTitle });
      expect(res.status, aeTitle).toBe(400);
      expect(res.body.error.fields).toHaveProperty('aeTitle');
    }
  });

  it('audit an edit of a scanner by field name and refuse taking another scanner’s AE title', async () => {
    const scanner = await newScanner();
    const renamed = await put('scanners', scanner.id, { roomId: scanner.roomId, name: `${scanner.name} (new)`, aeTitle: `N${RUN}`, version: 0 });
    expect(renamed.status, JSON.stringify(renamed.body)).toBe(200);
    expect(renamed.body.row).toMatchObject({ aeTitle: `N${RUN}`, version: 1 });
    const [event] = await audits('catalog.scanner.update', scanner.id);
    expect(event!.detail).toEqual({ changed: ['name', 'aeTitle'] });
    const clash = await put('scanners', scanner.id, { roomId: scanner.roomId, name: scanner.name, aeTitle: demoAe, version: 1 });
    expect(clash.status).toBe(409);
    expect(clash.body.error.message).toMatch(/already used by Scanner, room 1/);
  });

  it('refuse a duplicate room name and taking a room out of use while a scanner in it is active', async () => {
    expect((await post('rooms', { name: c.rooms[0]!.name })).status).toBe(409);
    const scanner = await newScanner();
    const room = (await Room.findByPk(scanner.roomId))!;
    const refused = await patch('rooms', room.id, { version: room.version, active: false });
    expect(refused.status).toBe(422);
    expect(refused.body.error.message).toContain(scanner.name);
    expect((await patch('scanners', scanner.id, { version: 0, active: false })).status).toBe(200);
    const off = await patch('rooms', room.id, { version: room.version, active: false });
    expect(off.status).toBe(200);
    expect(await audits('catalog.room.deactivate', room.id)).toHaveLength(1);
    // A scanner cannot come back into a room that is out of use.
    expect((await patch('scanners', scanner.id, { version: 1, active: true })).status).toBe(422);
  });

  it('deactivating a scanner stops booking on it, takes its exams off the DICOM worklist and refuses its AE title within seconds', async () => {
    const scanner = await newScanner();
    const day = testDay(230);
    const da = day.replace(/-/g, '');
    const body = { ...bookingBody(c, { patientId: await newPatient(3), start: at(day, 9), payer: 'insured' }), roomId: scanner.roomId, scannerId: scanner.id };
    const exam = await bookOk(body);

    const listed = async () =>
      (await worklistQuery(demoAe, [`(0040,0100)[0].ScheduledStationAETitle=${scanner.aeTitle}`, `(0040,0100)[0].ScheduledProcedureStepStartDate=${da}`, 'AccessionNumber'])).answers.map((a) => a.text('x00080050'));
    expect(await listed()).toEqual([exam.accessionNumber]);
    const echo = () => dcmtk('echoscu', ['-aet', scanner.aeTitle, '-aec', DICOM.aeTitle]);
    // A new scanner is let in once the listener's catalog cache renews (5 s).
    expect(await pollUntil(async () => (await echo()).code === 0, 7_000)).toBe(true);

    const off = await patch('scanners', scanner.id, { version: 0, active: false });
    expect(off.status).toBe(200);
    const deactivatedAt = Date.now();
    expect(off.body).toMatchObject({ row: { active: false, version: 1 }, upcomingExams: 1 });
    const [event] = await audits('catalog.scanner.deactivate', scanner.id);
    expect(event!.detail).toEqual({ upcomingExams: 1 });

    const refused = await book({ ...body, start: at(day, 11) });
    expect(refused.status).toBe(422);
    expect(refused.body.error.fields.scannerId).toBe('This scanner is not in use.');
    expect((await bookingCatalog()).scanners.map((s) => s.id)).not.toContain(scanner.id);
    expect(await listed()).toEqual([]);
    expect(await pollUntil(async () => (await echo()).stderr.includes('Calling AE Title Not Recognized'), 6_500)).toBe(true);
    expect(Date.now() - deactivatedAt).toBeLessThan(6_500);

    // Back in use, it is bookable and listed again (its exam was never changed).
    expect((await patch('scanners', scanner.id, { version: 1, active: true })).status).toBe(200);
    expect(await listed()).toEqual([exam.accessionNumber]);
    await exam.reload();
    expect(exam.status).toBe('booked');
  });
});

describe('probes', () => {
  const probe = (extra: Record<string, unknown> = {}) => ({
    kind: 'linear',
    modelLabel: `Linear 4–18 ${RUN}`,
    serialNumber: `SN-${RUN}-${created.probes.length}`,
    minFrequencyMhz: 4,
    maxFrequencyMhz: 18,
    endocavitary: false,
    scannerId: c.rooms[0]!.scannerId,
    inServiceFrom: '2026-01-05',
    inServiceTo: null,
    ...extra,
  });

  it('are recorded with a unique serial number, a real band and ordered service dates', async () => {
    const res = await post('probes', probe());
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    created.probes.push(res.body.row.id);
    expect(res.body.row).toMatchObject({ inService: true, scannerName: 'Scanner, room 1', version: 0 });
    expect(await audits('catalog.probe.create', res.body.row.id)).toHaveLength(1);

    const twin = await post('probes', probe({ serialNumber: res.body.row.serialNumber }));
    expect(twin.status).toBe(409);
    expect(twin.body.error.fields).toHaveProperty('serialNumber');

    const bad = await post('probes', probe({ kind: 'annular', minFrequencyMhz: 9, maxFrequencyMhz: 9, inServiceFrom: '2026-03-01', inServiceTo: '2026-02-01' }));
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['inServiceTo', 'kind', 'maxFrequencyMhz']);
    expect((await post('probes', probe({ scannerId: 987_654 }))).body.error.fields).toHaveProperty('scannerId');
  });

  it('are edited (audited by field name) and taken out of service, never deleted', async () => {
    const res = await post('probes', probe({ kind: 'curvilinear', endocavitary: true, minFrequencyMhz: 3.5, maxFrequencyMhz: 9.5 }));
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const row = res.body.row;
    created.probes.push(row.id);
    expect(row).toMatchObject({ minFrequencyMhz: 3.5, maxFrequencyMhz: 9.5, endocavitary: true });
    // An unchanged band is not reported as changed.
    const edit = await put('probes', row.id, { ...probe(), ...row, scannerId: null, modelLabel: `Endocavity ${RUN}`, version: 0 });
    expect(edit.status, JSON.stringify(edit.body)).toBe(200);
    expect((await audits('catalog.probe.update', row.id))[0]!.detail).toEqual({ changed: ['modelLabel', 'scannerId'] });

    const out = await patch('probes', row.id, { version: 1, active: false });
    expect(out.status).toBe(200);
    expect(out.body.row.inServiceTo).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(await audits('catalog.probe.deactivate', row.id)).toHaveLength(1);
    expect((await call('DELETE', `${API}/probes/${row.id}`, { cookie: admin })).status).toBe(405);
    expect((await patch('probes', row.id, { version: 2, active: true })).body.row).toMatchObject({ inServiceTo: null, inService: true });
  });
});

/** Polls `check` until it holds or `withinMs` has passed; true when it held. */
async function pollUntil(check: () => Promise<boolean>, withinMs: number): Promise<boolean> {
  const end = Date.now() + withinMs;
  while (Date.now() < end) {
    if (await check()) return true;
    await new Promise((r) => setTimeout(r, 200));
  }
  return check();
}

import { Op, QueryTypes, type Model, type ModelStatic, type Transaction } from 'sequelize';
import { db } from '../../db/connection';
import { ExamType, Probe, Room, Scanner } from '../../db/models';
import type {
  ActiveChange,
  ActiveChangeResult,
  ExamTypeFields,
  ExamTypeRow,
  ProbeFields,
  ProbeRow,
  RoomFields,
  RoomRow,
  ScannerFields,
  ScannerRow,
  Versioned,
} from '../../lib/schemas/catalog-admin';
import type { SessionUser } from '../../lib/session-user';
import { zonedDate } from '../../lib/time';
import { HttpError, notFound, ruleBroken, stale } from '../http/errors';
import { audit } from './audit';
import { clinicProfile } from './settings';

/**
 * The manager's edits of the catalog. Each use-case is one transaction with its audit entry;
 * an edit names the version it was opened with (409 when someone saved first). Nothing is
 * deleted: exams keep pointing at the exam type, room and scanner they were booked with, and
 * keep the price and deposit copied at booking, so no change here rewrites a past exam.
 */

type Ctx = { actor: SessionUser; requestId: string };
type Entity = 'exam-type' | 'room' | 'scanner' | 'probe';
const NAMES: Record<Entity, string> = { 'exam-type': 'exam type', room: 'room', scanner: 'scanner', probe: 'probe' };
const PRICES = new Set(['selfPayPriceCents', 'depositCents']);

const clash = (message: string, field: string, fieldMessage: string) => new HttpError(409, 'CONFLICT', message, { [field]: fieldMessage });
const badInput = (field: string, message: string) => new HttpError(400, 'VALIDATION', 'Some values need correcting.', { [field]: message });

/** Equal as stored: single-precision FLOAT columns (probe MHz) read back slightly off what was written. */
const same = (a: unknown, b: unknown) => a === b || (a == null && b == null) || (typeof a === 'number' && typeof b === 'number' && Math.abs(a - b) < 1e-4);

/** Loads a row for an edit, locked, refusing a version other than the one the manager opened. */
async function lockVersioned<M extends Model & { version: number }>(model: ModelStatic<M>, entity: Entity, id: number, version: number, transaction: Transaction): Promise<M> {
  const row = await model.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!row) throw notFound(`The ${NAMES[entity]}`);
  if (row.version !== version) throw stale(NAMES[entity]);
  return row;
}

/**
 * Writes the changed fields with the next version and audits their names (prices with their old
 * and new cents). Returns the names; an edit that changes nothing writes and audits nothing.
 */
async function saveChanges<M extends Model & { version: number }>(row: M, entity: Entity, next: Record<string, unknown>, ctx: Ctx, transaction: Transaction): Promise<string[]> {
  const current = row.get() as Record<string, unknown>;
  const changed = Object.keys(next).filter((k) => !same(current[k], next[k]));
  if (changed.length === 0) return changed;
  const detail: Record<string, unknown> = { changed };
  for (const k of changed) if (PRICES.has(k)) detail[k] = { from: current[k], to: next[k] };
  await row.update({ ...Object.fromEntries(changed.map((k) => [k, next[k]])), version: row.version + 1 } as Partial<M>, { transaction });
  await audit({ actorUserId: ctx.actor.id, action: `catalog.${entity}.update`, entityType: entity, entityId: row.get('id') as number, detail, requestId: ctx.requestId }, transaction);
  return changed;
}

async function audited(entity: Entity, verb: 'create' | 'deactivate' | 'reactivate', id: number, detail: Record<string, unknown>, ctx: Ctx, transaction: Transaction): Promise<void> {
  await audit({ actorUserId: ctx.actor.id, action: `catalog.${entity}.${verb}`, entityType: entity, entityId: id, detail, requestId: ctx.requestId }, transaction);
}

async function countBy(sql: string, replacements: unknown[], transaction?: Transaction): Promise<Map<number, number>> {
  const rows = await db().query<{ id: number; n: number }>(sql, { replacements, type: QueryTypes.SELECT, transaction });
  return new Map(rows.map((r) => [Number(r.id), Number(r.n)]));
}

const examCounts = (transaction?: Transaction, id?: number) =>
  countBy(`SELECT exam_type_id AS id, COUNT(*) AS n FROM exams ${id ? 'WHERE exam_type_id = ?' : ''} GROUP BY exam_type_id`, id ? [id] : [], transaction);

/** Booked or arrived exams that have not ended yet, per scanner. */
const upcomingByScanner = (transaction?: Transaction, id?: number) =>
  countBy(
    `SELECT scanner_id AS id, COUNT(*) AS n FROM exams WHERE status IN ('booked', 'arrived') AND scheduled_end >= ? ${id ? 'AND scanner_id = ?' : ''} GROUP BY scanner_id`,
    id ? [new Date(), id] : [new Date()],
    transaction,
  );

// ---- exam types -------------------------------------------------------------------------

const examTypeRow = (t: ExamType, examCount: number): ExamTypeRow => ({
  id: t.id,
  code: t.code,
  name: t.name,
  templateId: t.templateId,
  durationMinutes: t.durationMinutes,
  probeKind: t.probeKind,
  preparationText: t.preparationText,
  selfPayPriceCents: t.selfPayPriceCents,
  depositCents: t.depositCents,
  currency: t.currency,
  active: t.active,
  version: t.version,
  examCount,
});

export async function listExamTypes(): Promise<ExamTypeRow[]> {
  const [types, counts] = await Promise.all([ExamType.findAll({ order: [['name', 'ASC']] }), examCounts()]);
  return types.map((t) => examTypeRow(t, counts.get(t.id) ?? 0));
}

async function checkExamTypeName(name: string, id: number | null, transaction: Transaction): Promise<void> {
  const other = await ExamType.findOne({ where: { name, ...(id ? { id: { [Op.ne]: id } } : {}) }, transaction });
  if (other) throw clash(`There is already an exam type called ${other.name}${other.active ? '' : ' (deactivated)'}.`, 'name', 'Already the name of another exam type.');
}

/** A stable code from the name, e.g. "Carotid duplex" → "carotid-duplex" (then "-2", "-3" … if taken). */
async function codeFor(name: string, transaction: Transaction): Promise<string> {
  const base = name.normalize('NFKD').replace(/[\u0300-\u036f]/g, '').toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 32) || 'exam';
  const taken = new Set((await ExamType.findAll({ where: { code: { [Op.startsWith]: base } }, attributes: ['code'], transaction })).map((t) => t.code));
  let code = base;
  for (let n = 2; taken.has(code); n++) code = `${base}-${n}`;
  return code;
}

export async function createExamType(actor: SessionUser, input: ExamTypeFields, requestId: string): Promise<ExamTypeRow> {
  return db().transaction(async (transaction) => {
    await checkExamTypeName(input.name, null, transaction);
    const { currency } = await clinicProfile(transaction);
    const type = await ExamType.create({ ...input, code: await codeFor(input.name, transaction), currency }, { transaction });
    await audited('exam-type', 'create', type.id, { code: type.code, selfPayPriceCents: type.selfPayPriceCents, depositCents: type.depositCents }, { actor, requestId }, transaction);
    return examTypeRow(type, 0);
  });
}

/**
 * Edits an exam type. Exams already booked keep their own duration, price and deposit; the
 * template may change only while no exam uses the type, since an exam's report follows it.
 */
export async function updateExamType(actor: SessionUser, id: number, input: Versioned<ExamTypeFields>, requestId: string): Promise<ExamTypeRow> {
  return db().transaction(async (transaction) => {
    const type = await lockVersioned(ExamType, 'exam-type', id, input.version, transaction);
    if (input.name !== type.name) await checkExamTypeName(input.name, id, transaction);
    const examCount = (await examCounts(transaction, id)).get(id) ?? 0;
    if (input.templateId !== type.templateId && examCount > 0) {
      throw ruleBroken(`${examCount} exam${examCount === 1 ? '' : 's'} of this type exist and follow its template. Add a new exam type for the other template and deactivate this one.`, {
        templateId: 'Cannot change while exams use this type.',
      });
    }
    const { version: _version, ...fields } = input;
    await saveChanges(type, 'exam-type', fields, { actor, requestId }, transaction);
    return examTypeRow(type, examCount);
  });
}

/** Deactivated, an exam type is no longer offered or accepted for booking; its exams go on. */
export async function setExamTypeActive(actor: SessionUser, id: number, input: ActiveChange, requestId: string): Promise<ActiveChangeResult<ExamTypeRow>> {
  return db().transaction(async (transaction) => {
    const type = await lockVersioned(ExamType, 'exam-type', id, input.version, transaction);
    if (type.active !== input.active) {
      await type.update({ active: input.active, version: type.version + 1 }, { transaction });
      await audited('exam-type', input.active ? 'reactivate' : 'deactivate', id, {}, { actor, requestId }, transaction);
    }
    return { row: examTypeRow(type, (await examCounts(transaction, id)).get(id) ?? 0) };
  });
}

// ---- rooms ------------------------------------------------------------------------------

async function roomRow(room: Room, transaction?: Transaction): Promise<RoomRow> {
  const scanners = await Scanner.findAll({ where: { roomId: room.id, active: true }, order: [['name', 'ASC']], transaction });
  return { id: room.id, name: room.name, active: room.active, version: room.version, scanners: scanners.map((s) => s.name) };
}

export async function listRooms(): Promise<RoomRow[]> {
  const [rooms, scanners] = await Promise.all([Room.findAll({ order: [['name', 'ASC']] }), Scanner.findAll({ where: { active: true }, order: [['name', 'ASC']] })]);
  return rooms.map((r) => ({ id: r.id, name: r.name, active: r.active, version: r.version, scanners: scanners.filter((s) => s.roomId === r.id).map((s) => s.name) }));
}

async function checkRoomName(name: string, id: number | null, transaction: Transaction): Promise<void> {
  const other = await Room.findOne({ where: { name, ...(id ? { id: { [Op.ne]: id } } : {}) }, transaction });
  if (other) throw clash(`There is already a room called ${other.name}.`, 'name', 'Already the name of another room.');
}

export async function createRoom(actor: SessionUser, input: RoomFields, requestId: string): Promise<RoomRow> {
  return db().transaction(async (transaction) => {
    await checkRoomName(input.name, null, transaction);
    const room = await Room.create({ name: input.name }, { transaction });
    await audited('room', 'create', room.id, {}, { actor, requestId }, transaction);
    return roomRow(room, transaction);
  });
}

export async function updateRoom(actor: SessionUser, id: number, input: Versioned<RoomFields>, requestId: string): Promise<RoomRow> {
  return db().transaction(async (transaction) => {
    const room = await lockVersioned(Room, 'room', id, input.version, transaction);
    if (input.name !== room.name) await checkRoomName(input.name, id, transaction);
    await saveChanges(room, 'room', { name: input.name }, { actor, requestId }, transaction);
    return roomRow(room, transaction);
  });
}

/** A room is taken out of use once its scanners are (deactivated or moved), so none is left stranded. */
export async function setRoomActive(actor: SessionUser, id: number, input: ActiveChange, requestId: string): Promise<ActiveChangeResult<RoomRow>> {
  return db().transaction(async (transaction) => {
    const room = await lockVersioned(Room, 'room', id, input.version, transaction);
    if (!input.active) {
      const scanners = await Scanner.findAll({ where: { roomId: id, active: true }, transaction });
      if (scanners.length) throw ruleBroken(`${room.name} still has ${scanners.map((s) => s.name).join(', ')} in use. Deactivate or move the scanner first.`);
    }
    if (room.active !== input.active) {
      await room.update({ active: input.active, version: room.version + 1 }, { transaction });
      await audited('room', input.active ? 'reactivate' : 'deactivate', id, {}, { actor, requestId }, transaction);
    }
    return { row: await roomRow(room, transaction) };
  });
}

// ---- scanners ---------------------------------------------------------------------------

function scannerRow(s: Scanner, roomName: string, upcomingExams: number): ScannerRow {
  return { id: s.id, roomId: s.roomId, roomName, name: s.name, aeTitle: s.aeTitle, active: s.active, version: s.version, upcomingExams };
}

export async function listScanners(): Promise<ScannerRow[]> {
  const [scanners, rooms, upcoming] = await Promise.all([Scanner.findAll({ order: [['name', 'ASC']] }), Room.findAll(), upcomingByScanner()]);
  const roomNames = new Map(rooms.map((r) => [r.id, r.name]));
  return scanners.map((s) => scannerRow(s, roomNames.get(s.roomId) ?? '', upcoming.get(s.id) ?? 0));
}

/** The AE title is the scanner's identity on the network: two scanners may never share one. */
async function checkAeTitle(aeTitle: string, id: number | null, transaction: Transaction): Promise<void> {
  const other = await Scanner.findOne({ where: { aeTitle, ...(id ? { id: { [Op.ne]: id } } : {}) }, transaction });
  if (other) throw clash(`AE title ${other.aeTitle} is already used by ${other.name}${other.active ? '' : ' (deactivated)'}.`, 'aeTitle', `Already used by ${other.name}.`);
}

async function roomInUse(roomId: number, transaction: Transaction): Promise<Room> {
  const room = await Room.findByPk(roomId, { transaction });
  if (!room) throw badInput('roomId', 'No such room.');
  if (!room.active) throw ruleBroken(`${room.name} is not in use. Reactivate the room first.`, { roomId: 'This room is not in use.' });
  return room;
}

export async function createScanner(actor: SessionUser, input: ScannerFields, requestId: string): Promise<ScannerRow> {
  return db().transaction(async (transaction) => {
    const room = await roomInUse(input.roomId, transaction);
    await checkAeTitle(input.aeTitle, null, transaction);
    const scanner = await Scanner.create({ roomId: room.id, name: input.name, aeTitle: input.aeTitle }, { transaction });
    await audited('scanner', 'create', scanner.id, { roomId: room.id, aeTitle: scanner.aeTitle }, { actor, requestId }, transaction);
    return scannerRow(scanner, room.name, 0);
  });
}

/** Edits a scanner. It moves to another room only without upcoming exams, which are booked in its room. */
export async function updateScanner(actor: SessionUser, id: number, input: Versioned<ScannerFields>, requestId: string): Promise<ScannerRow> {
  return db().transaction(async (transaction) => {
    const scanner = await lockVersioned(Scanner, 'scanner', id, input.version, transaction);
    const upcoming = (await upcomingByScanner(transaction, id)).get(id) ?? 0;
    let room = await Room.findByPk(scanner.roomId, { transaction });
    if (input.roomId !== scanner.roomId) {
      room = scanner.active ? await roomInUse(input.roomId, transaction) : await Room.findByPk(input.roomId, { transaction });
      if (!room) throw badInput('roomId', 'No such room.');
      if (upcoming > 0) {
        throw ruleBroken(`${scanner.name} has ${upcoming} upcoming exam${upcoming === 1 ? '' : 's'} in its room. Move or cancel them before moving the scanner.`, { roomId: 'Has upcoming exams.' });
      }
    }
    if (input.aeTitle !== scanner.aeTitle) await checkAeTitle(input.aeTitle, id, transaction);
    await saveChanges(scanner, 'scanner', { roomId: input.roomId, name: input.name, aeTitle: input.aeTitle }, { actor, requestId }, transaction);
    return scannerRow(scanner, room!.name, upcoming);
  });
}

/**
 * Deactivated, a scanner can no longer be booked, its exams leave the DICOM worklist, and the
 * listener refuses its AE title once its catalog cache renews (seconds). Exams still booked on
 * it are reported back, to be moved.
 */
export async function setScannerActive(actor: SessionUser, id: number, input: ActiveChange, requestId: string): Promise<ActiveChangeResult<ScannerRow>> {
  return db().transaction(async (transaction) => {
    const scanner = await lockVersioned(Scanner, 'scanner', id, input.version, transaction);
    const room = input.active ? await roomInUse(scanner.roomId, transaction) : await Room.findByPk(scanner.roomId, { transaction });
    const upcomingExams = (await upcomingByScanner(transaction, id)).get(id) ?? 0;
    if (scanner.active !== input.active) {
      await scanner.update({ active: input.active, version: scanner.version + 1 }, { transaction });
      await audited('scanner', input.active ? 'reactivate' : 'deactivate', id, input.active ? {} : { upcomingExams }, { actor, requestId }, transaction);
    }
    return { row: scannerRow(scanner, room!.name, upcomingExams), upcomingExams };
  });
}

// ---- probes -----------------------------------------------------------------------------

const mhz = (value: number) => Math.round(value * 100) / 100;
const inServiceOn = (p: Pick<ProbeFields, 'inServiceFrom' | 'inServiceTo'>, today: string) => p.inServiceFrom <= today && (p.inServiceTo === null || today <= p.inServiceTo);

function probeRow(p: Probe, scannerName: string | null, today: string): ProbeRow {
  return {
    id: p.id,
    kind: p.kind,
    modelLabel: p.modelLabel,
    serialNumber: p.serialNumber,
    // FLOAT columns read back as the nearest single-precision value (12.3 → 12.30000019…).
    minFrequencyMhz: mhz(p.minFrequencyMhz),
    maxFrequencyMhz: mhz(p.maxFrequencyMhz),
    endocavitary: p.endocavitary,
    scannerId: p.scannerId ?? null,
    scannerName,
    inServiceFrom: p.inServiceFrom,
    inServiceTo: p.inServiceTo,
    inService: inServiceOn(p, today),
    version: p.version,
  };
}

async function clinicToday(transaction?: Transaction): Promise<string> {
  return zonedDate(new Date(), (await clinicProfile(transaction)).timeZone);
}

export async function listProbes(): Promise<ProbeRow[]> {
  const [probes, scanners, today] = await Promise.all([Probe.findAll({ order: [['modelLabel', 'ASC'], ['id', 'ASC']] }), Scanner.findAll(), clinicToday()]);
  const names = new Map(scanners.map((s) => [s.id, s.name]));
  return probes.map((p) => probeRow(p, p.scannerId ? (names.get(p.scannerId) ?? null) : null, today));
}

async function checkSerial(serialNumber: string, id: number | null, transaction: Transaction): Promise<void> {
  const other = await Probe.findOne({ where: { serialNumber, ...(id ? { id: { [Op.ne]: id } } : {}) }, transaction });
  if (other) throw clash(`Serial number ${other.serialNumber} is already recorded for the probe ${other.modelLabel}.`, 'serialNumber', 'Already recorded for another probe.');
}

async function scannerName(scannerId: number | null, transaction: Transaction): Promise<string | null> {
  if (scannerId === null) return null;
  const scanner = await Scanner.findByPk(scannerId, { transaction });
  if (!scanner) throw badInput('scannerId', 'No such scanner.');
  return scanner.name;
}

export async function createProbe(actor: SessionUser, input: ProbeFields, requestId: string): Promise<ProbeRow> {
  return db().transaction(async (transaction) => {
    const name = await scannerName(input.scannerId, transaction);
    await checkSerial(input.serialNumber, null, transaction);
    const probe = await Probe.create({ ...input }, { transaction });
    await audited('probe', 'create', probe.id, { kind: probe.kind, scannerId: probe.scannerId ?? null }, { actor, requestId }, transaction);
    return probeRow(probe, name, await clinicToday(transaction));
  });
}

export async function updateProbe(actor: SessionUser, id: number, input: Versioned<ProbeFields>, requestId: string): Promise<ProbeRow> {
  return db().transaction(async (transaction) => {
    const probe = await lockVersioned(Probe, 'probe', id, input.version, transaction);
    const name = await scannerName(input.scannerId, transaction);
    if (input.serialNumber !== probe.serialNumber) await checkSerial(input.serialNumber, id, transaction);
    const { version: _version, ...fields } = input;
    await saveChanges(probe, 'probe', fields, { actor, requestId }, transaction);
    return probeRow(probe, name, await clinicToday(transaction));
  });
}

/**
 * A probe has no active flag: its service dates say whether it is in use. Taking it out of
 * service makes today its last day; returning it to service clears the end date.
 */
export async function setProbeActive(actor: SessionUser, id: number, input: ActiveChange, requestId: string): Promise<ActiveChangeResult<ProbeRow>> {
  return db().transaction(async (transaction) => {
    const probe = await lockVersioned(Probe, 'probe', id, input.version, transaction);
    const today = await clinicToday(transaction);
    const ending = probe.inServiceTo !== null && probe.inServiceTo <= today;
    if (!input.active && !ending) {
      if (probe.inServiceFrom > today) {
        throw ruleBroken(`This probe enters service on ${probe.inServiceFrom}. Change its dates instead.`, { inServiceFrom: 'Not in service yet.' });
      }
      await probe.update({ inServiceTo: today, version: probe.version + 1 }, { transaction });
      await audited('probe', 'deactivate', id, { inServiceTo: today }, { actor, requestId }, transaction);
    } else if (input.active && probe.inServiceTo !== null) {
      await probe.update({ inServiceTo: null, version: probe.version + 1 }, { transaction });
      await audited('probe', 'reactivate', id, { inServiceTo: null }, { actor, requestId }, transaction);
    }
    return { row: probeRow(probe, await scannerName(probe.scannerId ?? null, transaction), today) };
  });
}

/** The answer to a DELETE: catalog rows stay for the exams that name them (405, with the way out). */
export function deletingRefused(entity: Entity): HttpError {
  const what = NAMES[entity];
  return new HttpError(405, 'RULE', `A ${what} is never deleted, so past exams keep what they were booked with. ${entity === 'probe' ? 'Take it out of service' : 'Deactivate it'} instead.`);
}

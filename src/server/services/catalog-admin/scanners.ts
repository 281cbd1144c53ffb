import { Op, type Transaction } from 'sequelize';
import { db } from '../../../db/connection';
import { Room, Scanner } from '../../../db/models';
import type { ActiveChange, ActiveChangeResult, ScannerFields, ScannerRow, Versioned } from '../../../lib/schemas/catalog-admin';
import type { SessionUser } from '../../../lib/session-user';
import { ruleBroken } from '../../http/errors';
import { clash, badInput, lockVersioned, saveChanges, audited, upcomingByScanner } from './shared';

/** Scanners: room and DICOM AE title (unique), active or not. */

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

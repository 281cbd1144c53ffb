import { Op, type Transaction } from 'sequelize';
import { db } from '../../../db/connection';
import { Room, Scanner } from '../../../db/models';
import type { ActiveChange, ActiveChangeResult, RoomFields, RoomRow, Versioned } from '../../../lib/schemas/catalog-admin';
import type { SessionUser } from '../../../lib/session-user';
import { ruleBroken } from '../../http/errors';
import { clash, lockVersioned, saveChanges, audited } from './shared';

/** Rooms: a name, and active or not (a room with an active scanner stays active). */

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
